// s3rver ships no types; only what our fake uses.
declare module 's3rver' {
  import type { AddressInfo } from 'node:net';
  interface S3rverOptions {
    address?: string;
    port?: number;
    directory?: string;
    silent?: boolean;
    resetOnClose?: boolean;
    allowMismatchedSignatures?: boolean;
    configureBuckets?: Array<{ name: string; configs?: Array<string | Buffer> }>;
  }
  class S3rver {
    constructor(options?: S3rverOptions);
    run(): Promise<AddressInfo>;
    close(): Promise<void>;
  }
  export = S3rver;
}
