// A copy of a groom on the same surface, starting from its saved spec.
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import type { GroomResponse } from '@/lib/studio/types';
import { duplicateGroom } from '@/lib/studio/grooms';
import { notFound } from '@/lib/studio/errors';
import { duplicateGroomSchema } from '@/lib/studio/validation';

type Context = { params: Promise<{ groomId: string }> };

export function POST(request: Request, context: Context) {
  return handler(['groomer'], async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', notFound('groom'));
    const input = await readBody(request, duplicateGroomSchema);
    return jsonData<GroomResponse>({ groom: await duplicateGroom(groomer, groomId, input.name) }, 201);
  });
}
