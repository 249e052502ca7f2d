// The parts of s3rver 3.7.1 (a fake S3 server for tests, no types of its own) that tests/support/fake-s3.ts uses.
declare module "s3rver" {
  interface S3rverOptions {
    address?: string;
    port?: number;
    silent?: boolean;
    directory?: string;
    resetOnClose?: boolean;
    configureBuckets?: Array<{ name: string }>;
  }
  export default class S3rver {
    constructor(options: S3rverOptions);
    run(): Promise<{ address: string; port: number }>;
    close(): Promise<void>;
    /** S3 event notifications: one record per object written or removed. */
    on(event: "event", listener: (e: { Records: Array<{ eventName: string; s3: { object: { key: string } } }> }) => void): this;
  }
}
