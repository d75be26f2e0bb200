// A painted map read from an image through one of the groomer's surfaces' UVs (PNG or TIFF, 8 or 16
// bits, sent as base64 in a bounded JSON body); the answer is the map for the groom's spec.
import { STUDIO_ROLES } from '@/lib/accounts/roles';
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import { notFound } from '@/lib/studio/errors';
import { mapFromImage } from '@/lib/studio/image-maps';
import type { ImageMapResponse } from '@/lib/studio/types';
import { MAP_IMAGE_BODY_LIMIT, imageMapSchema } from '@/lib/studio/validation';

type Context = { params: Promise<{ surfaceId: string }> };

export function POST(request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const surfaceId = await pathId(context.params, 'surfaceId', notFound('surface'));
    const input = await readBody(request, imageMapSchema, MAP_IMAGE_BODY_LIMIT);
    return jsonData<ImageMapResponse>(await mapFromImage(groomer, surfaceId, input));
  });
}
