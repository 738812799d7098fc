import { randomUUID } from 'node:crypto'
import { type FileHandle, mkdir, open, readFile, readdir, rename, rm, stat, unlink } from 'node:fs/promises'
import path from 'node:path'
import { type Readable, Transform, Writable } from 'node:stream'
import { pipeline } from 'node:stream/promises'
import { assertKey } from './keys'
import { StorageKeyError, StorageNotFoundError, type Storage } from './types'

const TEMP_DIR = '.tmp'

async function writeAll(handle: FileHandle, chunk: Buffer): Promise<void> {
  let offset = 0
  while (offset < chunk.length) offset += (await handle.write(chunk, offset)).bytesWritten
}

const isMissing = (err: unknown) => ['ENOENT', 'ENOTDIR'].includes((err as NodeJS.ErrnoException)?.code ?? '')

/**
 * Local-disk driver: objects are files under `root`. Every write goes to `root/.tmp/<uuid>` first,
 * is fsynced, then renamed onto its key, so a reader sees the old object or the whole new one.
 */
export class LocalStorage implements Storage {
  readonly root: string

  constructor(root: string) {
    this.root = path.resolve(root)
  }

  /** The absolute path of a key; throws on any key that could leave `root`. */
  pathOf(key: string): string {
    assertKey(key)
    const full = path.resolve(this.root, ...key.split('/'))
    if (!full.startsWith(this.root + path.sep)) throw new StorageKeyError(key, 'the key resolves outside the storage folder')
    return full
  }

  async put(key: string, body: Readable | Buffer): Promise<{ size: number }> {
    const target = this.pathOf(key)
    // A source stream can fail while the temp file is still being opened (before pipeline() listens):
    // catch that error from the first moment, so it fails this put instead of the whole process.
    let earlyError: Error | undefined
    const onEarlyError = (err: Error) => (earlyError ??= err)
    if (!Buffer.isBuffer(body)) body.on('error', onEarlyError)
    const tempDir = path.join(this.root, TEMP_DIR)
    await mkdir(tempDir, { recursive: true })
    const temp = path.join(tempDir, randomUUID())
    let size = 0
    const handle = await open(temp, 'wx', 0o640)
    try {
      if (Buffer.isBuffer(body)) {
        await handle.writeFile(body)
        size = body.length
      } else {
        if (earlyError) throw earlyError
        const counter = new Transform({
          transform(chunk: Buffer, _enc, done) {
            size += chunk.length
            done(null, chunk)
          },
        })
        const sink = new Writable({
          write(chunk: Buffer, _enc, done) {
            writeAll(handle, chunk).then(() => done(), done)
          },
        })
        await pipeline(body, counter, sink)
        body.off('error', onEarlyError)
      }
      await handle.sync()
      await handle.close()
      await mkdir(path.dirname(target), { recursive: true })
      await rename(temp, target)
    } catch (err) {
      await handle.close().catch(() => {})
      await unlink(temp).catch(() => {})
      throw err
    }
    return { size }
  }

  async get(key: string): Promise<Readable> {
    const file = this.pathOf(key)
    try {
      const handle = await open(file, 'r')
      if (!(await handle.stat()).isFile()) {
        await handle.close()
        throw new StorageNotFoundError(key)
      }
      return handle.createReadStream()
    } catch (err) {
      if (isMissing(err) || (err as NodeJS.ErrnoException)?.code === 'EISDIR') throw new StorageNotFoundError(key)
      throw err
    }
  }

  async getBuffer(key: string): Promise<Buffer> {
    try {
      return await readFile(this.pathOf(key))
    } catch (err) {
      if (isMissing(err) || (err as NodeJS.ErrnoException)?.code === 'EISDIR') throw new StorageNotFoundError(key)
      throw err
    }
  }

  async delete(key: string): Promise<void> {
    const file = this.pathOf(key)
    try {
      await unlink(file)
    } catch (err) {
      if (isMissing(err)) return
      throw err
    }
  }

  async exists(key: string): Promise<boolean> {
    try {
      return (await stat(this.pathOf(key))).isFile()
    } catch (err) {
      if (isMissing(err)) return false
      throw err
    }
  }

  async move(fromKey: string, toKey: string): Promise<void> {
    const from = this.pathOf(fromKey)
    const to = this.pathOf(toKey)
    if (!(await this.exists(fromKey))) throw new StorageNotFoundError(fromKey)
    await mkdir(path.dirname(to), { recursive: true })
    await rename(from, to)
  }

  /** Removes write leftovers older than `olderThanMs` from the temp folder (after a crash). */
  async sweepTemp(olderThanMs = 24 * 3600_000): Promise<number> {
    const dir = path.join(this.root, TEMP_DIR)
    let removed = 0
    for (const name of await readdir(dir).catch(() => [] as string[])) {
      const file = path.join(dir, name)
      const info = await stat(file).catch(() => undefined)
      if (info && Date.now() - info.mtimeMs > olderThanMs) {
        await rm(file, { force: true })
        removed++
      }
    }
    return removed
  }
}

