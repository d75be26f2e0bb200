// A presigned upload of one growth surface file, straight to object storage.
import { jsonData, readJson } from '@/lib/http/server';
import type { UploadResponse } from '@/lib/studio/types';
import { studioHandler } from '@/lib/studio/http';
import { createSurfaceUpload } from '@/lib/studio/surfaces';
import { uploadSchema } from '@/lib/studio/validation';

export async function POST(request: Request) {
  return studioHandler(async (groomer) => {
    const input = await readJson(request, uploadSchema);
    if (!input.ok) return input.response;
    return jsonData<UploadResponse>(await createSurfaceUpload(groomer, input.value), 201);
  });
}
