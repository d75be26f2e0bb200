// One growth surface of the groomer: its facts with links to the file and thumbnail, or deletion.
import { jsonData } from '@/lib/http/server';
import type { DeletedResponse, SurfaceDetailResponse } from '@/lib/studio/types';
import { pathId, studioHandler } from '@/lib/studio/http';
import { deleteSurface, getSurface } from '@/lib/studio/surfaces';

type Context = { params: Promise<{ surfaceId: string }> };

export async function GET(_request: Request, context: Context) {
  return studioHandler(async (groomer) => {
    const surfaceId = await pathId(context.params, 'surfaceId', 'surface');
    return jsonData<SurfaceDetailResponse>({ surface: await getSurface(groomer, surfaceId) });
  });
}

export async function DELETE(_request: Request, context: Context) {
  return studioHandler(async (groomer) => {
    await deleteSurface(groomer, await pathId(context.params, 'surfaceId', 'surface'));
    return jsonData<DeletedResponse>({ deleted: true });
  });
}
