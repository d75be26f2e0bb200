// The features of a groom spec as the studio names and lists them: whorls, saddles and other
// singularities, partings, crests, flow strokes and pins. Plain data helpers, no React.
import type { Vec3 } from '@/lib/field';
import type { CurveSpec, GroomSpec, PinSpec, SingularitySpec, StrokeSpec } from '@/lib/groom/spec/spec';

/** Points as the spec writes them (lib/field's Vec3), named here for the studio's helpers. */
export type { Vec3 };

/** Where a feature lives in the spec. Curves are kept apart by kind, as the spec keeps them. */
export type FeatureKind = 'singularity' | 'parting' | 'crest' | 'stroke' | 'pin';
export interface FeatureRef {
  readonly kind: FeatureKind;
  readonly index: number;
}

export type SingularityKind = 'whorl' | 'saddle' | 'other';

export function singularityKind(index: number): SingularityKind {
  if (index === 1) return 'whorl';
  if (index === -1) return 'saddle';
  return 'other';
}

export const SINGULARITY_NAMES: Record<SingularityKind, string> = { whorl: 'Whorl', saddle: 'Saddle', other: 'Singularity' };
export const CURVE_NAMES = { parting: 'Parting', crest: 'Crest' } as const;

/**
 * An index in the words of the trade: `+1`, `−1`, `+1/2` for a field of order 2, `0`.
 * Uses the true minus sign so that the figures line up in lists.
 */
export function formatIndex(value: number, order = 1): string {
  const rounded = Math.round(value * 1e6) / 1e6;
  if (rounded === 0) return '0';
  const sign = rounded > 0 ? '+' : '−';
  const magnitude = Math.abs(rounded);
  const numerator = Math.round(magnitude * order);
  if (order > 1 && Math.abs(numerator - magnitude * order) < 1e-6 && numerator % order !== 0) {
    const divisor = gcd(numerator, order);
    return `${sign}${numerator / divisor}/${order / divisor}`;
  }
  return `${sign}${Number.isInteger(magnitude) ? magnitude : magnitude.toFixed(3)}`;
}

function gcd(a: number, b: number): number {
  return b === 0 ? a : gcd(b, a % b);
}

/** The list of a spec's features, in the order the side list shows them. */
export function listFeatures(spec: GroomSpec): FeatureRef[] {
  const refs: FeatureRef[] = [];
  spec.field.singularities.forEach((_, index) => refs.push({ kind: 'singularity', index }));
  spec.field.partings.forEach((_, index) => refs.push({ kind: 'parting', index }));
  spec.field.crests.forEach((_, index) => refs.push({ kind: 'crest', index }));
  spec.field.strokes.forEach((_, index) => refs.push({ kind: 'stroke', index }));
  spec.pins.forEach((_, index) => refs.push({ kind: 'pin', index }));
  return refs;
}

export function sameFeature(a: FeatureRef | null | undefined, b: FeatureRef | null | undefined): boolean {
  return !!a && !!b && a.kind === b.kind && a.index === b.index;
}

export function featureExists(spec: GroomSpec, ref: FeatureRef): boolean {
  return ref.index >= 0 && ref.index < featureArray(spec, ref.kind).length;
}

export function featureArray(spec: GroomSpec, kind: FeatureKind): readonly unknown[] {
  switch (kind) {
    case 'singularity':
      return spec.field.singularities;
    case 'parting':
      return spec.field.partings;
    case 'crest':
      return spec.field.crests;
    case 'stroke':
      return spec.field.strokes;
    case 'pin':
      return spec.pins;
  }
}

/**
 * A feature's name in lists and messages: "Whorl 2", "Saddle 1", "Singularity 1 (+2)",
 * "Parting 1", "Flow stroke 3", "Length pin 1". Whorls and saddles are counted separately, in
 * the order they appear in the spec.
 */
export function featureLabel(spec: GroomSpec, ref: FeatureRef): string {
  switch (ref.kind) {
    case 'singularity': {
      const all = spec.field.singularities;
      const s = all[ref.index];
      if (!s) return 'Singularity';
      const kind = singularityKind(s.index);
      const number = all.slice(0, ref.index + 1).filter((other) => singularityKind(other.index) === kind).length;
      const base = `${SINGULARITY_NAMES[kind]} ${number}`;
      return kind === 'other' ? `${base} (${formatIndex(s.index, spec.field.order)})` : base;
    }
    case 'parting':
    case 'crest':
      return `${CURVE_NAMES[ref.kind]} ${ref.index + 1}`;
    case 'stroke':
      return `Flow stroke ${ref.index + 1}`;
    case 'pin': {
      const pin = spec.pins[ref.index];
      if (!pin) return 'Pin';
      const number = spec.pins.slice(0, ref.index + 1).filter((other) => other.attribute === pin.attribute).length;
      return `${capitalise(pin.attribute)} pin ${number}`;
    }
  }
}

export function capitalise(text: string): string {
  return text.charAt(0).toUpperCase() + text.slice(1);
}

/**
 * The ref of a feature in a spec path from the groom library or the server
 * (`field.singularities[2].point` → singularity 2), or null for paths outside the features.
 */
export function featureOfPath(path: string): FeatureRef | null {
  const match = /^(?:field\.(singularities|partings|crests|strokes)|(pins))\[(\d+)\]/.exec(path);
  if (!match) return null;
  const list = match[1] ?? match[2];
  const kind: FeatureKind =
    list === 'singularities' ? 'singularity' : list === 'partings' ? 'parting' : list === 'crests' ? 'crest' : list === 'strokes' ? 'stroke' : 'pin';
  return { kind, index: Number(match[3]) };
}

/** The spec path of a feature (`field.partings[0]`). */
export function pathOfFeature(ref: FeatureRef): string {
  const list = { singularity: 'field.singularities', parting: 'field.partings', crest: 'field.crests', stroke: 'field.strokes', pin: 'pins' }[ref.kind];
  return `${list}[${ref.index}]`;
}

/** Rounds a coordinate for the spec: seven significant digits keep every vertex apart and the JSON readable. */
export function roundCoordinate(x: number): number {
  if (x === 0 || !Number.isFinite(x)) return x === 0 ? 0 : x;
  return Number(x.toPrecision(7));
}

export function roundPoint(p: readonly number[]): Vec3 {
  return [roundCoordinate(p[0]), roundCoordinate(p[1]), roundCoordinate(p[2])];
}

export type { CurveSpec, PinSpec, SingularitySpec, StrokeSpec };
