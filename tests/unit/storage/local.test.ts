import { mkdtempSync, readdirSync, rmSync, existsSync } from 'node:fs'
import os from 'node:os'
import path from 'node:path'
import { PassThrough } from 'node:stream'
import { afterAll, describe, expect, it } from 'vitest'
import { createStorage, LocalStorage, StorageKeyError } from '../../../server/storage'
import { BAD_KEYS, storageContract } from './contract'

const root = mkdtempSync(path.join(os.tmpdir(), 'roomwright-storage-'))
afterAll(() => rmSync(root, { recursive: true, force: true }))

storageContract('local', () => createStorage({ STORAGE_DRIVER: 'local', STORAGE_DIR: root }))

describe('local storage driver — on disk', () => {
  const s = new LocalStorage(root)

  it('createStorage picks the local driver for STORAGE_DRIVER=local and resolves a relative folder', () => {
    const made = createStorage({ STORAGE_DRIVER: 'local', STORAGE_DIR: 'relative/dir' })
    expect(made).toBeInstanceOf(LocalStorage)
    expect((made as LocalStorage).root).toBe(path.resolve('relative/dir'))
  })

  it('writes the object at root/<key> and leaves no temp file behind', async () => {
    await s.put('cases/7/photo-1.jpg', Buffer.from('jpeg bytes'))
    expect(existsSync(path.join(root, 'cases', '7', 'photo-1.jpg'))).toBe(true)
    expect(readdirSync(path.join(root, '.tmp'))).toEqual([])
  })

  it('a failed streamed write removes its temp file', async () => {
    const failing = new PassThrough()
    const put = s.put('cases/7/broken.wav', failing)
    failing.write(Buffer.alloc(10_000, 1))
    setTimeout(() => failing.destroy(new Error('aborted')), 10)
    await expect(put).rejects.toThrow('aborted')
    expect(readdirSync(path.join(root, '.tmp'))).toEqual([])
    expect(existsSync(path.join(root, 'cases', '7', 'broken.wav'))).toBe(false)
  })

  it('no bad key maps to a path outside the storage folder; each is refused before touching the disk', () => {
    for (const bad of BAD_KEYS) expect(() => s.pathOf(bad), bad).toThrow(StorageKeyError)
    expect(existsSync(path.join(root, '..', 'etc'))).toBe(false)
  })

  it('a directory is not an object', async () => {
    await s.put('dir-test/inner/file.txt', Buffer.from('x'))
    expect(await s.exists('dir-test/inner')).toBe(false)
    await expect(s.getBuffer('dir-test/inner')).rejects.toMatchObject({ status: 404 })
    await expect(s.get('dir-test/inner')).rejects.toMatchObject({ status: 404 })
  })

  it('sweepTemp removes leftovers older than the given age only', async () => {
    const { writeFileSync, utimesSync } = await import('node:fs')
    const old = path.join(root, '.tmp', 'left-by-a-crash')
    const fresh = path.join(root, '.tmp', 'being-written')
    writeFileSync(old, 'x')
    writeFileSync(fresh, 'y')
    const twoDaysAgo = (Date.now() - 48 * 3600_000) / 1000
    utimesSync(old, twoDaysAgo, twoDaysAgo)
    expect(await s.sweepTemp(24 * 3600_000)).toBe(1)
    expect(readdirSync(path.join(root, '.tmp'))).toEqual(['being-written'])
    rmSync(fresh)
  })
})
