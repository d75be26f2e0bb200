// A copy of a groom on the same surface, starting from its saved spec; or, given a surfaceId, a new
// groom on that surface starting from the spec carried over.
import { STUDIO_ROLES } from '@/lib/accounts/roles';
import { handler, jsonData, pathId, readBody } from '@/lib/http/server';
import type { GroomResponse } from '@/lib/studio/types';
import { duplicateGroom } from '@/lib/studio/grooms';
import { startGroomFrom } from '@/lib/studio/surface-change';
import { notFound } from '@/lib/studio/errors';
import { duplicateGroomSchema } from '@/lib/studio/validation';

type Context = { params: Promise<{ groomId: string }> };

export function POST(request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', notFound('groom'));
    const input = await readBody(request, duplicateGroomSchema);
    const { surfaceId, ...rest } = input;
    const groom = surfaceId ? await startGroomFrom(groomer, groomId, { ...rest, surfaceId }) : await duplicateGroom(groomer, groomId, input.name);
    return jsonData<GroomResponse>({ groom }, 201);
  });
}
