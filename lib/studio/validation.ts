// The zod schemas of the studio's request bodies, shared by the route handlers and the studio's
// forms (plain zod, safe to import from client code).
import { z } from 'zod';
import { MAP_ATTRIBUTES } from '../groom/spec/maps';
import { EXPORT_FORMATS, SURFACE_UNITS } from './types';

const name = (what: string) =>
  z.string().trim().min(1, `Give the ${what} a name.`).max(200, 'Use a name of at most 200 characters.');

export const uploadSchema = z.object({
  fileName: z.string().trim().min(1, 'Give the file name.').max(255, 'Use a file name of at most 255 characters.'),
  byteSize: z.int('Give the file size in whole bytes.').positive('The file is empty.'),
});

export const registerSurfaceSchema = z.object({
  uploadId: z.uuid('Give the uploadId that POST /api/studio/uploads answered.'),
  name: name('surface'),
  units: z.enum(SURFACE_UNITS, 'Say which units the file is in: mm, cm, m or in.'),
});

export const createGroomSchema = z.object({
  surfaceId: z.uuid('Choose one of your growth surfaces.'),
  name: name('groom'),
});

export const renameGroomSchema = z.object({ name: name('groom') });

const point = z.tuple([z.number(), z.number(), z.number()]);

/** Where to move a groom (or start one from it) and how to carry its places. */
export const surfaceMoveSchema = z.object({
  surfaceId: z.uuid('Choose one of your growth surfaces.'),
  landmarks: z.array(z.object({ from: point, to: point }), 'Give landmarks as pairs of points.').max(64, 'Use at most 64 landmark pairs.').optional(),
  regionMap: z.record(z.string().min(1).max(200), z.string().min(1).max(200)).optional(),
  method: z.enum(['auto', 'topology', 'uv', 'alignment'], 'Choose auto, topology, uv or alignment.').optional(),
  moveId: z.uuid('Send the moveId of the transfer report, or leave it out.').optional(),
});

export const acceptSurfaceMoveSchema = surfaceMoveSchema.extend({
  baseRevision: z.int('Send the revision the transfer report was made from.').positive('Send the revision the transfer report was made from.'),
});

/** A copy on the same surface, or — with `surfaceId` — a new groom on another surface with the places carried over. */
export const duplicateGroomSchema = surfaceMoveSchema.partial({ surfaceId: true }).extend({ name: name('copy').optional() });

export const saveSpecSchema = z.object({
  // Checked in full by lib/groom's spec schema, which names each problem by its path in the spec.
  spec: z.custom<unknown>((value) => value !== undefined, 'Send the groom spec.'),
  baseRevision: z.int('Send the revision the spec was loaded at.').positive('Send the revision the spec was loaded at.'),
});

export const createVersionSchema = z.object({ name: name('version') });

export const createExportSchema = z.object({
  format: z.enum(EXPORT_FORMATS, `Choose one of ${EXPORT_FORMATS.join(', ')}.`),
  /** Write the growth surface beside the guides (USD, glTF and OBJ; the other formats have no guides to bind). */
  withSurface: z.boolean('withSurface is true or false.').optional(),
});

/**
 * Most bytes of a map image: 16 MB (a 2048² 16-bit greyscale PNG is 8 MB uncompressed, a 4096²
 * 8-bit one 16 MB). Our choice, from the sizes painters use for a character's maps; no standard.
 */
export const MAP_IMAGE_MAX_BYTES = 16_000_000;
/** The image map request's body: the image in base64 (4 bytes per 3) and a few hundred bytes of fields. */
export const MAP_IMAGE_BODY_LIMIT = Math.ceil(MAP_IMAGE_MAX_BYTES / 3) * 4 + 10_000;

/** A factor (the spec's map bounds: 0–10). */
const factor = (what: string) => z.number(`Give the ${what} factor as a number.`).min(0, `The ${what} factor is 0 or more.`).max(10, `The ${what} factor is 10 or less.`);

/**
 * A painted map read from an image through the surface's UVs: which attribute it drives, the
 * factors of black (`low`) and white (`high`), and the image itself (PNG or TIFF, base64).
 */
export const imageMapSchema = z
  .object({
    attribute: z.enum(MAP_ATTRIBUTES, `Choose what the map drives: ${MAP_ATTRIBUTES.join(', ')}.`),
    low: factor('black').default(0),
    high: factor('white').default(1),
    image: z
      .string('Choose a PNG or TIFF image.')
      .min(1, 'Choose a PNG or TIFF image.')
      .max(Math.ceil(MAP_IMAGE_MAX_BYTES / 3) * 4, `The image is larger than ${MAP_IMAGE_MAX_BYTES / 1_000_000} MB; use a smaller one.`)
      .regex(/^[A-Za-z0-9+/]*={0,2}$/, 'The image must be sent as base64.'),
  })
  .refine((value) => value.low <= value.high, { path: ['high'], message: 'The white factor must not be below the black one.' });
