import { z } from 'zod';
import { GroomError } from '../errors';
import { mapSchema, maskSchema } from './maps';

export { MAP_ATTRIBUTES, type MapAttribute } from './maps';
import { degrees, guideAmount, guidePointsProblem, guidesSchemaV3, notBothAmounts, resolveGuides, size, type GuidesInput } from './guide-settings';

export { MAX_GUIDE_POINTS, MAX_GUIDES, TIP_TAPER, guidePointsProblem } from './guide-settings';

/**
 * The groom spec: every decision of a groom in one versioned JSON document, so that the same spec
 * on the same surface gives the same guides. lib/groom/README.md ("The groom spec") documents
 * each field, its unit and its range. Lengths are in the surface's declared `units`; angles in degrees; densities
 * in guides per cm² whatever the units, because that is how densities are quoted in the trade.
 */

export const SPEC_VERSION = 3;

export const UNITS = ['mm', 'cm', 'm', 'in'] as const;
export type Unit = (typeof UNITS)[number];

/** Centimetres in one surface unit. */
export const CENTIMETRES_PER_UNIT: Readonly<Record<Unit, number>> = { mm: 0.1, cm: 1, m: 100, in: 2.54 };

export const PIN_ATTRIBUTES = ['length', 'lift', 'droop', 'curl', 'jitter', 'density', 'width'] as const;
export type PinAttribute = (typeof PIN_ATTRIBUTES)[number];


const vec3 = z.tuple([z.number(), z.number(), z.number()]);
const fileVertex = z.int().min(0).max(2 ** 32 - 2);

const weight = z.number().min(-1e-6).max(1 + 1e-6);

/**
 * Where a feature sits in the artist's own numbering, so it survives a new mesh: a polygon of the
 * surface file, three of its corners (0-based, in the polygon's own corner order) and barycentric
 * weights over them; the UV there when the surface has UVs. Written by the transfer
 * (lib/groom/transfer); a spec without it is placed by its world points as before.
 */
const surfacePositionSchema = z.strictObject({
  polygon: z.int().min(0).max(2 ** 32 - 2),
  corners: z.tuple([z.int().min(0).max(65_535), z.int().min(0).max(65_535), z.int().min(0).max(65_535)]),
  barycentric: z.tuple([weight, weight, weight]).refine((w) => Math.abs(w[0] + w[1] + w[2] - 1) < 1e-5, 'the barycentric weights must sum to 1'),
  uv: z.tuple([z.number(), z.number()]).optional(),
});

/** A place on the surface: a point snapped to the nearest vertex, or a vertex as numbered in the surface file. */
const placement = {
  point: vec3.optional(),
  vertex: fileVertex.optional(),
  surface: surfacePositionSchema.optional(),
};

/** One surface position per point (or vertex) of a curve or stroke, when given. */
function surfaceMatches(value: { points?: unknown[]; vertices?: unknown[]; surface?: unknown[] }, ctx: z.RefinementCtx): void {
  const count = (value.points ?? value.vertices ?? []).length;
  if (value.surface !== undefined && value.surface.length !== count) {
    ctx.addIssue({ code: 'custom', path: ['surface'], message: `must give one surface position per point (${count}), not ${value.surface.length}` });
  }
}

function exactlyOnePlace(value: { point?: unknown; vertex?: unknown }, ctx: z.RefinementCtx): void {
  if ((value.point === undefined) === (value.vertex === undefined)) {
    ctx.addIssue({ code: 'custom', message: 'give either "point" or "vertex" (one of them, not both)' });
  }
}

const singularitySchema = z
  .strictObject({
    ...placement,
    index: z.number().min(-8).max(8).refine((x) => x !== 0, 'an index of 0 is no singularity'),
    twist: degrees(0, 180).optional(),
    handedness: z.enum(['counterclockwise', 'clockwise']).default('counterclockwise'),
    /**
     * A world direction the twist is measured from, instead of the singular vertex's first face:
     * the twist is fixed in the face this direction points into and measured from it there, so a
     * mirrored singularity with the mirrored direction twists exactly mirrored. Absent: as before.
     */
    twistFrom: vec3.refine((v) => v[0] !== 0 || v[1] !== 0 || v[2] !== 0, 'the direction must not be zero').optional(),
  })
  .superRefine(exactlyOnePlace);

const curveSchema = z
  .strictObject({
    points: z.array(vec3).min(2).max(10_000).optional(),
    vertices: z.array(fileVertex).min(2).max(100_000).optional(),
    closed: z.boolean().default(false),
    surface: z.array(surfacePositionSchema).max(100_000).optional(),
  })
  .superRefine((value, ctx) => {
    if ((value.points === undefined) === (value.vertices === undefined)) {
      ctx.addIssue({ code: 'custom', message: 'give either "points" or "vertices" (one of them, not both)' });
    }
  })
  .superRefine(surfaceMatches);

const strokeSchema = z
  .strictObject({ points: z.array(vec3).min(2).max(10_000), surface: z.array(surfacePositionSchema).max(10_000).optional() })
  .superRefine(surfaceMatches);

const pinSchema = z
  .strictObject({
    attribute: z.enum(PIN_ATTRIBUTES),
    ...placement,
    value: z.number().min(0).max(10),
  })
  .superRefine(exactlyOnePlace);

/**
 * The mirror plane the editor mirrors edits across: an axis name (the plane across that axis,
 * `offset` from the origin along it) or a normal and offset (the points x with normal · x =
 * offset, in surface units). `seam` (surface units, default 0): places nearer the plane than
 * this are on it, and the editor does not double them. Only the editor uses it; growing is
 * unchanged by it.
 */
const seam = z.number().min(0).max(1e9).optional();
const symmetrySchema = z.union([
  z.strictObject({ axis: z.enum(['x', 'y', 'z']), offset: z.number().min(-1e9).max(1e9).optional(), seam }),
  z.strictObject({
    normal: vec3.refine((d) => Math.hypot(...d) > 0, 'the plane\'s normal must not be zero'),
    offset: z.number().min(-1e9).max(1e9),
    seam,
  }),
]);

const fieldSchemaV2 = z.strictObject({
  order: z.int().min(1).max(12).default(1),
  boundary: z.enum(['free', 'tangent', 'normal']).default('free'),
  rotation: degrees(-360, 360).default(0),
  referenceDirection: vec3.refine((d) => Math.hypot(...d) > 0, 'the reference direction must not be zero').optional(),
  singularities: z.array(singularitySchema).max(256).default([]),
  partings: z.array(curveSchema).max(64).default([]),
  crests: z.array(curveSchema).max(64).default([]),
  strokes: z.array(strokeSchema).max(256).default([]),
});

/**
 * Where a guide set grows: the faces of named OBJ groups (none named: the whole surface), the
 * side of one or more partings — the faces reachable from `from` without crossing them —, or a
 * painted mask named in the spec's `masks` (the faces whose corners' mean share is at least ½).
 */
const setRegionSchema = z
  .strictObject({
    groups: z.array(z.string().min(1).max(200)).max(1000).optional(),
    partings: z.array(z.int().min(0).max(63)).min(1).max(64).optional(),
    from: z.strictObject(placement).superRefine(exactlyOnePlace).optional(),
    mask: z.string().trim().min(1).max(100).optional(),
  })
  .superRefine((value, ctx) => {
    const bySide = value.partings !== undefined || value.from !== undefined;
    if (value.mask !== undefined && (value.groups !== undefined || bySide)) ctx.addIssue({ code: 'custom', message: 'give either "mask" or the region\'s other kind ("groups", or "partings" with "from"), not both' });
    else if (value.groups !== undefined && bySide) ctx.addIssue({ code: 'custom', message: 'give either "groups" or "partings" with "from", not both' });
    else if (bySide && (value.partings === undefined || value.from === undefined)) ctx.addIssue({ code: 'custom', message: 'a side of a parting needs both "partings" (their numbers in field.partings) and "from" (a place on that side)' });
  });

/** A named guide set: its own region and its own guide settings (the `guides` block's fields). */
const guideSetSchema = z.strictObject({
  name: z.string().trim().min(1).max(100),
  region: setRegionSchema.prefault({}),
  guides: guidesSchemaV3.prefault({}),
});

const specSchemaV3 = z
  .strictObject({
    // Version 2 is version 3 without tufts, waver, tip width or width pins: read as it is.
    specVersion: z.union([z.literal(2), z.literal(3)]),
    name: z.string().max(200).optional(),
    units: z.enum(UNITS),
    upAxis: z.enum(['y', 'z']).default('y'),
    field: fieldSchemaV2,
    guides: guidesSchemaV3.prefault({}),
    pins: z.array(pinSchema).max(1024).default([]),
    maps: z.array(mapSchema).max(64).optional(),
    masks: z.array(maskSchema).max(64).optional(),
    symmetry: symmetrySchema.optional(),
    guideSets: z.array(guideSetSchema).min(1).max(64).optional(),
  })
  .superRefine((spec, ctx) => {
    spec.maps?.forEach((map, i) => {
      if (spec.maps!.findIndex((other) => other.attribute === map.attribute) < i) {
        ctx.addIssue({ code: 'custom', path: ['maps', i, 'attribute'], message: `a map of "${map.attribute}" is already given; one map per attribute` });
      }
    });
    spec.masks?.forEach((mask, i) => {
      if (spec.masks!.findIndex((other) => other.name === mask.name) < i) {
        ctx.addIssue({ code: 'custom', path: ['masks', i, 'name'], message: `a mask named ${JSON.stringify(mask.name)} is already given; every mask needs its own name` });
      }
    });
    spec.guideSets?.forEach((set, i) => guideSetProblems(spec, set, i, ctx));
    const order = spec.field.order;
    spec.field.singularities.forEach((s, i) => {
      if (Math.abs(s.index * order - Math.round(s.index * order)) > 1e-9) {
        ctx.addIssue({ code: 'custom', path: ['field', 'singularities', i, 'index'], message: `must be a multiple of 1/${order} for a field of order ${order}` });
      }
    });
  })
  .transform((spec) => {
    // Lengths whose sensible default depends on the declared units are filled here, so that the
    // resolved spec written back out states every decision explicitly.
    const perCm = 1 / CENTIMETRES_PER_UNIT[spec.units];
    const { guideSets, ...rest } = spec;
    return {
      ...rest,
      specVersion: SPEC_VERSION as typeof SPEC_VERSION,
      guides: resolveGuides(spec.guides, perCm),
      ...(guideSets ? { guideSets: guideSets.map((set) => ({ name: set.name, region: set.region, guides: resolveGuides(set.guides, perCm) })) } : {}),
    };
  });

/** A set's own words: names unique, partings that exist, one points-per-guide for the whole groom. */
function guideSetProblems(spec: { field: { partings: unknown[] }; masks?: { name: string }[]; guideSets?: { name: string; guides: GuidesInput }[] }, set: { name: string; region: { partings?: number[]; mask?: string }; guides: GuidesInput }, i: number, ctx: z.RefinementCtx): void {
  const sets = spec.guideSets!;
  const path = ['guideSets', i];
  const same = sets.findIndex((other) => other.name === set.name);
  if (same < i) ctx.addIssue({ code: 'custom', path: [...path, 'name'], message: `${JSON.stringify(set.name)} is already the name of guide set ${same}; every set needs its own name` });
  set.region.partings?.forEach((p, k) => {
    if (p >= spec.field.partings.length) ctx.addIssue({ code: 'custom', path: [...path, 'region', 'partings', k], message: `there is no parting ${p}; the spec has ${spec.field.partings.length} (field.partings)` });
  });
  const mask = set.region.mask;
  if (mask !== undefined && !spec.masks?.some((m) => m.name === mask)) {
    ctx.addIssue({ code: 'custom', path: [...path, 'region', 'mask'], message: `there is no mask named ${JSON.stringify(mask)}; the spec's masks are ${spec.masks?.length ? spec.masks.map((m) => JSON.stringify(m.name)).join(', ') : 'none'}` });
  }
  if (set.guides.regions.length > 0) ctx.addIssue({ code: 'custom', path: [...path, 'guides', 'regions'], message: 'a guide set grows on its "region"; name its groups in region.groups' });
  // Counts are known before growing, so their sum is checked here; densities when the areas are known.
  const counted = sets.slice(0, i + 1).reduce((sum, s) => sum + (s.guides.count ?? 0), 0);
  const over = set.guides.count !== undefined && guidePointsProblem(counted, set.guides.pointsPerGuide);
  if (over && counted > set.guides.count!) ctx.addIssue({ code: 'custom', path: [...path, 'guides', 'count'], message: `with this set the groom has ${over}` });
  const first = sets[0].guides.pointsPerGuide;
  if (set.guides.pointsPerGuide !== first) ctx.addIssue({ code: 'custom', path: [...path, 'guides', 'pointsPerGuide'], message: `every guide set must have the same points per guide (${first}, as set ${JSON.stringify(sets[0].name)})` });
}


/** A groom spec as written by people and programs (defaults may be left out). */
export type GroomSpecInput = z.input<typeof specSchemaV3>;
/** A resolved groom spec: current version, every default filled in. */
export type GroomSpec = z.output<typeof specSchemaV3>;
export type SingularitySpec = GroomSpec['field']['singularities'][number];
export type CurveSpec = GroomSpec['field']['partings'][number];
export type StrokeSpec = GroomSpec['field']['strokes'][number];
export type PinSpec = GroomSpec['pins'][number];
export type MapSpec = NonNullable<GroomSpec['maps']>[number];
/** A painted mask (see `maskSchema` in maps.ts). */
export type MaskSpec = NonNullable<GroomSpec['masks']>[number];
/** The spec's mirror plane (see `symmetrySchema`). */
export type SymmetrySpec = NonNullable<GroomSpec['symmetry']>;
export type GuideSettings = GroomSpec['guides'];
/** A named guide set of the resolved spec. */
export type GuideSetSpec = NonNullable<GroomSpec['guideSets']>[number];
export type GuideSetRegion = GuideSetSpec['region'];
/** A place on the surface as the spec gives it. */
export interface PlaceSpec {
  readonly point?: readonly [number, number, number];
  readonly vertex?: number;
  readonly surface?: SurfacePosition;
}
/** A feature's place in the surface file's own numbering (see `surfacePositionSchema`). */
export type SurfacePosition = z.output<typeof surfacePositionSchema>;

/**
 * Version 1, the first published layout: no up axis (Y was assumed), curl as two flat numbers
 * `curl` and `curlWavelength`, and pins inside `guides`.
 */
const specSchemaV1 = z.strictObject({
  specVersion: z.literal(1),
  name: z.string().max(200).optional(),
  units: z.enum(UNITS),
  field: z.strictObject({
    order: z.int().min(1).max(12).optional(),
    rotation: degrees(-360, 360).optional(),
    singularities: z.array(singularitySchema).max(256).optional(),
    partings: z.array(curveSchema).max(64).optional(),
    crests: z.array(curveSchema).max(64).optional(),
    strokes: z.array(strokeSchema).max(256).optional(),
  }),
  guides: z
    .strictObject({
      ...guideAmount,
      regions: z.array(z.string().min(1).max(200)).max(1000).optional(),
      length: size.optional(),
      lift: degrees(0, 90).optional(),
      droop: z.number().min(0).max(1).optional(),
      curl: z.number().min(0).max(1e6).optional(),
      curlWavelength: size.optional(),
      jitter: z.number().min(0).max(1).optional(),
      pointsPerGuide: z.int().min(2).max(64).optional(),
      seed: z.int().min(0).max(2 ** 32 - 1).optional(),
      pins: z.array(pinSchema).max(1024).optional(),
    })
    .superRefine(notBothAmounts)
    .optional(),
});

/** Version 1 → 2: the up axis becomes explicit (Y, as version 1 assumed), curl one object, pins top level. */
function migrateV1(raw: unknown): unknown {
  const v1 = specSchemaV1.parse(raw);
  const { pins, curl, curlWavelength, ...guides } = v1.guides ?? {};
  return {
    specVersion: 2,
    ...(v1.name !== undefined ? { name: v1.name } : {}),
    units: v1.units,
    upAxis: 'y',
    field: v1.field,
    guides: { ...guides, curl: { amplitude: curl, wavelength: curlWavelength } },
    pins: pins ?? [],
  };
}

/** One problem in a spec: where (dotted path, `field.singularities[1].index`) and what. */
export interface SpecProblem {
  readonly path: string;
  readonly message: string;
}

function formatPath(path: readonly PropertyKey[]): string {
  let out = '';
  for (const key of path) out += typeof key === 'number' ? `[${key}]` : `${out ? '.' : ''}${String(key)}`;
  return out || '(the whole spec)';
}

function problemsOf(error: z.ZodError): SpecProblem[] {
  return error.issues.flatMap((issue): SpecProblem[] => {
    if (issue.code === 'unrecognized_keys') {
      return issue.keys.map((key) => ({ path: formatPath([...issue.path, key]), message: 'is not a field of the groom spec' }));
    }
    return [{ path: formatPath(issue.path), message: issue.message }];
  });
}

/**
 * Checks a spec of any supported version and brings it to the current one.
 *
 * Guarantees: returns either the resolved current-version spec (every default filled in) or every
 * problem found, each with the dotted path of the offending field; unknown fields and values out
 * of range are problems, never silently dropped or clamped.
 */
export function validateGroomSpec(input: unknown): { spec: GroomSpec; problems?: undefined } | { spec?: undefined; problems: SpecProblem[] } {
  if (typeof input !== 'object' || input === null || Array.isArray(input)) {
    return { problems: [{ path: '(the whole spec)', message: 'must be a JSON object' }] };
  }
  const version = (input as { specVersion?: unknown }).specVersion;
  let current: unknown = input;
  if (version === 1) {
    try {
      current = migrateV1(input);
    } catch (error) {
      if (error instanceof z.ZodError) return { problems: problemsOf(error) };
      throw error;
    }
  } else if (version !== 2 && version !== SPEC_VERSION) {
    const said = version === undefined ? 'is missing' : `is ${JSON.stringify(version)}`;
    return { problems: [{ path: 'specVersion', message: `${said}; this version of Whorlwind reads spec versions 1 to ${SPEC_VERSION}` }] };
  }
  const result = specSchemaV3.safeParse(current);
  return result.success ? { spec: result.data } : { problems: problemsOf(result.error) };
}

/**
 * Parses a spec (any supported version) into the resolved current version.
 *
 * Guarantees: throws GroomError `invalid-spec` whose message starts with the dotted path of the
 * first bad field (and whose `path` holds it) when anything is unknown, missing or out of range.
 */
export function parseGroomSpec(input: unknown): GroomSpec {
  const result = validateGroomSpec(input);
  if (result.spec) return result.spec;
  const [first, ...rest] = result.problems;
  const more = rest.length > 0 ? ` (and ${rest.length} more problem${rest.length > 1 ? 's' : ''})` : '';
  throw new GroomError('invalid-spec', `${first.path}: ${first.message}${more}`, first.path);
}

/** Parses spec JSON text. Guarantees: a GroomError `invalid-json` for text that is not JSON, else as `parseGroomSpec`. */
export function parseGroomSpecJson(text: string): GroomSpec {
  let input: unknown;
  try {
    input = JSON.parse(text);
  } catch (error) {
    throw new GroomError('invalid-json', `The groom spec is not valid JSON: ${(error as Error).message}`);
  }
  return parseGroomSpec(input);
}

/**
 * The spec as the `.json` export: the resolved current version, two-space indented, one final
 * newline. Guarantees: `parseGroomSpecJson(specToJson(s))` deep-equals `s`.
 */
export function specToJson(spec: GroomSpec): string {
  return `${JSON.stringify(spec, null, 2)}\n`;
}
