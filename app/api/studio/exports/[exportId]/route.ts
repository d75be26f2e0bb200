// An export's progress, and once done its download link.
import { STUDIO_ROLES } from '@/lib/accounts/roles';
import { handler, jsonData, pathId } from '@/lib/http/server';
import type { ExportResponse } from '@/lib/studio/types';
import { getExport } from '@/lib/studio/exports';
import { notFound } from '@/lib/studio/errors';

type Context = { params: Promise<{ exportId: string }> };

export function GET(_request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const exportId = await pathId(context.params, 'exportId', notFound('export'));
    return jsonData<ExportResponse>({ export: await getExport(groomer, exportId) });
  });
}
