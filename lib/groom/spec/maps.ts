import { z } from 'zod';

/**
 * What a painted map may drive: the pinned attributes (spec.ts's PIN_ATTRIBUTES), the waver's amplitude and the tufts' gather
 * (both shares, root and tip, capped at 1). Each is a factor on the spec's value, like a pin's.
 */
export const MAP_ATTRIBUTES = ['length', 'lift', 'droop', 'curl', 'jitter', 'density', 'width', 'waver', 'gather'] as const;
export type MapAttribute = (typeof MAP_ATTRIBUTES)[number];

/**
 * A painted map: one factor per vertex of the welded growth surface, quantised to `bits` (8 or
 * 16) between `low` and `high` (code 0 is `low`, the largest code `high`; both exact), codes
 * little-endian in base64. `vertices`, `faces` and `signature` name the surface it was painted on
 * (see lib/groom/place/maps.ts), so a map on another surface is refused rather than misread.
 */
export const mapSchema = z
  .strictObject({
    attribute: z.enum(MAP_ATTRIBUTES),
    vertices: z.int().min(1).max(2 ** 32 - 1),
    faces: z.int().min(1).max(2 ** 32 - 1),
    signature: z.string().regex(/^[0-9a-f]{8}$/, 'must be 8 hexadecimal digits (the surface signature)'),
    bits: z.union([z.literal(8), z.literal(16)]),
    low: z.number().min(0).max(10),
    high: z.number().min(0).max(10),
    data: z.string().max(64_000_000).regex(/^[A-Za-z0-9+/]*={0,2}$/, 'must be base64'),
  })
  .superRefine((map, ctx) => {
    if (map.high < map.low) ctx.addIssue({ code: 'custom', path: ['high'], message: `must not be below low (${map.low})` });
    const bytes = map.vertices * (map.bits / 8);
    const expected = 4 * Math.ceil(bytes / 3);
    if (map.data.length !== expected) {
      ctx.addIssue({ code: 'custom', path: ['data'], message: `holds ${map.data.length} base64 characters; ${map.vertices} vertices at ${map.bits} bits need ${expected}` });
    }
  });
