// The transfer report of moving a groom onto another surface, before anything changes.
import { STUDIO_ROLES } from '@/lib/accounts/roles';
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import type { SurfaceMovePreviewResponse } from '@/lib/studio/types';
import { previewSurfaceMove } from '@/lib/studio/surface-change';
import { notFound } from '@/lib/studio/errors';
import { surfaceMoveSchema } from '@/lib/studio/validation';

type Context = { params: Promise<{ groomId: string }> };

export function POST(request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', notFound('groom'));
    const input = await readBody(request, surfaceMoveSchema);
    return jsonData<SurfaceMovePreviewResponse>({ preview: await previewSurfaceMove(groomer, groomId, input) });
  });
}
