// Local stand-in for the hosted object store: s3rver, an S3-compatible server that keeps
// objects in a directory. The app reaches it only through @aws-sdk/client-s3 (lib/platform/storage.ts).
// s3rver does not check request signatures, so access control lives in the app.
import S3rver from 's3rver';
import { mkdir } from 'node:fs/promises';

// The studio's pages upload surface files straight to the store with presigned PUTs and read
// them back with presigned GETs from the browser, on another origin than the app: the bucket
// answers cross-origin requests from the app on loopback (a hosted bucket needs the same rule).
const BROWSER_CORS = `<CORSConfiguration>
  <CORSRule>
    <AllowedOrigin>http://127.0.0.1:*</AllowedOrigin>
    <AllowedOrigin>http://localhost:*</AllowedOrigin>
    <AllowedMethod>GET</AllowedMethod>
    <AllowedMethod>HEAD</AllowedMethod>
    <AllowedMethod>PUT</AllowedMethod>
    <AllowedHeader>*</AllowedHeader>
    <ExposeHeader>ETag</ExposeHeader>
    <ExposeHeader>Content-Length</ExposeHeader>
    <MaxAgeSeconds>600</MaxAgeSeconds>
  </CORSRule>
</CORSConfiguration>`;

export type S3StandInOptions = { port: number; directory: string; bucket: string };

export async function startS3StandIn({ port, directory, bucket }: S3StandInOptions) {
  await mkdir(directory, { recursive: true });
  const server = new S3rver({
    address: '127.0.0.1',
    port,
    directory,
    silent: true,
    vhostBuckets: false,
    configureBuckets: [{ name: bucket, configs: [BROWSER_CORS] }],
  });
  await server.run();
  return {
    endpoint: `http://127.0.0.1:${port}`,
    close: () => server.close(),
  };
}
