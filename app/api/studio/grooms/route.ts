// The groomer's grooms: list them, or start one on a growth surface.
import { handler, jsonData, readBody } from '@/lib/http/server';
import type { GroomListResponse, GroomResponse } from '@/lib/studio/types';
import { createGroom, listGrooms } from '@/lib/studio/grooms';
import { createGroomSchema } from '@/lib/studio/validation';

export function GET() {
  return handler(['groomer'], async (groomer) => jsonData<GroomListResponse>({ grooms: await listGrooms(groomer) }));
}

export function POST(request: Request) {
  return handler(['groomer'], async (groomer) => {
    const input = await readBody(request, createGroomSchema);
    return jsonData<GroomResponse>({ groom: await createGroom(groomer, input) }, 201);
  });
}
