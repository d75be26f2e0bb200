// Asks for an export of a groom's saved spec, made by a background job.
import { STUDIO_ROLES } from '@/lib/accounts/roles';
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import type { ExportResponse } from '@/lib/studio/types';
import { requestExport } from '@/lib/studio/exports';
import { notFound } from '@/lib/studio/errors';
import { createExportSchema } from '@/lib/studio/validation';

type Context = { params: Promise<{ groomId: string }> };

export function POST(request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', notFound('groom'));
    const input = await readBody(request, createExportSchema);
    return jsonData<ExportResponse>({ export: await requestExport(groomer, groomId, input.format, { withSurface: input.withSurface }) }, 202);
  });
}
