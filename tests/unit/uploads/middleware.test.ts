import { ListObjectsV2Command } from '@aws-sdk/client-s3'
import express from 'express'
import { mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs'
import http from 'node:http'
import type { AddressInfo } from 'node:net'
import os from 'node:os'
import path from 'node:path'
import type { Readable } from 'node:stream'
import S3rver from 's3rver'
import request from 'supertest'
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest'
import { errorHandler } from '../../../server/middleware/errors'
import { LocalStorage, S3Storage, type Storage } from '../../../server/storage'
import { discardUpload, finaliseUpload, heicSupported, makeThumbnail, thumbnailKey, uploadedFile, uploadFile, type UploadOptions } from '../../../server/uploads'
import * as make from './make-files'

const MB = 1024 * 1024
const tmpRoots: string[] = []
const tempDir = (label: string) => {
  const d = mkdtempSync(path.join(os.tmpdir(), `roomwright-${label}-`))
  tmpRoots.push(d)
  return d
}

/** Every object key in a local storage folder (the .tmp folder must be empty too). */
function localKeys(root: string): string[] {
  const out: string[] = []
  const walk = (dir: string, prefix: string) => {
    for (const name of readdirSync(dir)) {
      const full = path.join(dir, name)
      if (statSync(full).isDirectory()) walk(full, `${prefix}${name}/`)
      else out.push(`${prefix}${name}`)
    }
  }
  walk(root, '')
  return out.sort()
}

/** A Storage that records what put() was handed, to prove the upload is streamed, not buffered. */
class Recording implements Storage {
  bodies: string[] = []
  constructor(readonly inner: Storage) {}
  put(key: string, body: Readable | Buffer, opts?: { contentType?: string }) {
    this.bodies.push(Buffer.isBuffer(body) ? 'buffer' : 'stream')
    return this.inner.put(key, body, opts)
  }
  get = (k: string) => this.inner.get(k)
  getBuffer = (k: string) => this.inner.getBuffer(k)
  delete = (k: string) => this.inner.delete(k)
  exists = (k: string) => this.inner.exists(k)
  move = (a: string, b: string) => this.inner.move(a, b)
}

function appWith(store: Storage, opts: UploadOptions = {}) {
  const app = express()
  app.post('/files', uploadFile({ storage: store, ...opts }), (req, res) => {
    res.status(201).json(uploadedFile(req))
  })
  app.use(errorHandler)
  return app
}

const post = (app: express.Express, parts: make.Part[]) => {
  const { body, contentType } = make.multipart(parts)
  return request(app).post('/files').set('Content-Type', contentType).send(body)
}

// ---- the fake S3 for the S3 half of the suite ----
const BUCKET = 'roomwright-uploads'
let s3server: S3rver
let s3endpoint = ''
beforeAll(async () => {
  s3server = new S3rver({ address: '127.0.0.1', port: 0, silent: true, directory: tempDir('s3rver'), configureBuckets: [{ name: BUCKET, configs: [] }] })
  s3endpoint = `http://127.0.0.1:${(await s3server.run()).port}`
})
afterAll(async () => {
  await s3server?.close()
  for (const d of tmpRoots) rmSync(d, { recursive: true, force: true })
})

interface Driver {
  name: string
  fresh(): { store: Storage; keys(): Promise<string[]> }
}
let s3prefixN = 0
const drivers: Driver[] = [
  {
    name: 'local',
    fresh() {
      const root = tempDir('uploads')
      return { store: new LocalStorage(root), keys: async () => localKeys(root) }
    },
  },
  {
    name: 's3',
    fresh() {
      const store = new S3Storage({ endpoint: s3endpoint, bucket: BUCKET, region: 'us-east-1', accessKeyId: 'S3RVER', secretAccessKey: 'S3RVER' })
      const prefix = `run${s3prefixN++}`
      // each test writes under its own key prefix, so "nothing stored" is checked per test
      ;(store as S3Storage & { prefix: string }).prefix = prefix
      return {
        store,
        keys: async () => {
          const res = await store.client.send(new ListObjectsV2Command({ Bucket: BUCKET, Prefix: `${prefix}/` }))
          return (res.Contents ?? []).map((o) => o.Key!).sort()
        },
      }
    },
  },
]
const prefixOf = (store: Storage) => (store as Storage & { prefix?: string }).prefix ?? 'incoming'

for (const driver of drivers) {
  describe(`uploadFile() on the ${driver.name} driver — POST multipart field "file"`, () => {
    let store: Storage
    let keys: () => Promise<string[]>
    let app: express.Express
    beforeEach(() => {
      ;({ store, keys } = driver.fresh())
      app = appWith(store, { prefix: prefixOf(store) })
    })

    it('a JPEG: 201, req.file has the sniffed type, the byte count and a temp key; the bytes are stored as sent', async () => {
      const bytes = await make.jpeg()
      const res = await post(app, [{ field: 'file', filename: 'front wall.jpg', contentType: 'image/jpeg', body: bytes }])
      expect(res.status).toBe(201)
      expect(res.body).toMatchObject({ size: bytes.length, originalname: 'front wall.jpg', mime: 'image/jpeg', kind: 'photo', format: 'jpeg' })
      expect(res.body.key).toMatch(new RegExp(`^${prefixOf(store)}/[0-9a-f-]{36}\\.jpg$`))
      expect((await store.getBuffer(res.body.key)).equals(bytes)).toBe(true)
      expect(await keys()).toEqual([res.body.key])
    })

    it('a PNG named .wav and sent as audio/wav is accepted as a photo: the bytes win', async () => {
      const res = await post(app, [{ field: 'file', filename: 'left-speaker.wav', contentType: 'audio/wav', body: await make.png() }])
      expect(res.status).toBe(201)
      expect(res.body).toMatchObject({ kind: 'photo', format: 'png', mime: 'image/png', mimetype: 'image/png', originalname: 'left-speaker.wav' })
      expect(res.body.key.endsWith('.png')).toBe(true)
    })

    it('a text file posing as a WAV (.wav name, audio/wav type) answers 415 unsupported_type and stores nothing', async () => {
      const res = await post(app, [{ field: 'file', filename: 'left-speaker.wav', contentType: 'audio/wav', body: 'Not a recording: just notes about the room.\nThe bass booms at the sofa.\n' }])
      expect(res.status).toBe(415)
      expect(res.body.error.code).toBe('unsupported_type')
      expect(res.body.error.message).toMatch(/WAV/)
      expect(await keys()).toEqual([])
    })

    it('a WAV named .txt is a measurement/wav; a response text is a measurement/text', async () => {
      const w = await post(app, [{ field: 'file', filename: 'sweep.txt', contentType: 'text/plain', body: make.wav(0.2) }])
      expect(w.status).toBe(201)
      expect(w.body).toMatchObject({ kind: 'measurement', format: 'wav', mime: 'audio/wav' })
      const t = await post(app, [{ field: 'file', filename: 'seat-left.txt', body: make.responseText(200) }])
      expect(t.status).toBe(201)
      expect(t.body).toMatchObject({ kind: 'measurement', format: 'text', size: make.responseText(200).length })
    })

    it('a photo over 15 MB answers 413 too_large and leaves nothing in storage', async () => {
      const big = Buffer.concat([await make.jpeg(), make.noise(15 * MB + 1)])
      const res = await post(app, [{ field: 'file', filename: 'huge.jpg', contentType: 'image/jpeg', body: big }])
      expect(res.status).toBe(413)
      expect(res.body.error.code).toBe('too_large')
      expect(res.body.error.message).toMatch(/15 MB/)
      expect(await keys()).toEqual([])
    })

    it('a GIF answers 415 naming what it saw, and stores nothing', async () => {
      const res = await post(app, [{ field: 'file', filename: 'room.jpg', contentType: 'image/jpeg', body: await make.gif() }])
      expect(res.status).toBe(415)
      expect(res.body.error.message).toMatch(/GIF/)
      expect(await keys()).toEqual([])
    })

    it('one file per request: a second file answers 400 too_many_files and neither is kept', async () => {
      const res = await post(app, [
        { field: 'file', filename: 'a.png', body: await make.png() },
        { field: 'file', filename: 'b.png', body: await make.png() },
      ])
      expect(res.status).toBe(400)
      expect(res.body.error.code).toBe('too_many_files')
      expect(await keys()).toEqual([])
    })

    it('the upload is streamed into storage, never handed over as one buffer', async () => {
      const rec = new Recording(store)
      const res = await post(appWith(rec, { prefix: prefixOf(store) }), [{ field: 'file', filename: 'r.wav', body: make.wav(1) }])
      expect(res.status).toBe(201)
      expect(rec.bodies).toEqual(['stream'])
    })
  })
}

describe('uploadFile() — limits, kinds and names (local driver)', () => {
  let root: string
  let store: LocalStorage
  beforeEach(() => {
    root = tempDir('uploads')
    store = new LocalStorage(root)
  })
  const stored = () => localKeys(root)

  it('limits are per kind: a 100 kB WAV passes where a 100 kB PNG does not', async () => {
    const app = appWith(store, { limits: { photo: 60_000, measurement: 200_000 } })
    const pngBig = Buffer.concat([await make.png(), make.noise(100_000)])
    const wavBig = make.wav(1) // 96 044 bytes
    expect(wavBig.length).toBeGreaterThan(60_000)
    expect((await post(app, [{ field: 'file', filename: 'p.png', body: pngBig }])).status).toBe(413)
    expect(stored()).toEqual([])
    expect((await post(app, [{ field: 'file', filename: 'w.wav', body: wavBig }])).status).toBe(201)
  })

  it('the limit is inclusive: exactly the limit passes, one byte more is 413', async () => {
    const app = appWith(store, { limits: { photo: 70_000 } })
    const head = await make.png()
    const exact = Buffer.concat([head, make.noise(70_000 - head.length)])
    const over = Buffer.concat([head, make.noise(70_001 - head.length)])
    const ok = await post(app, [{ field: 'file', filename: 'x.png', body: exact }])
    expect(ok.status).toBe(201)
    expect(ok.body.size).toBe(70_000)
    expect((await post(app, [{ field: 'file', filename: 'y.png', body: over }])).status).toBe(413)
    expect(stored()).toEqual([ok.body.key])
  })

  it('a measurement over 50 MB answers 413 and leaves nothing; 20 MB (over the photo limit) is fine', async () => {
    const app = appWith(store)
    const header = make.wav(0.001)
    const okBody = Buffer.concat([header, make.noise(20 * MB)])
    const ok = await post(app, [{ field: 'file', filename: 'long.wav', body: okBody }])
    expect(ok.status).toBe(201)
    expect(ok.body.size).toBe(okBody.length)
    await discardUpload(ok.body.key, { storage: store })
    const res = await post(app, [{ field: 'file', filename: 'too-long.wav', body: Buffer.concat([header, make.noise(50 * MB)]) }])
    expect(res.status).toBe(413)
    expect(res.body.error.message).toMatch(/50 MB/)
    expect(stored()).toEqual([])
  })

  it('a route that takes photos only refuses a WAV with 415', async () => {
    const res = await post(appWith(store, { kinds: ['photo'] }), [{ field: 'file', filename: 'a.wav', body: make.wav() }])
    expect(res.status).toBe(415)
    expect(res.body.error.message).toMatch(/photos/)
    expect(stored()).toEqual([])
  })

  it('HEIC: refused with 415 and the advice to export as JPEG unless sharp here reads HEIC', async () => {
    const res = await post(appWith(store), [{ field: 'file', filename: 'IMG_0001.HEIC', contentType: 'image/heic', body: make.heicHead() }])
    if (heicSupported()) {
      expect(res.status).toBe(201)
      expect(res.body.format).toBe('heic')
    } else {
      expect(res.status).toBe(415)
      expect(res.body.error.code).toBe('unsupported_type')
      expect(res.body.error.message).toMatch(/export .*JPEG/i)
      expect(stored()).toEqual([])
    }
  })

  it('no file answers 400 missing_file; a file in another field answers 400 unexpected_field; neither stores anything', async () => {
    const none = await post(appWith(store), [{ field: 'title', body: 'just a field' }])
    expect(none.status).toBe(400)
    expect(none.body.error.code).toBe('missing_file')
    const json = await request(appWith(store)).post('/files').send({ file: 'x' })
    expect(json.status).toBe(400)
    expect(json.body.error.code).toBe('missing_file')
    const other = await post(appWith(store), [{ field: 'photo', filename: 'a.png', body: await make.png() }])
    expect(other.status).toBe(400)
    expect(other.body.error.code).toBe('unexpected_field')
    expect(stored()).toEqual([])
  })

  it('path tricks in the file name never reach the key; the kept name is sanitised', async () => {
    const app = appWith(store)
    for (const [name, kept] of [
      ['../../../../etc/passwd.png', 'passwd.png'],
      ['..\\..\\windows\\win.ini.png', 'win.ini.png'],
      ['/abs/olute.png', 'olute.png'],
      ['two%0Alines.png', 'two lines.png'],
      ['Wohnzimmer – Ecke.png', 'Wohnzimmer – Ecke.png'],
    ]) {
      const res = await post(app, [{ field: 'file', filename: name, body: await make.png() }])
      expect(res.status, name).toBe(201)
      expect(res.body.originalname).toBe(kept)
      expect(res.body.key).toMatch(/^incoming\/[0-9a-f-]{36}\.png$/)
    }
    const long = await post(app, [{ field: 'file', filename: 'n'.repeat(400) + '.png', body: await make.png() }])
    expect([...long.body.originalname].length).toBe(200)
    for (const k of stored()) expect(k.startsWith('incoming/')).toBe(true)
    expect(readdirSync(path.dirname(root)).filter((n) => n === 'etc' || n === 'passwd.png')).toEqual([])
  })

  it('a client that hangs up half-way leaves nothing in storage', async () => {
    const server = http.createServer(appWith(store)).listen(0, '127.0.0.1')
    await new Promise((r) => server.once('listening', r))
    const { port } = server.address() as AddressInfo
    const { body, contentType } = make.multipart([{ field: 'file', filename: 'cut.wav', body: Buffer.concat([make.wav(0.001), make.noise(4 * MB)]) }])
    await new Promise<void>((resolve) => {
      const req = http.request({ host: '127.0.0.1', port, method: 'POST', path: '/files', headers: { 'Content-Type': contentType, 'Content-Length': body.length } })
      req.on('error', () => resolve())
      req.on('response', () => resolve())
      req.write(body.subarray(0, 1 * MB), () => setTimeout(() => { req.destroy(); resolve() }, 100))
    })
    // the clean-up runs after the hang-up is noticed: give a loaded machine up to 5 s for it
    for (let i = 0; i < 50 && stored().length; i++) await new Promise((r) => setTimeout(r, 100))
    expect(stored()).toEqual([])
    await new Promise((r) => server.close(r))
  })

  it('finaliseUpload moves the temp object to its permanent key; discardUpload removes it and its thumbnail', async () => {
    const app = appWith(store)
    const up = await post(app, [{ field: 'file', filename: 'wall.jpg', body: await make.jpeg(800, 500) }])
    expect(up.status).toBe(201)
    const finalKey = await finaliseUpload(up.body.key, 'cases/17/files/0042.jpg', { storage: store })
    expect(finalKey).toBe('cases/17/files/0042.jpg')
    expect(await store.exists(up.body.key)).toBe(false)
    const thumb = await makeThumbnail(finalKey, { storage: store })
    expect(thumb).toBe(thumbnailKey(finalKey))
    expect(stored()).toEqual(['cases/17/files/0042.jpg', 'cases/17/files/0042.thumb.webp'])
    await discardUpload(finalKey, { storage: store })
    expect(stored()).toEqual([])
    await expect(discardUpload('incoming/not-there.jpg', { storage: store })).resolves.toBeUndefined()
  })
})
