// Restoring a version: its spec becomes the groom's saved spec, as a new revision.
import { jsonData } from '@/lib/http/server';
import type { RestoredResponse } from '@/lib/studio/types';
import { restoreVersion } from '@/lib/studio/grooms';
import { pathId, studioHandler } from '@/lib/studio/http';

type Context = { params: Promise<{ groomId: string; versionId: string }> };

export async function POST(_request: Request, context: Context) {
  return studioHandler(async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', 'groom');
    const versionId = await pathId(context.params, 'versionId', 'version');
    return jsonData<RestoredResponse>(await restoreVersion(groomer, groomId, versionId));
  });
}
