// The groomer's growth surfaces: list them, or register an uploaded file as a new one.
import { z } from 'zod';
import { jsonData, readJson } from '@/lib/api/server';
import { SURFACE_UNITS, type SurfaceListResponse, type SurfaceResponse } from '@/lib/studio/api-types';
import { studioHandler } from '@/lib/studio/http';
import { listSurfaces, registerSurface } from '@/lib/studio/surfaces';

const registerSchema = z.object({
  uploadId: z.uuid('Give the uploadId that POST /api/studio/uploads answered.'),
  name: z.string().trim().min(1, 'Give the surface a name.').max(200, 'Use a name of at most 200 characters.'),
  units: z.enum(SURFACE_UNITS, 'Say which units the file is in: mm, cm, m or in.'),
});

export async function GET() {
  return studioHandler(async (groomer) => jsonData<SurfaceListResponse>({ surfaces: await listSurfaces(groomer) }));
}

export async function POST(request: Request) {
  return studioHandler(async (groomer) => {
    const input = await readJson(request, registerSchema);
    if (!input.ok) return input.response;
    return jsonData<SurfaceResponse>({ surface: await registerSurface(groomer, input.value) }, 201);
  });
}
