// Asks for an export of a groom's saved spec, made by a background job.
import { jsonData, readJson } from '@/lib/http/server';
import type { ExportResponse } from '@/lib/studio/types';
import { requestExport } from '@/lib/studio/exports';
import { pathId, studioHandler } from '@/lib/studio/http';
import { createExportSchema } from '@/lib/studio/validation';

type Context = { params: Promise<{ groomId: string }> };

export async function POST(request: Request, context: Context) {
  return studioHandler(async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', 'groom');
    const input = await readJson(request, createExportSchema);
    if (!input.ok) return input.response;
    return jsonData<ExportResponse>({ export: await requestExport(groomer, groomId, input.value.format) }, 202);
  });
}
