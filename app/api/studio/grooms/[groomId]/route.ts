// One groom of the groomer: its spec, surface and versions; renaming; deletion.
import { STUDIO_ROLES } from '@/lib/accounts/roles';
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import type { DeletedResponse, GroomResponse } from '@/lib/studio/types';
import { deleteGroom, getGroom, renameGroom } from '@/lib/studio/grooms';
import { notFound } from '@/lib/studio/errors';
import { renameGroomSchema } from '@/lib/studio/validation';

type Context = { params: Promise<{ groomId: string }> };

export function GET(_request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', notFound('groom'));
    return jsonData<GroomResponse>({ groom: await getGroom(groomer, groomId) });
  });
}

export function PATCH(request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', notFound('groom'));
    const input = await readBody(request, renameGroomSchema);
    return jsonData<GroomResponse>({ groom: await renameGroom(groomer, groomId, input.name) });
  });
}

export function DELETE(_request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    await deleteGroom(groomer, await pathId(context.params, 'groomId', notFound('groom')));
    return jsonData<DeletedResponse>({ deleted: true });
  });
}
