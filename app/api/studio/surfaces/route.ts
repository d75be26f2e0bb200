// The groomer's growth surfaces: list them, or register an uploaded file as a new one.
import { STUDIO_ROLES } from '@/lib/accounts/roles';
import { handler, jsonData, readBody } from '@/lib/http/server';
import type { SurfaceListResponse, SurfaceResponse } from '@/lib/studio/types';
import { listSurfaces, registerSurface } from '@/lib/studio/surfaces';
import { registerSurfaceSchema } from '@/lib/studio/validation';

export function GET() {
  return handler(STUDIO_ROLES, async (groomer) => jsonData<SurfaceListResponse>({ surfaces: await listSurfaces(groomer) }));
}

export function POST(request: Request) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const input = await readBody(request, registerSurfaceSchema);
    return jsonData<SurfaceResponse>({ surface: await registerSurface(groomer, input) }, 202);
  });
}
