// The groomer's growth surfaces: list them, or register an uploaded file as a new one.
import { jsonData, readJson } from '@/lib/http/server';
import type { SurfaceListResponse, SurfaceResponse } from '@/lib/studio/types';
import { studioHandler } from '@/lib/studio/http';
import { listSurfaces, registerSurface } from '@/lib/studio/surfaces';
import { registerSurfaceSchema } from '@/lib/studio/validation';

export async function GET() {
  return studioHandler(async (groomer) => jsonData<SurfaceListResponse>({ surfaces: await listSurfaces(groomer) }));
}

export async function POST(request: Request) {
  return studioHandler(async (groomer) => {
    const input = await readJson(request, registerSurfaceSchema);
    if (!input.ok) return input.response;
    return jsonData<SurfaceResponse>({ surface: await registerSurface(groomer, input.value) }, 201);
  });
}
