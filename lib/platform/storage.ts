// File storage in an S3-compatible object store through @aws-sdk/client-s3. Locally the store
// is s3rver (services/s3.ts); production points S3_* at a hosted bucket. The store is never
// exposed directly: the app decides who may read or write, then hands out short-lived URLs.
import {
  CopyObjectCommand,
  GetObjectCommand,
  HeadBucketCommand,
  PutObjectCommand,
  S3Client,
  type PutObjectCommandInput,
} from '@aws-sdk/client-s3';
import { getSignedUrl } from '@aws-sdk/s3-request-presigner';
import { env } from './env';

let client: S3Client | undefined;

export function storageClient(): S3Client {
  if (!client) {
    const config = env();
    client = new S3Client({
      region: config.S3_REGION,
      endpoint: config.S3_ENDPOINT || undefined,
      forcePathStyle: config.S3_FORCE_PATH_STYLE,
      credentials: { accessKeyId: config.S3_ACCESS_KEY_ID, secretAccessKey: config.S3_SECRET_ACCESS_KEY },
      // Without these, streamed uploads are stored with their chunk framing by S3 stand-ins,
      // and presigned uploads carry the checksum of an empty body.
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
    });
  }
  return client;
}

const PRESIGNED_URL_SECONDS = 5 * 60;

export async function putObject(key: string, body: PutObjectCommandInput['Body'], contentType: string) {
  await storageClient().send(new PutObjectCommand({ Bucket: env().S3_BUCKET, Key: key, Body: body, ContentType: contentType }));
}

/** Copies an object inside the bucket (server side: the bytes never pass through this process). */
export async function copyObject(fromKey: string, toKey: string): Promise<void> {
  const bucket = env().S3_BUCKET;
  await storageClient().send(new CopyObjectCommand({ Bucket: bucket, Key: toKey, CopySource: `${bucket}/${encodeURI(fromKey)}` }));
}

export async function getObjectBytes(key: string): Promise<Uint8Array> {
  const response = await storageClient().send(new GetObjectCommand({ Bucket: env().S3_BUCKET, Key: key }));
  if (!response.Body) throw new Error(`object ${key} has no body`);
  return response.Body.transformToByteArray();
}

export function presignUpload(key: string, contentType: string): Promise<string> {
  return getSignedUrl(storageClient(), new PutObjectCommand({ Bucket: env().S3_BUCKET, Key: key, ContentType: contentType }), {
    expiresIn: PRESIGNED_URL_SECONDS,
  });
}

/**
 * The Content-Disposition that saves a download as `fileName` (RFC 6266): a quoted ASCII
 * `filename` (accents dropped, anything else unsafe as `_`), and when that is not the exact name,
 * the name itself in UTF-8 as `filename*` (RFC 5987), which browsers prefer.
 */
export function attachmentDisposition(fileName: string): string {
  const ascii = fileName
    .normalize('NFKD')
    .replace(/[\u0300-\u036f]/g, '')
    .replace(/[^\x20-\x7e]|["\\]/g, '_');
  if (ascii === fileName) return `attachment; filename="${ascii}"`;
  const encoded = encodeURIComponent(fileName).replace(/['()*]/g, (character) => `%${character.charCodeAt(0).toString(16).toUpperCase()}`);
  return `attachment; filename="${ascii}"; filename*=UTF-8''${encoded}`;
}

/**
 * A presigned GET of an object, valid for `expiresInSeconds`; with `downloadAs`, the browser
 * saves it under that name (attachmentDisposition). Hand it out only after the caller's checks.
 */
export function presignDownload(key: string, expiresInSeconds = PRESIGNED_URL_SECONDS, downloadAs?: string): Promise<string> {
  const disposition = downloadAs ? attachmentDisposition(downloadAs) : undefined;
  return getSignedUrl(storageClient(), new GetObjectCommand({ Bucket: env().S3_BUCKET, Key: key, ResponseContentDisposition: disposition }), {
    expiresIn: expiresInSeconds,
  });
}

/** True when the bucket exists and the credentials reach it. */
export async function storageReachable(): Promise<boolean> {
  try {
    await storageClient().send(new HeadBucketCommand({ Bucket: env().S3_BUCKET }));
    return true;
  } catch {
    return false;
  }
}
