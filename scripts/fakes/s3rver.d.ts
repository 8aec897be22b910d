// s3rver ships no types; only what our fake uses.
declare module 's3rver' {
  import type { IncomingMessage, ServerResponse } from 'node:http';
  import type { AddressInfo } from 'node:net';
  import type { Readable } from 'node:stream';
  interface S3rverOptions {
    address?: string;
    port?: number;
    directory?: string;
    silent?: boolean;
    resetOnClose?: boolean;
    allowMismatchedSignatures?: boolean;
    configureBuckets?: Array<{ name: string; configs?: Array<string | Buffer> }>;
  }
  interface StoredObjectInput {
    bucket: string;
    key: string;
  }
  interface FilesystemStore {
    getResourcePath(bucket: string, key: string | undefined, resource: string): string;
    putObject(object: StoredObjectInput): Promise<{ size: number; md5: string }>;
    putPart(bucket: string, uploadId: string, partNumber: number | string, content: Readable): Promise<unknown>;
  }
  class S3rver {
    constructor(options?: S3rverOptions);
    readonly store: FilesystemStore;
    run(): Promise<AddressInfo>;
    close(): Promise<void>;
    /** Koa: creates the buckets named in the options. */
    configureBuckets(): Promise<void>;
    /** Koa: the request handler, to mount behind a server of one's own. */
    callback(): (req: IncomingMessage, res: ServerResponse) => void;
    on(event: 'error', listener: (err: Error) => void): this;
  }
  export = S3rver;
}
