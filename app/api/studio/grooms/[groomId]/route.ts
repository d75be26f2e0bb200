// One groom of the groomer: its spec, surface and versions; renaming; deletion.
import { jsonData, readJson } from '@/lib/http/server';
import type { DeletedResponse, GroomResponse } from '@/lib/studio/types';
import { deleteGroom, getGroom, renameGroom } from '@/lib/studio/grooms';
import { pathId, studioHandler } from '@/lib/studio/http';
import { renameGroomSchema } from '@/lib/studio/validation';

type Context = { params: Promise<{ groomId: string }> };

export async function GET(_request: Request, context: Context) {
  return studioHandler(async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', 'groom');
    return jsonData<GroomResponse>({ groom: await getGroom(groomer, groomId) });
  });
}

export async function PATCH(request: Request, context: Context) {
  return studioHandler(async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', 'groom');
    const input = await readJson(request, renameGroomSchema);
    if (!input.ok) return input.response;
    return jsonData<GroomResponse>({ groom: await renameGroom(groomer, groomId, input.value.name) });
  });
}

export async function DELETE(_request: Request, context: Context) {
  return studioHandler(async (groomer) => {
    await deleteGroom(groomer, await pathId(context.params, 'groomId', 'groom'));
    return jsonData<DeletedResponse>({ deleted: true });
  });
}
