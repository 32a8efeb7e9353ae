// s3rver ships no types; the little of it the upload test uses.
declare module 's3rver' {
  interface S3rverOptions {
    address?: string
    port?: number
    silent?: boolean
    directory?: string
    configureBuckets?: { name: string, configs: (string | Buffer)[] }[]
  }
  export default class S3rver {
    constructor(options: S3rverOptions)
    run(): Promise<unknown>
    close(): Promise<void>
  }
}
