import { storage as configuredStorage, type Storage } from '../storage'
import { thumbnailKey } from './images'

/**
 * Removes an upload (and its thumbnail, if one was made) when a later step of the request failed,
 * so nothing is left half-stored. Never throws: a failure here must not hide the original error.
 */
export async function discardUpload(key: string, opts: { storage?: Storage } = {}): Promise<void> {
  const store = opts.storage ?? configuredStorage()
  await Promise.allSettled([store.delete(key), store.delete(thumbnailKey(key))])
}

/** Moves an upload from its temporary key to its permanent one and returns the permanent key. */
export async function finaliseUpload(tempKey: string, finalKey: string, opts: { storage?: Storage } = {}): Promise<string> {
  const store = opts.storage ?? configuredStorage()
  await store.move(tempKey, finalKey)
  return finalKey
}
