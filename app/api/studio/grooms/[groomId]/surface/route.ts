// Moves a groom onto another surface: its spec carried over, the groom as it was kept as a version.
import { STUDIO_ROLES } from '@/lib/accounts/roles';
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import type { GroomResponse } from '@/lib/studio/types';
import { acceptSurfaceMove } from '@/lib/studio/surface-change';
import { notFound } from '@/lib/studio/errors';
import { acceptSurfaceMoveSchema } from '@/lib/studio/validation';

type Context = { params: Promise<{ groomId: string }> };

export function PUT(request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', notFound('groom'));
    const input = await readBody(request, acceptSurfaceMoveSchema);
    return jsonData<GroomResponse>({ groom: await acceptSurfaceMove(groomer, groomId, input) });
  });
}
