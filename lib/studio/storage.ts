// Object storage as the studio uses it: surface files uploaded straight from the browser,
// thumbnails and export files written by the server, everything read back through short-lived
// presigned URLs handed out only after the ownership checks of lib/studio.
import { DeleteObjectsCommand, HeadObjectCommand, NotFound, PutObjectCommand } from '@aws-sdk/client-s3';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import { env } from '../platform/env';
import { storageClient } from '../platform/storage';

/** How long presigned URLs of the studio stay valid. */
export const STUDIO_URL_SECONDS = 10 * 60;

/** A presigned PUT for exactly `byteSize` bytes (the store refuses another length where it checks signatures). */
export function presignSurfaceUpload(key: string, byteSize: number): Promise<string> {
  return getSignedUrl(storageClient(), new PutObjectCommand({ Bucket: env().S3_BUCKET, Key: key, ContentLength: byteSize }), {
    expiresIn: STUDIO_URL_SECONDS,
  });
}

/** The stored size of an object in bytes, or null when there is no such object. */
export async function storedObjectSize(key: string): Promise<number | null> {
  try {
    const head = await storageClient().send(new HeadObjectCommand({ Bucket: env().S3_BUCKET, Key: key }));
    return head.ContentLength ?? 0;
  } catch (error) {
    if (error instanceof NotFound || (error as { $metadata?: { httpStatusCode?: number } }).$metadata?.httpStatusCode === 404) return null;
    throw error;
  }
}

/** Deletes the objects; keys that do not exist are no error. */
export async function deleteStoredObjects(keys: readonly (string | null | undefined)[]): Promise<void> {
  const present = keys.filter((key): key is string => Boolean(key));
  if (present.length === 0) return;
  const result = await storageClient().send(
    new DeleteObjectsCommand({ Bucket: env().S3_BUCKET, Delete: { Objects: present.map((Key) => ({ Key })), Quiet: true } }),
  );
  if (result.Errors && result.Errors.length > 0) {
    throw new Error(`could not delete ${result.Errors.map((error) => `${error.Key} (${error.Message})`).join(', ')}`);
  }
}

/**
 * Deletes objects after the rows that named them are gone. A failure leaves unreachable objects
 * (no row points at them any more), which is logged rather than undoing work already committed.
 */
export async function deleteOrphanedObjects(keys: readonly (string | null | undefined)[]): Promise<void> {
  try {
    await deleteStoredObjects(keys);
  } catch (error) {
    console.error(`[studio] objects left in storage: ${(error as Error).message}`);
  }
}
