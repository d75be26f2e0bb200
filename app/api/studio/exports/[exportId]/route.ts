// An export's progress, and once done its download link.
import { jsonData } from '@/lib/http/server';
import type { ExportResponse } from '@/lib/studio/types';
import { getExport } from '@/lib/studio/exports';
import { pathId, studioHandler } from '@/lib/studio/http';

type Context = { params: Promise<{ exportId: string }> };

export async function GET(_request: Request, context: Context) {
  return studioHandler(async (groomer) => {
    const exportId = await pathId(context.params, 'exportId', 'export');
    return jsonData<ExportResponse>({ export: await getExport(groomer, exportId) });
  });
}
