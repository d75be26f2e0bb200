// Every change the studio makes to a groom spec, as plain data: applied by one pure function,
// named in words for the undo history, checked with the groom library's own schema before it
// is accepted. The spec is never changed in place.
import { validateGroomSpec, type CurveSpec, type GroomSpec, type GuideSetSpec, type GuideSettings, type MapAttribute, type MapSpec, type MaskSpec, type PinSpec, type SingularitySpec, type SpecProblem, type StrokeSpec, type SymmetrySpec } from '@/lib/groom/spec/spec';
import { CURVE_NAMES, SINGULARITY_NAMES, featureLabel, singularityKind, type FeatureKind, type FeatureRef, type Vec3 } from './features';
import { mirrorOf, mirroredValue, partnerOf, type FeatureValue, type Mirror, type TwinSurface } from './mirror-edits';

export type CurveKind = 'parting' | 'crest';
export type FieldSettings = Pick<GroomSpec['field'], 'order' | 'boundary' | 'rotation' | 'referenceDirection'>;

export type SpecEdit =
  // `alone`: on this side only, even with twin sides on (the budget's remainder, which a mirror would double).
  | { readonly type: 'add-singularity'; readonly singularity: SingularitySpec; readonly alone?: boolean }
  | { readonly type: 'update-singularity'; readonly index: number; readonly singularity: SingularitySpec; readonly moved?: boolean }
  | { readonly type: 'add-curve'; readonly kind: CurveKind; readonly curve: CurveSpec }
  | { readonly type: 'update-curve'; readonly kind: CurveKind; readonly index: number; readonly curve: CurveSpec }
  | { readonly type: 'add-stroke'; readonly stroke: StrokeSpec }
  | { readonly type: 'update-stroke'; readonly index: number; readonly stroke: StrokeSpec }
  | { readonly type: 'add-pin'; readonly pin: PinSpec }
  | { readonly type: 'update-pin'; readonly index: number; readonly pin: PinSpec; readonly moved?: boolean }
  | { readonly type: 'remove'; readonly feature: FeatureRef }
  | { readonly type: 'set-guides'; readonly guides: GuideSettings }
  | { readonly type: 'set-field'; readonly settings: Partial<FieldSettings> }
  | { readonly type: 'set-symmetry'; readonly symmetry: SymmetrySpec | null }
  /** A new guide set at the end; the groom's first set takes its one block of settings with it (see `withGuideSet`). */
  | { readonly type: 'add-guide-set'; readonly set: GuideSetSpec }
  | { readonly type: 'update-guide-set'; readonly index: number; readonly set: GuideSetSpec; readonly what: 'rename' | 'region' | 'settings' }
  | { readonly type: 'remove-guide-set'; readonly index: number }
  /** The painted map of its attribute, put in place of the one there (or added); `label`: the history's words, when not "Paint the … map". */
  | { readonly type: 'set-map'; readonly map: MapSpec; readonly label?: string }
  | { readonly type: 'remove-map'; readonly attribute: MapAttribute }
  /** The painted mask of its name, put in place of the one there (or added). */
  | { readonly type: 'set-mask'; readonly mask: MaskSpec; readonly label?: string }
  | { readonly type: 'remove-mask'; readonly name: string }
  | { readonly type: 'replace'; readonly spec: GroomSpec; readonly label: string };

/** The index of a whorl and of a saddle, the two singularities the tools and the side list add by name. */
export const WHORL_INDEX = 1;
export const SADDLE_INDEX = -1;

/** The edit that adds a singularity of an index at a point, turning counterclockwise as every new one does. */
export function addSingularity(point: Vec3, index: number, alone = false): SpecEdit {
  return { type: 'add-singularity', singularity: { point, index, handedness: 'counterclockwise' }, ...(alone ? { alone } : {}) };
}

/** The edit that moves a singularity or a pin to a point (a place by file vertex becomes a place by point); null for other features. */
export function moveFeature(spec: GroomSpec, feature: FeatureRef, point: Vec3): SpecEdit | null {
  if (feature.kind === 'singularity') {
    const s = spec.field.singularities[feature.index];
    if (!s) return null;
    const { vertex: _vertex, ...rest } = s;
    return { type: 'update-singularity', index: feature.index, singularity: { ...rest, point }, moved: true };
  }
  if (feature.kind === 'pin') {
    const pin = spec.pins[feature.index];
    if (!pin) return null;
    const { vertex: _vertex, ...rest } = pin;
    return { type: 'update-pin', index: feature.index, pin: { ...rest, point }, moved: true };
  }
  return null;
}

function replaced<T>(list: readonly T[], index: number, item: T): T[] {
  if (index < 0 || index >= list.length) throw new RangeError(`no item ${index} in a list of ${list.length}`);
  return list.map((old, i) => (i === index ? item : old));
}

function curveList(kind: CurveKind): 'partings' | 'crests' {
  return kind === 'parting' ? 'partings' : 'crests';
}

/**
 * The spec after an edit. With the spec's `symmetry` on, a feature's placing, change or deletion
 * is done on the other side too, in the same edit (so one undo takes both back): an added feature
 * gains its mirror image unless it lies on the plane; a changed or moved one takes its partner
 * (see `partnerOf`) along as its mirror image — or deletes it, when the change puts it on the
 * plane; a deleted one takes its partner with it. Features without a partner (made while symmetry
 * was off, or placed by file vertex) change alone. With the open `surface`, a twisted
 * singularity's mirror is its exact mirror image (its `twistFrom` stated, see `mirroredValue`);
 * without it the mirror is stated by points alone. Throws RangeError for an edit that names a
 * feature the spec lacks.
 */
export function applySpecEdit(spec: GroomSpec, edit: SpecEdit, surface?: TwinSurface | null): GroomSpec {
  const mirror = mirrorOf(spec, surface);
  return mirror ? applyMirrored(spec, edit, mirror) : applyOne(spec, edit);
}

/** A feature edit as (kind, index, value): what mirroring needs of it. */
function featureEdit(edit: SpecEdit): { action: 'add' | 'update' | 'remove'; kind: FeatureKind; index: number; value?: FeatureValue } | null {
  switch (edit.type) {
    case 'add-singularity':
      return edit.alone ? null : { action: 'add', kind: 'singularity', index: -1, value: edit.singularity };
    case 'update-singularity':
      return { action: 'update', kind: 'singularity', index: edit.index, value: edit.singularity };
    case 'add-curve':
      return { action: 'add', kind: edit.kind, index: -1, value: edit.curve };
    case 'update-curve':
      return { action: 'update', kind: edit.kind, index: edit.index, value: edit.curve };
    case 'add-stroke':
      return { action: 'add', kind: 'stroke', index: -1, value: edit.stroke };
    case 'update-stroke':
      return { action: 'update', kind: 'stroke', index: edit.index, value: edit.stroke };
    case 'add-pin':
      return { action: 'add', kind: 'pin', index: -1, value: edit.pin };
    case 'update-pin':
      return { action: 'update', kind: 'pin', index: edit.index, value: edit.pin };
    case 'remove':
      return { action: 'remove', kind: edit.feature.kind, index: edit.feature.index };
    default:
      return null;
  }
}

/** The add or update edit of a feature of any kind. */
function editOf(kind: FeatureKind, index: number | null, value: FeatureValue): SpecEdit {
  if (kind === 'singularity') return index === null ? { type: 'add-singularity', singularity: value as SingularitySpec } : { type: 'update-singularity', index, singularity: value as SingularitySpec };
  if (kind === 'pin') return index === null ? { type: 'add-pin', pin: value as PinSpec } : { type: 'update-pin', index, pin: value as PinSpec };
  if (kind === 'stroke') return index === null ? { type: 'add-stroke', stroke: value as StrokeSpec } : { type: 'update-stroke', index, stroke: value as StrokeSpec };
  return index === null ? { type: 'add-curve', kind, curve: value as CurveSpec } : { type: 'update-curve', kind, index, curve: value as CurveSpec };
}

function applyMirrored(spec: GroomSpec, edit: SpecEdit, mirror: Mirror): GroomSpec {
  const change = featureEdit(edit);
  if (!change) return applyOne(spec, edit);
  const { action, kind, index, value } = change;
  if (action === 'add') {
    const image = mirroredValue(mirror, kind, value!);
    const next = applyOne(spec, edit);
    return image ? applyOne(next, editOf(kind, null, image)) : next;
  }
  const partner = partnerOf(spec, { kind, index }, mirror);
  if (action === 'remove') {
    if (partner === null) return applyOne(spec, edit);
    // The later one first, so the earlier one's number still holds.
    const [first, second] = partner > index ? [partner, index] : [index, partner];
    return applyOne(applyOne(spec, { type: 'remove', feature: { kind, index: first } }), { type: 'remove', feature: { kind, index: second } });
  }
  const next = applyOne(spec, edit);
  if (partner === null) return next;
  const image = mirroredValue(mirror, kind, value!);
  return image ? applyOne(next, editOf(kind, partner, image)) : applyOne(next, { type: 'remove', feature: { kind, index: partner } });
}

/** One edit, on one side only. */
function applyOne(spec: GroomSpec, edit: SpecEdit): GroomSpec {
  const field = spec.field;
  switch (edit.type) {
    case 'add-singularity':
      return { ...spec, field: { ...field, singularities: [...field.singularities, edit.singularity] } };
    case 'update-singularity':
      return { ...spec, field: { ...field, singularities: replaced(field.singularities, edit.index, edit.singularity) } };
    case 'add-curve': {
      const list = curveList(edit.kind);
      return { ...spec, field: { ...field, [list]: [...field[list], edit.curve] } };
    }
    case 'update-curve': {
      const list = curveList(edit.kind);
      return { ...spec, field: { ...field, [list]: replaced(field[list], edit.index, edit.curve) } };
    }
    case 'add-stroke':
      return { ...spec, field: { ...field, strokes: [...field.strokes, edit.stroke] } };
    case 'update-stroke':
      return { ...spec, field: { ...field, strokes: replaced(field.strokes, edit.index, edit.stroke) } };
    case 'add-pin':
      return { ...spec, pins: [...spec.pins, edit.pin] };
    case 'update-pin':
      return { ...spec, pins: replaced(spec.pins, edit.index, edit.pin) };
    case 'remove':
      return removeFeature(spec, edit.feature);
    case 'set-guides':
      return { ...spec, guides: edit.guides };
    case 'set-field':
      return { ...spec, field: { ...field, ...edit.settings } };
    case 'set-symmetry': {
      const { symmetry: _off, ...rest } = spec;
      return edit.symmetry ? { ...spec, symmetry: edit.symmetry } : rest;
    }
    case 'add-guide-set':
      return withGuideSet(spec, edit.set);
    case 'update-guide-set':
      return { ...spec, guideSets: replaced(spec.guideSets ?? [], edit.index, edit.set) };
    case 'remove-guide-set':
      return withoutGuideSet(spec, edit.index);
    case 'set-map':
      return { ...spec, maps: withItem(spec.maps, edit.map, (m) => m.attribute === edit.map.attribute) };
    case 'remove-map':
      return withList(spec, 'maps', withoutItem(spec.maps, (m) => m.attribute === edit.attribute, `There is no ${edit.attribute} map to remove.`));
    case 'set-mask':
      return { ...spec, masks: withItem(spec.masks, edit.mask, (m) => m.name === edit.mask.name) };
    case 'remove-mask': {
      const user = spec.guideSets?.find((set) => set.region.mask === edit.name);
      if (user) throw new Error(`Guide set “${user.name}” grows on the mask “${edit.name}”; give the set another region before removing the mask.`);
      return withList(spec, 'masks', withoutItem(spec.masks, (m) => m.name === edit.name, `There is no mask “${edit.name}” to remove.`));
    }
    case 'replace':
      return edit.spec;
  }
}

/** A list with `item` in place of the one `same` picks, or at its end. */
function withItem<T>(list: readonly T[] | undefined, item: T, same: (old: T) => boolean): T[] {
  const at = (list ?? []).findIndex(same);
  return at < 0 ? [...(list ?? []), item] : (list ?? []).map((old, i) => (i === at ? item : old));
}

function withoutItem<T>(list: readonly T[] | undefined, gone: (item: T) => boolean, missing: string): T[] {
  if (!list?.some(gone)) throw new Error(missing);
  return list.filter((item) => !gone(item));
}

/** The spec with an optional list replaced, left out when it is empty (as a spec that never had one). */
function withList<K extends 'maps' | 'masks'>(spec: GroomSpec, key: K, list: NonNullable<GroomSpec[K]>): GroomSpec {
  if (list.length > 0) return { ...spec, [key]: list };
  const { [key]: _gone, ...rest } = spec;
  return rest as GroomSpec;
}

/** The name the groom's one block of settings carries when it becomes the first of several sets. */
export const FIRST_SET_NAME = 'Whole coat';

/**
 * The spec with one more guide set. A groom without sets first turns its one block of settings
 * into a set (named `FIRST_SET_NAME`, on the groups it grew on), so what it grew before it still
 * grows, the same guides, beside the new set.
 */
function withGuideSet(spec: GroomSpec, set: GuideSetSpec): GroomSpec {
  if (spec.guideSets) return { ...spec, guideSets: [...spec.guideSets, set] };
  const { regions, ...settings } = spec.guides;
  return { ...spec, guideSets: [{ name: FIRST_SET_NAME, region: { groups: regions }, guides: { ...settings, regions: [] } }, set] };
}

/** The spec without a set; taking away the last one gives the groom back one block: that set's settings, on its groups. */
function withoutGuideSet(spec: GroomSpec, index: number): GroomSpec {
  const sets = without(spec.guideSets ?? [], index);
  if (sets.length > 0) return { ...spec, guideSets: sets };
  const { guideSets: _gone, ...rest } = spec;
  const last = spec.guideSets![index];
  return { ...rest, guides: { ...last.guides, regions: last.region.groups ?? [] } };
}

function without<T>(list: readonly T[], index: number): T[] {
  if (index < 0 || index >= list.length) throw new RangeError(`no item ${index} in a list of ${list.length}`);
  return list.filter((_, i) => i !== index);
}

function removeFeature(spec: GroomSpec, ref: FeatureRef): GroomSpec {
  const field = spec.field;
  switch (ref.kind) {
    case 'singularity':
      return { ...spec, field: { ...field, singularities: without(field.singularities, ref.index) } };
    case 'parting':
      return { ...spec, field: { ...field, partings: without(field.partings, ref.index) }, ...(spec.guideSets ? { guideSets: setsWithoutParting(spec.guideSets, ref.index) } : {}) };
    case 'crest':
      return { ...spec, field: { ...field, crests: without(field.crests, ref.index) } };
    case 'stroke':
      return { ...spec, field: { ...field, strokes: without(field.strokes, ref.index) } };
    case 'pin':
      return { ...spec, pins: without(spec.pins, ref.index) };
  }
}

/**
 * The guide sets once parting `index` is gone: later partings' numbers move down by one. A set that
 * grows on a side of that parting alone would be left without a region, so the edit is refused in words.
 */
function setsWithoutParting(sets: readonly GuideSetSpec[], index: number): GuideSetSpec[] {
  return sets.map((set) => {
    const partings = set.region.partings;
    if (!partings) return set;
    const kept = partings.filter((p) => p !== index).map((p) => (p > index ? p - 1 : p));
    if (kept.length === 0) throw new Error(`Guide set “${set.name}” grows on one side of this parting; give the set another region before deleting it.`);
    return { ...set, region: { ...set.region, partings: kept } };
  });
}

/** The words the undo history shows for an edit ("Move whorl 2", "Add parting 1"), "on both sides" when mirrored. */
export function describeSpecEdit(before: GroomSpec, edit: SpecEdit): string {
  const words = describeOne(before, edit);
  const mirror = mirrorOf(before);
  const change = featureEdit(edit);
  if (!mirror || !change) return words;
  const twinned = change.action === 'add' ? mirroredValue(mirror, change.kind, change.value!) !== null : partnerOf(before, { kind: change.kind, index: change.index }, mirror) !== null;
  return twinned ? `${words} on both sides` : words;
}

function describeOne(before: GroomSpec, edit: SpecEdit): string {
  const lower = (text: string) => text.charAt(0).toLowerCase() + text.slice(1);
  switch (edit.type) {
    case 'add-singularity':
      return `Add ${lower(SINGULARITY_NAMES[singularityKind(edit.singularity.index)])}`;
    case 'update-singularity':
      return `${edit.moved ? 'Move' : 'Change'} ${lower(featureLabel(before, { kind: 'singularity', index: edit.index }))}`;
    case 'add-curve':
      return `Draw ${lower(CURVE_NAMES[edit.kind])}`;
    case 'update-curve':
      return `Change ${lower(featureLabel(before, { kind: edit.kind, index: edit.index }))}`;
    case 'add-stroke':
      return 'Draw flow stroke';
    case 'update-stroke':
      return `Change flow stroke ${edit.index + 1}`;
    case 'add-pin':
      return `Add ${edit.pin.attribute} pin`;
    case 'update-pin':
      return `${edit.moved ? 'Move' : 'Change'} ${lower(featureLabel(before, { kind: 'pin', index: edit.index }))}`;
    case 'remove':
      return `Delete ${lower(featureLabel(before, edit.feature))}`;
    case 'set-guides':
      return 'Change guide settings';
    case 'set-field':
      return 'Change field settings';
    case 'set-symmetry':
      return edit.symmetry ? 'Turn twin sides on' : 'Turn twin sides off';
    case 'add-guide-set':
      return `Add guide set “${edit.set.name}”`;
    case 'update-guide-set': {
      const name = before.guideSets?.[edit.index]?.name ?? `${edit.index + 1}`;
      return edit.what === 'rename' ? `Rename guide set “${name}” to “${edit.set.name}”` : `Change ${edit.what === 'region' ? 'where' : 'how'} guide set “${name}” grows`;
    }
    case 'remove-guide-set':
      return `Delete guide set “${before.guideSets?.[edit.index]?.name ?? edit.index + 1}”`;
    case 'set-map':
      return edit.label ?? (before.maps?.some((m) => m.attribute === edit.map.attribute) ? `Paint the ${edit.map.attribute} map` : `Add a ${edit.map.attribute} map`);
    case 'remove-map':
      return `Remove the ${edit.attribute} map`;
    case 'set-mask':
      return edit.label ?? (before.masks?.some((m) => m.name === edit.mask.name) ? `Paint mask “${edit.mask.name}”` : `Add mask “${edit.mask.name}”`);
    case 'remove-mask':
      return `Remove mask “${edit.name}”`;
    case 'replace':
      return edit.label;
  }
}

export type CheckedEdit = { ok: true; spec: GroomSpec } | { ok: false; problems: SpecProblem[] };

/**
 * Applies an edit and checks the result with the groom library's schema, so that nothing the
 * server would refuse enters the editor. The accepted spec is the resolved one (defaults filled).
 */
export function checkedSpecEdit(spec: GroomSpec, edit: SpecEdit, surface?: TwinSurface | null): CheckedEdit {
  let next: GroomSpec;
  try {
    next = applySpecEdit(spec, edit, surface);
  } catch (error) {
    return { ok: false, problems: [{ path: '(the whole spec)', message: (error as Error).message }] };
  }
  const result = validateGroomSpec(next);
  return result.spec ? { ok: true, spec: result.spec } : { ok: false, problems: result.problems };
}

/** Why an edit was refused, in the groomer's words: the first problem, with the schema's bounds said plainly. */
export function refusalText(problems: readonly { path: string; message: string }[]): string {
  const first = problems[0];
  return first ? first.message.replace(/^Too (big|small): expected number to be ([<>]=?)(.*)$/, (_, __, op, n) => `Use a value ${op.startsWith('<') ? 'up to' : 'from'} ${n}.`) : 'This change was refused.';
}
