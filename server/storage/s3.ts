import {
  CopyObjectCommand,
  DeleteObjectCommand,
  GetObjectCommand,
  HeadObjectCommand,
  PutObjectCommand,
  S3Client,
} from '@aws-sdk/client-s3'
import { Upload } from '@aws-sdk/lib-storage'
import { Readable, Transform } from 'node:stream'
import { assertKey } from './keys'
import { StorageNotFoundError, type Storage } from './types'

export interface S3StorageOptions {
  endpoint?: string
  bucket: string
  region: string
  accessKeyId?: string
  secretAccessKey?: string
  /** Path-style URLs; defaults to on unless the endpoint is on amazonaws.com. */
  forcePathStyle?: boolean
}

const isNotFound = (err: unknown) => {
  const e = err as { name?: string; $metadata?: { httpStatusCode?: number } }
  return e?.name === 'NoSuchKey' || e?.name === 'NotFound' || e?.$metadata?.httpStatusCode === 404
}

/** Streamed uploads go in parts of this size, so memory per upload stays bounded (S3's minimum part is 5 MiB). */
const PART_SIZE = 5 * 1024 * 1024

/**
 * S3-compatible driver (AWS S3, MinIO, Ceph, R2, a fake S3 in tests). A stream body goes up
 * through `@aws-sdk/lib-storage` multipart uploads, which either complete whole or are aborted,
 * so no reader sees a partial object.
 */
export class S3Storage implements Storage {
  readonly client: S3Client
  readonly bucket: string

  constructor(opts: S3StorageOptions) {
    const endpointHost = opts.endpoint ? new URL(opts.endpoint).hostname : 'amazonaws.com'
    this.bucket = opts.bucket
    this.client = new S3Client({
      endpoint: opts.endpoint,
      region: opts.region,
      forcePathStyle: opts.forcePathStyle ?? !endpointHost.endsWith('amazonaws.com'),
      credentials:
        opts.accessKeyId && opts.secretAccessKey
          ? { accessKeyId: opts.accessKeyId, secretAccessKey: opts.secretAccessKey }
          : undefined,
      // Checksums only where S3 requires them: the default streams bodies as aws-chunked with a
      // trailing CRC, which older S3-compatible servers (s3rver among them) store verbatim.
      requestChecksumCalculation: 'WHEN_REQUIRED',
      responseChecksumValidation: 'WHEN_REQUIRED',
    })
  }

  async put(key: string, body: Readable | Buffer, opts?: { contentType?: string }): Promise<{ size: number }> {
    assertKey(key)
    if (Buffer.isBuffer(body)) {
      await this.client.send(
        new PutObjectCommand({ Bucket: this.bucket, Key: key, Body: body, ContentLength: body.length, ContentType: opts?.contentType }),
      )
      return { size: body.length }
    }
    let size = 0
    const counted = body.pipe(
      new Transform({
        transform(chunk: Buffer, _enc, done) {
          size += chunk.length
          done(null, chunk)
        },
      }),
    )
    // pipe() does not forward errors: a failing source must fail the upload, with its own reason.
    let sourceError: Error | undefined
    body.once('error', (err) => counted.destroy((sourceError = err)))
    const upload = new Upload({
      client: this.client,
      params: { Bucket: this.bucket, Key: key, Body: counted, ContentType: opts?.contentType },
      partSize: PART_SIZE,
      queueSize: 2,
      leavePartsOnError: false,
    })
    try {
      await upload.done()
    } catch (err) {
      throw sourceError ?? err
    }
    return { size }
  }

  async get(key: string): Promise<Readable> {
    assertKey(key)
    try {
      const res = await this.client.send(new GetObjectCommand({ Bucket: this.bucket, Key: key }))
      if (!res.Body) throw new StorageNotFoundError(key)
      return res.Body instanceof Readable ? res.Body : Readable.fromWeb(res.Body.transformToWebStream() as never)
    } catch (err) {
      if (isNotFound(err)) throw new StorageNotFoundError(key)
      throw err
    }
  }

  async getBuffer(key: string): Promise<Buffer> {
    const chunks: Buffer[] = []
    for await (const chunk of await this.get(key)) chunks.push(chunk as Buffer)
    return Buffer.concat(chunks)
  }

  async delete(key: string): Promise<void> {
    assertKey(key)
    try {
      await this.client.send(new DeleteObjectCommand({ Bucket: this.bucket, Key: key }))
    } catch (err) {
      if (!isNotFound(err)) throw err
    }
  }

  async exists(key: string): Promise<boolean> {
    assertKey(key)
    try {
      await this.client.send(new HeadObjectCommand({ Bucket: this.bucket, Key: key }))
      return true
    } catch (err) {
      if (isNotFound(err)) return false
      throw err
    }
  }

  async move(fromKey: string, toKey: string): Promise<void> {
    assertKey(fromKey)
    assertKey(toKey)
    try {
      await this.client.send(new CopyObjectCommand({ Bucket: this.bucket, Key: toKey, CopySource: `${this.bucket}/${fromKey}` }))
    } catch (err) {
      if (isNotFound(err)) throw new StorageNotFoundError(fromKey)
      throw err
    }
    await this.delete(fromKey)
  }
}
