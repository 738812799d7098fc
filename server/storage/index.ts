import { config } from '../config'
import { LocalStorage } from './local'
import { S3Storage } from './s3'
import type { Storage, StorageConfig } from './types'

export type { Storage, StorageConfig } from './types'
export { StorageKeyError, StorageNotFoundError } from './types'
export { assertKey, isValidKey, MAX_KEY_LENGTH } from './keys'
export { LocalStorage } from './local'
export { S3Storage } from './s3'

/** `S3_FORCE_PATH_STYLE` (read here, not in config.ts): 'true'/'false'; unset means on unless the endpoint is AWS. */
function forcePathStyleFromEnv(): boolean | undefined {
  const v = process.env.S3_FORCE_PATH_STYLE?.trim().toLowerCase()
  if (v === undefined || v === '') return undefined
  if (['1', 'true', 'on', 'yes'].includes(v)) return true
  if (['0', 'false', 'off', 'no'].includes(v)) return false
  throw new Error(`S3_FORCE_PATH_STYLE must be true or false, not ${JSON.stringify(v)}`)
}

/** Builds a storage driver from explicit settings (tests, tools); `storage()` is the usual way in. */
export function createStorage(cfg: StorageConfig): Storage {
  if (cfg.STORAGE_DRIVER === 's3') {
    if (!cfg.S3_BUCKET) throw new Error('STORAGE_DRIVER=s3 needs S3_BUCKET')
    return new S3Storage({
      endpoint: cfg.S3_ENDPOINT,
      bucket: cfg.S3_BUCKET,
      region: cfg.S3_REGION ?? 'us-east-1',
      accessKeyId: cfg.S3_ACCESS_KEY_ID,
      secretAccessKey: cfg.S3_SECRET_ACCESS_KEY,
      forcePathStyle: cfg.S3_FORCE_PATH_STYLE ?? forcePathStyleFromEnv(),
    })
  }
  return new LocalStorage(cfg.STORAGE_DIR)
}

let current: Storage | undefined

/** The storage driver this process is configured for (STORAGE_DRIVER), built on first use. */
export function storage(): Storage {
  current ??= createStorage(config())
  return current
}

/** Replaces the process-wide driver (tests); pass undefined to rebuild from configuration on next use. */
export function setStorageForTests(s: Storage | undefined): void {
  current = s
}
