// Types for the parts of s3rver (the local S3 fake, which ships none) that scripts/fakes/s3-fake.ts uses.
declare module 's3rver' {
  import type { AddressInfo } from 'node:net';

  type S3rverOptions = {
    address?: string;
    port?: number;
    silent?: boolean;
    directory?: string;
    resetOnClose?: boolean;
    allowMismatchedSignatures?: boolean;
    configureBuckets?: Array<{ name: string }>;
  };

  export default class S3rver {
    constructor(options: S3rverOptions);
    run(): Promise<AddressInfo>;
    close(): Promise<void>;
  }
}
