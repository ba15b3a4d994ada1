// s3rver ships without types; only what the tests use.
declare module 's3rver' {
  import type { AddressInfo } from 'node:net';
  type Options = {
    address?: string;
    port?: number;
    directory?: string;
    silent?: boolean;
    resetOnClose?: boolean;
    configureBuckets?: { name: string; configs?: unknown[] }[];
  };
  export default class S3rver {
    constructor(options?: Options);
    run(): Promise<AddressInfo>;
    close(): Promise<void>;
  }
}
