// Named versions of a groom: the list, or a copy of the saved spec kept under a name.
import { STUDIO_ROLES } from '@/lib/accounts/roles';
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import type { VersionListResponse, VersionResponse } from '@/lib/studio/types';
import { createVersion, listVersions } from '@/lib/studio/grooms';
import { notFound } from '@/lib/studio/errors';
import { createVersionSchema } from '@/lib/studio/validation';

type Context = { params: Promise<{ groomId: string }> };

export function GET(_request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', notFound('groom'));
    return jsonData<VersionListResponse>({ versions: await listVersions(groomer, groomId) });
  });
}

export function POST(request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', notFound('groom'));
    const input = await readBody(request, createVersionSchema);
    return jsonData<VersionResponse>({ version: await createVersion(groomer, groomId, input.name) }, 201);
  });
}
