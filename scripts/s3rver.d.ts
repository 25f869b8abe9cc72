// s3rver ships no types; this is the little of it scripts/s3.ts uses.
declare module "s3rver" {
  import type { AddressInfo } from "node:net";
  interface S3rverOptions {
    address?: string;
    port?: number;
    silent?: boolean;
    directory?: string;
    resetOnClose?: boolean;
    allowMismatchedSignatures?: boolean;
    vhostBuckets?: boolean;
    configureBuckets?: { name: string; configs?: (string | Buffer)[] }[];
  }
  export default class S3rver {
    constructor(options?: S3rverOptions);
    run(): Promise<AddressInfo>;
    close(): Promise<void>;
  }
}
