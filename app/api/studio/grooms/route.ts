// The groomer's grooms: list them, or start one on a growth surface.
import { STUDIO_ROLES } from '@/lib/accounts/roles';
import { handler, jsonData, readBody } from '@/lib/http/server';
import type { GroomListResponse, GroomResponse } from '@/lib/studio/types';
import { createGroom, listGrooms } from '@/lib/studio/grooms';
import { createGroomSchema } from '@/lib/studio/validation';

export function GET() {
  return handler(STUDIO_ROLES, async (groomer) => jsonData<GroomListResponse>({ grooms: await listGrooms(groomer) }));
}

export function POST(request: Request) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const input = await readBody(request, createGroomSchema);
    return jsonData<GroomResponse>({ groom: await createGroom(groomer, input) }, 201);
  });
}
