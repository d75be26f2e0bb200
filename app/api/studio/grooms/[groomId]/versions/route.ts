// Named versions of a groom: the list, or a copy of the saved spec kept under a name.
import { jsonData, readJson } from '@/lib/http/server';
import type { VersionListResponse, VersionResponse } from '@/lib/studio/types';
import { createVersion, listVersions } from '@/lib/studio/grooms';
import { pathId, studioHandler } from '@/lib/studio/http';
import { createVersionSchema } from '@/lib/studio/validation';

type Context = { params: Promise<{ groomId: string }> };

export async function GET(_request: Request, context: Context) {
  return studioHandler(async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', 'groom');
    return jsonData<VersionListResponse>({ versions: await listVersions(groomer, groomId) });
  });
}

export async function POST(request: Request, context: Context) {
  return studioHandler(async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', 'groom');
    const input = await readJson(request, createVersionSchema);
    if (!input.ok) return input.response;
    return jsonData<VersionResponse>({ version: await createVersion(groomer, groomId, input.value.name) }, 201);
  });
}
