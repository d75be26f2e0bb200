// The groomer's grooms: list them, or start one on a growth surface.
import { jsonData, readJson } from '@/lib/http/server';
import type { GroomListResponse, GroomResponse } from '@/lib/studio/types';
import { createGroom, listGrooms } from '@/lib/studio/grooms';
import { studioHandler } from '@/lib/studio/http';
import { createGroomSchema } from '@/lib/studio/validation';

export async function GET() {
  return studioHandler(async (groomer) => jsonData<GroomListResponse>({ grooms: await listGrooms(groomer) }));
}

export async function POST(request: Request) {
  return studioHandler(async (groomer) => {
    const input = await readJson(request, createGroomSchema);
    if (!input.ok) return input.response;
    return jsonData<GroomResponse>({ groom: await createGroom(groomer, input.value) }, 201);
  });
}
