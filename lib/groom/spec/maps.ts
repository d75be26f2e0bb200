import { z } from 'zod';

/**
 * What a painted map may drive: the pinned attributes (spec.ts's PIN_ATTRIBUTES), the waver's amplitude and the tufts' gather
 * (both shares, root and tip, capped at 1), and the rest of the breakup (appended, so older specs read as before): where
 * tuft and inner-tuft centres fall (`tuftDensity`, `innerTuftDensity`), how strongly inner tufts are drawn into their
 * tuft (`innerGather`), the gather's rise (`gatherRise`), the share of loners (`loners`, capped at 1), the waver's waves
 * along the guide (`waves`) and the tip's width alone (`tipWidth`). Each is a factor on the spec's value, like a pin's.
 */
export const MAP_ATTRIBUTES = [
  'length', 'lift', 'droop', 'curl', 'jitter', 'density', 'width', 'waver', 'gather',
  'tuftDensity', 'innerTuftDensity', 'innerGather', 'gatherRise', 'loners', 'waves', 'tipWidth',
] as const;
export type MapAttribute = (typeof MAP_ATTRIBUTES)[number];

/** The per-vertex values a map and a mask share (see `mapSchema`). */
const codedValues = {
  vertices: z.int().min(1).max(2 ** 32 - 1),
  faces: z.int().min(1).max(2 ** 32 - 1),
  signature: z.string().regex(/^[0-9a-f]{8}$/, 'must be 8 hexadecimal digits (the surface signature)'),
  bits: z.union([z.literal(8), z.literal(16)]),
  low: z.number().min(0).max(10),
  high: z.number().min(0).max(10),
  data: z.string().max(64_000_000).regex(/^[A-Za-z0-9+/]*={0,2}$/, 'must be base64'),
};

/** The coded values' own checks: the range in order, the data as long as the vertices need. */
function codedProblems(map: { vertices: number; bits: number; low: number; high: number; data: string }, ctx: z.RefinementCtx): void {
  if (map.high < map.low) ctx.addIssue({ code: 'custom', path: ['high'], message: `must not be below low (${map.low})` });
  const bytes = map.vertices * (map.bits / 8);
  const expected = 4 * Math.ceil(bytes / 3);
  if (map.data.length !== expected) {
    ctx.addIssue({ code: 'custom', path: ['data'], message: `holds ${map.data.length} base64 characters; ${map.vertices} vertices at ${map.bits} bits need ${expected}` });
  }
}

/**
 * A painted map: one factor per vertex of the welded growth surface, quantised to `bits` (8 or
 * 16) between `low` and `high` (code 0 is `low`, the largest code `high`; both exact), codes
 * little-endian in base64. `vertices`, `faces` and `signature` name the surface it was painted on
 * (see lib/groom/place/maps.ts), so a map on another surface is refused rather than misread.
 */
export const mapSchema = z.strictObject({ attribute: z.enum(MAP_ATTRIBUTES), ...codedValues }).superRefine(codedProblems);

/**
 * A painted mask: a named share per vertex of the welded growth surface, 0 (outside) to 1
 * (inside), coded exactly as a map's factors (same `bits`, `low`, `high`, `data`, surface
 * signature). A guide set whose region names the mask grows on the faces whose three corners'
 * mean is at least ½ (lib/groom/place/paint.ts, `facesOfMask`).
 */
export const maskSchema = z
  .strictObject({ name: z.string().trim().min(1).max(100), ...codedValues, low: z.number().min(0).max(1), high: z.number().min(0).max(1) })
  .superRefine(codedProblems);
