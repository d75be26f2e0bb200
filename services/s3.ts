// Local stand-in for the hosted object store: s3rver, an S3-compatible server that keeps
// objects in a directory. The app reaches it only through @aws-sdk/client-s3 (lib/storage.ts).
// s3rver does not check request signatures, so access control lives in the app.
import S3rver from 's3rver';
import { mkdir } from 'node:fs/promises';

export type S3StandInOptions = { port: number; directory: string; bucket: string };

export async function startS3StandIn({ port, directory, bucket }: S3StandInOptions) {
  await mkdir(directory, { recursive: true });
  const server = new S3rver({
    address: '127.0.0.1',
    port,
    directory,
    silent: true,
    vhostBuckets: false,
    configureBuckets: [{ name: bucket }],
  });
  await server.run();
  return {
    endpoint: `http://127.0.0.1:${port}`,
    close: () => server.close(),
  };
}
