// One growth surface of the groomer: its facts with links to the file and thumbnail, or deletion.
import { STUDIO_ROLES } from '@/lib/accounts/roles';
import { handler, jsonData, pathId } from '@/lib/http/server';
import type { DeletedResponse, SurfaceDetailResponse } from '@/lib/studio/types';
import { notFound } from '@/lib/studio/errors';
import { deleteSurface, getSurface } from '@/lib/studio/surfaces';

type Context = { params: Promise<{ surfaceId: string }> };

export function GET(_request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const surfaceId = await pathId(context.params, 'surfaceId', notFound('surface'));
    return jsonData<SurfaceDetailResponse>({ surface: await getSurface(groomer, surfaceId) });
  });
}

export function DELETE(_request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    await deleteSurface(groomer, await pathId(context.params, 'surfaceId', notFound('surface')));
    return jsonData<DeletedResponse>({ deleted: true });
  });
}
