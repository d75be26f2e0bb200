// s3rver ships no type declarations; this covers the part services/s3.ts uses.
declare module 's3rver' {
  import type { AddressInfo } from 'node:net';

  type S3rverOptions = {
    address?: string;
    port?: number;
    directory?: string;
    silent?: boolean;
    resetOnClose?: boolean;
    vhostBuckets?: boolean;
    configureBuckets?: { name: string; configs?: (string | Buffer)[] }[];
  };

  export default class S3rver {
    constructor(options: S3rverOptions);
    run(): Promise<AddressInfo>;
    close(): Promise<void>;
  }
}
