// Restoring a version: its spec becomes the groom's saved spec, as a new revision.
import { STUDIO_ROLES } from '@/lib/accounts/roles';
import { handler, jsonData, pathId } from '@/lib/http/server';
import type { RestoredResponse } from '@/lib/studio/types';
import { restoreVersion } from '@/lib/studio/grooms';
import { notFound } from '@/lib/studio/errors';

type Context = { params: Promise<{ groomId: string; versionId: string }> };

export function POST(_request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', notFound('groom'));
    const versionId = await pathId(context.params, 'versionId', notFound('version'));
    return jsonData<RestoredResponse>(await restoreVersion(groomer, groomId, versionId));
  });
}
