// A presigned upload of one growth surface file, straight to object storage.
import { STUDIO_ROLES } from '@/lib/accounts/roles';
import { handler, jsonData, readBody } from '@/lib/http/server';
import type { UploadResponse } from '@/lib/studio/types';
import { createSurfaceUpload } from '@/lib/studio/surfaces';
import { uploadSchema } from '@/lib/studio/validation';

export function POST(request: Request) {
  return handler(STUDIO_ROLES, async (groomer) => {
    const input = await readBody(request, uploadSchema);
    return jsonData<UploadResponse>(await createSurfaceUpload(groomer, input), 201);
  });
}
