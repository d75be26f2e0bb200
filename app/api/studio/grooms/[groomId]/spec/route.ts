// Autosave of a groom's spec, checked against lib/groom's schema and the revision it was loaded at.
import { STUDIO_ROLES } from '@/lib/accounts/roles';
import { handler, jsonData, pathId, readBody, SPEC_BODY_LIMIT } from '@/lib/http/server';
import type { SpecSavedResponse } from '@/lib/studio/types';
import { saveSpec } from '@/lib/studio/grooms';
import { notFound } from '@/lib/studio/errors';
import { saveSpecSchema } from '@/lib/studio/validation';

type Context = { params: Promise<{ groomId: string }> };

export function PUT(request: Request, context: Context) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const groomId = await pathId(context.params, 'groomId', notFound('groom'));
    // A spec may carry painted maps: a larger body than other calls.
    const input = await readBody(request, saveSpecSchema, SPEC_BODY_LIMIT);
    return jsonData<SpecSavedResponse>(await saveSpec(groomer, groomId, input));
  });
}
