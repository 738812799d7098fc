import { createHash } from 'node:crypto'
import { PassThrough, Readable } from 'node:stream'
import { describe, expect, it } from 'vitest'
import { StorageKeyError, StorageNotFoundError, type Storage } from '../../../server/storage'
import { noise as xorshiftNoise } from '../uploads/make-files'

const sha = (b: Buffer) => createHash('sha256').update(b).digest('hex')

async function collect(stream: Readable): Promise<Buffer> {
  const chunks: Buffer[] = []
  for await (const c of stream) chunks.push(c as Buffer)
  return Buffer.concat(chunks)
}

/** Pseudo-random bytes (xorshift32) so a mis-ordered or dropped chunk changes the hash. */
export const noise = (bytes: number, seed = 0x9e3779b9): Buffer => xorshiftNoise(bytes, seed)

function chunked(buf: Buffer, size: number): Readable {
  const parts: Buffer[] = []
  for (let i = 0; i < buf.length; i += size) parts.push(buf.subarray(i, i + size))
  return Readable.from(parts)
}

export const BAD_KEYS = [
  '',
  '../etc/passwd',
  'cases/../../etc/passwd',
  '/etc/passwd',
  'a//b.jpg',
  'a/./b.jpg',
  'a/',
  '.tmp/x',
  'Cases/1.jpg',
  'a\\..\\b',
  'a b.jpg',
  '%2e%2e/x',
  'caf\u00e9.jpg',
  'nul\u0000.jpg',
  'x'.repeat(513),
]

/**
 * The behaviour every Storage driver must share. `make` returns a fresh driver whose keys
 * do not collide with earlier tests (a fresh folder or bucket prefix is not needed: keys are unique per test).
 */
export function storageContract(name: string, make: () => Storage): void {
  describe(`${name} storage driver — shared contract`, () => {
    let n = 0
    const key = (ext = 'bin') => `contract/${name}/${process.pid}-${Date.now()}-${n++}.${ext}`
    /** A put into `s` under `k` fed by a stream that the test writes to, ends or breaks. */
    const streamedPut = (s = make(), k = key()) => {
      const feed = new PassThrough()
      return { s, k, feed, put: s.put(k, feed) }
    }

    it('stores a buffer and gives the same bytes back as a stream and as a buffer', async () => {
      const s = make()
      const k = key()
      const body = noise(70_001, 42)
      expect(await s.put(k, body, { contentType: 'application/octet-stream' })).toEqual({ size: 70_001 })
      expect(sha(await s.getBuffer(k))).toBe(sha(body))
      expect(sha(await collect(await s.get(k)))).toBe(sha(body))
      expect(await s.exists(k)).toBe(true)
    })

    it('stores a multi-chunk stream larger than one multipart part (6 MiB) byte for byte and reports its size', async () => {
      const s = make()
      const k = key()
      const body = noise(6 * 1024 * 1024 + 12_345, 7)
      const { size } = await s.put(k, chunked(body, 64 * 1024))
      expect(size).toBe(body.length)
      expect(sha(await s.getBuffer(k))).toBe(sha(body))
    })

    it('stores an empty object', async () => {
      const s = make()
      const k = key()
      expect(await s.put(k, Buffer.alloc(0))).toEqual({ size: 0 })
      expect(await s.exists(k)).toBe(true)
      expect((await s.getBuffer(k)).length).toBe(0)
    })

    it('replaces an existing object whole', async () => {
      const s = make()
      const k = key()
      await s.put(k, Buffer.from('first version, long enough to notice a tail'))
      await s.put(k, chunked(Buffer.from('second'), 2))
      expect((await s.getBuffer(k)).toString()).toBe('second')
    })

    it('a missing object: exists is false, get and getBuffer reject with a 404 StorageNotFoundError, delete is a no-op', async () => {
      const s = make()
      const k = key()
      expect(await s.exists(k)).toBe(false)
      await expect(s.get(k)).rejects.toBeInstanceOf(StorageNotFoundError)
      await expect(s.getBuffer(k)).rejects.toMatchObject({ status: 404, code: 'not_found' })
      await expect(s.delete(k)).resolves.toBeUndefined()
    })

    it('delete removes the object', async () => {
      const s = make()
      const k = key()
      await s.put(k, Buffer.from('to be removed'))
      await s.delete(k)
      expect(await s.exists(k)).toBe(false)
      await expect(s.getBuffer(k)).rejects.toBeInstanceOf(StorageNotFoundError)
    })

    it('move puts the bytes under the new key and removes the old one; moving a missing key is a 404', async () => {
      const s = make()
      const from = key('jpg')
      const to = key('jpg')
      const body = noise(3000, 3)
      await s.put(from, body)
      await s.move(from, to)
      expect(await s.exists(from)).toBe(false)
      expect(sha(await s.getBuffer(to))).toBe(sha(body))
      await expect(s.move(key(), key())).rejects.toBeInstanceOf(StorageNotFoundError)
    })

    it('a stream that fails half-way rejects the put and leaves the previous object intact (nothing half-written)', async () => {
      const s = make()
      const k = key()
      const previous = Buffer.from('the object that was there before')
      await s.put(k, previous)
      const { feed: failing, put } = streamedPut(s, k)
      failing.write(noise(100_000, 9))
      setTimeout(() => failing.destroy(new Error('client went away')), 20)
      await expect(put).rejects.toThrow()
      expect((await s.getBuffer(k)).toString()).toBe(previous.toString())
    })

    it('a stream that fails before the driver starts reading rejects the put (no uncaught error)', async () => {
      const { s, k, feed: failing, put } = streamedPut()
      failing.destroy(new Error('client went away at once'))
      await expect(put).rejects.toThrow()
      expect(await s.exists(k)).toBe(false)
    })

    it('a failed put of a new key leaves nothing under that key', async () => {
      const { s, k, feed: failing, put } = streamedPut()
      failing.write(noise(50_000, 11))
      setTimeout(() => failing.destroy(new Error('disk quota')), 20)
      await expect(put).rejects.toThrow()
      expect(await s.exists(k)).toBe(false)
    })

    it('while a streamed put is still in flight, readers do not see the object', async () => {
      const { s, k, feed: slow, put } = streamedPut()
      slow.write(noise(200_000, 5))
      await new Promise((r) => setTimeout(r, 50))
      expect(await s.exists(k)).toBe(false)
      slow.end(Buffer.from('tail'))
      expect((await put).size).toBe(200_004)
      expect(await s.exists(k)).toBe(true)
    })

    it.each(BAD_KEYS.map((k) => [JSON.stringify(k.slice(0, 40)), k]))('rejects the key %s in every method', async (_label, bad) => {
      const s = make()
      await expect(s.put(bad, Buffer.from('x'))).rejects.toBeInstanceOf(StorageKeyError)
      await expect(s.get(bad)).rejects.toBeInstanceOf(StorageKeyError)
      await expect(s.getBuffer(bad)).rejects.toBeInstanceOf(StorageKeyError)
      await expect(s.exists(bad)).rejects.toBeInstanceOf(StorageKeyError)
      await expect(s.delete(bad)).rejects.toBeInstanceOf(StorageKeyError)
      await expect(s.move(bad, key())).rejects.toBeInstanceOf(StorageKeyError)
    })
  })
}
