// Object storage as the market uses it: each listing's frozen surface, pictures, guide preview and
// package under market/listings/<id>/; handed out only through short-lived presigned URLs
// (presignDownload of lib/platform/storage.ts) after the market's own checks.
import { DeleteObjectsCommand } from '@aws-sdk/client-s3';
import { env } from '../platform/env';
import { storageClient } from '../platform/storage';

/** How long a download link of a purchase stays valid. */
export const DOWNLOAD_URL_SECONDS = 5 * 60;
/** How long links to pictures and previews stay valid. */
export const PICTURE_URL_SECONDS = 10 * 60;

export const listingPrefix = (listingId: string) => `market/listings/${listingId}`;

/** Deletes objects that no row names any more; a failure is logged, not thrown. */
export async function deleteMarketObjects(keys: readonly string[]): Promise<void> {
  if (keys.length === 0) return;
  try {
    await storageClient().send(
      new DeleteObjectsCommand({ Bucket: env().S3_BUCKET, Delete: { Objects: keys.map((Key) => ({ Key })), Quiet: true } }),
    );
  } catch (error) {
    console.error(`[market] objects left in storage: ${(error as Error).message}`);
  }
}
