// A presigned upload of one growth surface file, straight to object storage.
import { z } from 'zod';
import { jsonData, readJson } from '@/lib/api/server';
import type { UploadResponse } from '@/lib/studio/api-types';
import { studioHandler } from '@/lib/studio/http';
import { createSurfaceUpload } from '@/lib/studio/surfaces';

const uploadSchema = z.object({
  fileName: z.string().trim().min(1, 'Give the file name.').max(255, 'Use a file name of at most 255 characters.'),
  byteSize: z.int('Give the file size in whole bytes.').positive('The file is empty.'),
});

export async function POST(request: Request) {
  return studioHandler(async (groomer) => {
    const input = await readJson(request, uploadSchema);
    if (!input.ok) return input.response;
    return jsonData<UploadResponse>(await createSurfaceUpload(groomer, input.value), 201);
  });
}
