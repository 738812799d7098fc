import type { Readable } from 'node:stream'
import { AppError } from '../errors'
import type { Config } from '../config'

/**
 * Where Roomwright keeps uploaded bytes (photos, measurement files, thumbnails).
 * Keys are relative, lower-case paths such as `cases/41/7f3c.jpg`; see `assertKey`.
 * A reader never sees half an object: local disk writes temp-then-rename, S3 objects appear whole.
 */
export interface Storage {
  /** Stores `body` under `key`, replacing any object there; resolves with the stored size in bytes. */
  put(key: string, body: Readable | Buffer, opts?: { contentType?: string }): Promise<{ size: number }>
  /** A stream of the object's bytes; rejects with `StorageNotFoundError` when there is none. */
  get(key: string): Promise<Readable>
  /** The whole object in memory; for small objects only (thumbnails, text). */
  getBuffer(key: string): Promise<Buffer>
  /** Removes the object; removing a missing object is not an error. */
  delete(key: string): Promise<void>
  exists(key: string): Promise<boolean>
  /** Moves an object to a new key (rename on disk, copy-then-delete on S3). */
  move(fromKey: string, toKey: string): Promise<void>
}

/** The part of the configuration a storage driver reads (see server/config.ts). */
export type StorageConfig = Pick<Config, 'STORAGE_DRIVER' | 'STORAGE_DIR'> &
  Partial<Pick<Config, 'S3_ENDPOINT' | 'S3_BUCKET' | 'S3_REGION' | 'S3_ACCESS_KEY_ID' | 'S3_SECRET_ACCESS_KEY'>> & {
    /** Path-style S3 URLs (`endpoint/bucket/key`); defaults to on for any endpoint not on amazonaws.com. */
    S3_FORCE_PATH_STYLE?: boolean
  }

/** The object asked for is not in storage (maps to 404 through the error middleware). */
export class StorageNotFoundError extends AppError {
  constructor(readonly key: string) {
    super('That file is no longer in storage', { status: 404, code: 'not_found' })
  }
}

/** A storage key broke the key rules (path tricks, upper case, empty segments …). */
export class StorageKeyError extends AppError {
  constructor(readonly key: string, reason: string) {
    super(`Invalid storage key ${JSON.stringify(key.slice(0, 80))}: ${reason}`, { status: 400, code: 'invalid_key' })
  }
}
