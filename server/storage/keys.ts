import { StorageKeyError } from './types'

export const MAX_KEY_LENGTH = 512

/**
 * Throws `StorageKeyError` unless `key` is a safe relative key: only `[a-z0-9/_.-]`, at most 512
 * characters, no leading or trailing `/`, no empty segment, and no segment that starts with a dot
 * (which rules out `.`, `..` and hidden names such as the local driver's `.tmp` folder).
 */
export function assertKey(key: string): void {
  if (typeof key !== 'string' || key.length === 0) throw new StorageKeyError(String(key), 'the key is empty')
  if (key.length > MAX_KEY_LENGTH) throw new StorageKeyError(key, `the key is ${key.length} characters, longer than ${MAX_KEY_LENGTH}`)
  const bad = key.match(/[^a-z0-9/_.-]/)
  if (bad) throw new StorageKeyError(key, `character ${JSON.stringify(bad[0])} is not allowed (only a-z 0-9 / _ . -)`)
  if (key.startsWith('/')) throw new StorageKeyError(key, 'absolute paths are not allowed')
  for (const segment of key.split('/')) {
    if (segment === '') throw new StorageKeyError(key, 'empty path segment (a doubled or trailing "/")')
    if (segment.startsWith('.')) throw new StorageKeyError(key, `segment "${segment}" starts with a dot ("." and ".." are path tricks)`)
  }
}

export function isValidKey(key: string): boolean {
  try {
    assertKey(key)
    return true
  } catch {
    return false
  }
}
