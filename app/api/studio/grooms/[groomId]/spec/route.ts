// Autosave of a groom's spec, checked against lib/groom's schema and the revision it was loaded at.
import { jsonData, readJson } from '@/lib/http/server';
import type { SpecSavedResponse } from '@/lib/studio/types';
import { saveSpec } from '@/lib/studio/grooms';
import { pathId, studioHandler } from '@/lib/studio/http';
import { saveSpecSchema } from '@/lib/studio/validation';

type Context = { params: Promise<{ groomId: string }> };

export async function PUT(request: Request, context: Context) {
  return studioHandler(async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', 'groom');
    const input = await readJson(request, saveSpecSchema);
    if (!input.ok) return input.response;
    return jsonData<SpecSavedResponse>(await saveSpec(groomer, groomId, input.value));
  });
}
