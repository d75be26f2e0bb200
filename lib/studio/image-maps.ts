// Painted maps read from images in the studio: the groomer sends an image and the server lays it
// onto one of their surfaces through its UVs (lib/groom's readImageMap, by sharp: server only),
// answering the map in the spec's compact form. The editor adds it to the groom as one edit; the
// map is saved with the spec like any other, so nothing is stored here.
import { GroomError, encodeMap } from '../groom';
import { readImageMap } from '../groom/render/image-map';
import { HttpError } from '../http/errors';
import type { Groomer } from '../accounts/actor';
import { surfaceMesh } from './surface-cache';
import { ownSurfaceRow } from './surfaces';
import type { ImageMapResponse } from './types';
import type { z } from 'zod';
import type { imageMapSchema } from './validation';

/**
 * The map an image makes on the groomer's surface: black is `low`, white `high`, read bilinearly at
 * each corner's UV (see readImageMap), coded in 16 bits between exactly `low` and `high`, and
 * signed with the surface's welded vertices and triangles, so it fits the grooms on that surface.
 *
 * Guarantees: a 404 for a surface that is not the groomer's; 409 `surface-not-ready` while it is
 * checked or when it was refused; 422 `map-refused`, in words, for a surface without UVs or bytes
 * that are not an 8- or 16-bit PNG or TIFF. Nothing is written anywhere.
 */
export async function mapFromImage(groomer: Groomer, surfaceId: string, input: z.output<typeof imageMapSchema>): Promise<ImageMapResponse> {
  const row = await ownSurfaceRow(groomer, surfaceId);
  if (row.state !== 'ready') {
    throw new HttpError(409, 'surface-not-ready', row.state === 'checking' ? `${row.name} is still being checked; lay a map on it once it is ready.` : `${row.name} was refused by its check and cannot carry a map.`);
  }
  const mesh = await surfaceMesh({ id: row.id, objectKey: row.object_key, fileName: row.file_name });
  let values: Float64Array;
  try {
    values = await readImageMap(Buffer.from(input.image, 'base64'), mesh, { low: input.low, high: input.high });
  } catch (error) {
    if (error instanceof GroomError) throw new HttpError(422, 'map-refused', error.message);
    throw error;
  }
  return { map: encodeMap(input.attribute, values, mesh, 16, { low: input.low, high: input.high }) };
}
