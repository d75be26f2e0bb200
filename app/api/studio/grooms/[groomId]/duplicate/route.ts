// A copy of a groom on the same surface, starting from its saved spec.
import { jsonData, readJson } from '@/lib/http/server';
import type { GroomResponse } from '@/lib/studio/types';
import { duplicateGroom } from '@/lib/studio/grooms';
import { pathId, studioHandler } from '@/lib/studio/http';
import { duplicateGroomSchema } from '@/lib/studio/validation';

type Context = { params: Promise<{ groomId: string }> };

export async function POST(request: Request, context: Context) {
  return studioHandler(async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', 'groom');
    const input = await readJson(request, duplicateGroomSchema);
    if (!input.ok) return input.response;
    return jsonData<GroomResponse>({ groom: await duplicateGroom(groomer, groomId, input.value.name) }, 201);
  });
}
