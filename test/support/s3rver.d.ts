/** The parts of s3rver (the local S3 fake, which ships no types) the tests use. */
declare module '@20minutes/s3rver' {
  interface S3rverOptions {
    port?: number;
    address?: string;
    silent?: boolean;
    directory: string;
    /** Accept any well-formed request signature (the fake's signing differs from the current SDK's). */
    allowMismatchedSignatures?: boolean;
  }
  export default class S3rver {
    constructor(options: S3rverOptions);
    run(): Promise<{ address: string; port: number }>;
    close(): Promise<void>;
  }
}
