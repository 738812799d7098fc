import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import fc from 'fast-check'
import { deflateRawSync } from 'node:zlib'
import { mkdtempSync, rmSync, statSync } from 'node:fs'
import { join } from 'node:path'
import { tmpdir } from 'node:os'
import { QueryTypes } from 'sequelize'
import { db } from '../../server/db/sequelize'
import { stopJobs } from '../../server/jobs/queue'
import { LocalStorage } from '../../server/storage'
import { setStorageForTests } from '../../server/storage/index'
import { closeTestApp, signedIn, type Client } from '../helpers/api'
import { openCase } from '../helpers/cases'
import { filesUnder } from '../helpers/files'
import { gif, jpeg, multipart, noise, png, pngBomb, responseText, wav } from '../unit/uploads/make-files'
import { fcParams, fuzzTimeout, unsafeHtml, xssCorpus } from '../unit/fuzz/helpers'

/**
 * Uploads through POST /api/cases/:id/files with a private storage folder, so every object can be
 * counted: a refused upload leaves no file row and no stored byte. Then the XSS corpus through
 * messages: the API's HTML field and the e-mail's HTML never carry a script.
 */
const q = <T extends object>(sql: string, bind: unknown[] = []) => db().query<T>(sql, { bind, type: QueryTypes.SELECT })
let root: string
let listener: { c: Client; user: { id: string } }
let advisor: { c: Client }
let caseId: string

const objects = () => filesUnder(root)
const fileRows = async () => (await q<{ n: number }>('SELECT count(*)::int AS n FROM files WHERE case_id = $1', [caseId]))[0].n

beforeAll(async () => {
  root = mkdtempSync(join(process.env.TEST_TMP ?? tmpdir(), 'fuzz-storage-'))
  setStorageForTests(new LocalStorage(root))
  listener = await signedIn('listener')
  advisor = await signedIn('advisor')
  caseId = (await openCase(listener.c, { title: 'Uploads under fire' })).case.id
}, 60_000)
afterAll(async () => {
  setStorageForTests(undefined)
  rmSync(root, { recursive: true, force: true })
  await stopJobs()
  await closeTestApp()
})

function post(body: Buffer, contentType: string) {
  return listener.c.agent.post(`/api/cases/${caseId}/files`).set('X-CSRF-Token', listener.c.csrf).set('Content-Type', contentType).send(body).timeout({ response: 20_000 })
}
async function upload(file: Buffer, filename: string, contentType = 'application/octet-stream') {
  const { body, contentType: ct } = multipart([{ field: 'file', filename, contentType, body: file }])
  return post(body, ct)
}

/** A ZIP archive (one stored entry, deflated) whose member unpacks to `size` bytes of zeros. @see PKWARE APPNOTE.TXT 6.3 (local header, central directory, end record) */
function zipBomb(size = 100 * 1024 * 1024, name = 'measurement.wav'): Buffer {
  const data = deflateRawSync(Buffer.alloc(size), { level: 9 })
  const n = Buffer.from(name)
  const local = Buffer.alloc(30)
  local.writeUInt32LE(0x04034b50, 0); local.writeUInt16LE(20, 4); local.writeUInt16LE(8, 8)
  local.writeUInt32LE(data.length, 18); local.writeUInt32LE(size, 22); local.writeUInt16LE(n.length, 26)
  const central = Buffer.alloc(46)
  central.writeUInt32LE(0x02014b50, 0); central.writeUInt16LE(20, 4); central.writeUInt16LE(20, 6); central.writeUInt16LE(8, 10)
  central.writeUInt32LE(data.length, 20); central.writeUInt32LE(size, 24); central.writeUInt16LE(n.length, 28)
  const end = Buffer.alloc(22)
  end.writeUInt32LE(0x06054b50, 0); end.writeUInt16LE(1, 8); end.writeUInt16LE(1, 10)
  end.writeUInt32LE(46 + n.length, 12); end.writeUInt32LE(30 + n.length + data.length, 16)
  return Buffer.concat([local, n, data, central, n, end])
}

describe('uploads: wrong types, lying names, bombs and path tricks', () => {
  it('wrong types and lying extensions answer 415 with nothing stored', async () => {
    const before = { rows: await fileRows(), objects: objects().length }
    const cases: [Buffer, string][] = [
      [await gif(), 'photo.jpg'],
      [Buffer.from('%PDF-1.7\n1 0 obj <<>> endobj\n'), 'room.png'],
      [Buffer.from('<svg xmlns="http://www.w3.org/2000/svg" onload="alert(1)"><script>alert(1)</script></svg>'), 'plan.png'],
      [Buffer.from('<!doctype html><script>alert(1)</script>'), 'response.txt'],
      [Buffer.from('MZ\x90\x00\x03\x00\x00\x00', 'latin1'), 'impulse.wav'],
      [noise(50_000, 7), 'noise.wav'],
      [zipBomb(), 'measurement.wav'],
      [Buffer.from('#!/bin/sh\nrm -rf /\n'), 'measurement.txt'],
    ]
    for (const [file, name] of cases) {
      const res = await upload(file, name, 'image/png')
      expect(res.status, `${name}: ${res.text}`).toBe(415)
      expect(res.body.error.code).toBe('unsupported_type')
    }
    expect(await fileRows()).toBe(before.rows)
    expect(objects().length).toBe(before.objects)
  }, 60_000)
  it('a PNG declaring 60 000 × 60 000 pixels answers 413 without decoding it, and leaves nothing stored', async () => {
    const before = { rows: await fileRows(), objects: objects().length }
    const rss = process.memoryUsage().rss
    const res = await upload(pngBomb(), 'innocent.png', 'image/png')
    expect(res.status).toBe(413)
    expect(res.body.error.code).toBe('image_too_large')
    expect(process.memoryUsage().rss - rss).toBeLessThan(200 * 1024 * 1024)
    expect(await fileRows()).toBe(before.rows)
    expect(objects().length).toBe(before.objects)
  })
  it('a truthful file under a lying name is stored by what it is (a JPEG called .wav is a photo)', async () => {
    const res = await upload(await jpeg(64, 48), 'impulse.wav', 'audio/wav')
    expect(res.status).toBe(201)
    expect(res.body).toMatchObject({ kind: 'photo', mime: 'image/jpeg', name: 'impulse.wav' })
  })
  it('path tricks in names never reach the storage path; the shown name keeps no path part, NUL or bidi override', async () => {
    const names = ['../../etc/passwd', '..\\..\\windows\\system32\\config', '/etc/shadow', 'a\u0000.png', '\u202egnp.exe', '....//....//x.png', '%2e%2e%2fetc%2fpasswd.png', ' .htaccess', 'C:\\boot.ini', 'x'.repeat(300) + '.png']
    for (const name of names) {
      const res = await upload(await png(8, 8), name, 'image/png')
      if (name.includes('\u0000')) {
        // a NUL in a multipart header is malformed HTTP: busboy refuses the part
        expect(res.status, `${name}: ${res.text}`).toBe(400)
        continue
      }
      expect(res.status, `${name}: ${res.text}`).toBe(201)
      expect(res.body.name).not.toMatch(/[\\/\u0000\u202e]/)
      expect(res.body.name.startsWith('.')).toBe(false)
      expect([...res.body.name].length).toBeLessThanOrEqual(200)
      const [row] = await q<{ storage_key: string }>('SELECT storage_key FROM files WHERE id = $1', [res.body.id])
      expect(row.storage_key).toMatch(new RegExp(`^cases/${caseId}/[0-9a-f-]{36}\\.png$`))
    }
    // every stored object lies inside the storage folder, and nothing is named after a client's path
    for (const f of objects()) {
      expect(f.startsWith(root)).toBe(true)
      expect(f).not.toMatch(/passwd|shadow|system32|htaccess|boot\.ini/)
    }
    expect(statSync('/etc/passwd').isFile()).toBe(true)
  }, 60_000)
  it('arbitrary bytes under arbitrary names: 201, 400, 413 or 415, never 500; a refusal stores nothing', async () => {
    const valid = [await png(16, 16), await jpeg(32, 16), wav(0.05), responseText(30)]
    const name = fc.oneof(fc.string({ maxLength: 60 }), fc.constantFrom('../../etc/passwd', 'a\u0000b.wav', 'x.png', 'x.wav', 'x.txt', '', '.', '..'))
    const bytes = fc.oneof(
      fc.uint8Array({ maxLength: 3000 }).map((u) => Buffer.from(u)),
      fc.tuple(fc.constantFrom(...valid), fc.nat(), fc.uint8Array({ minLength: 1, maxLength: 16 })).map(([v, at, junk]) => {
        const b = Buffer.from(v)
        b.set(junk.subarray(0, Math.max(0, b.length - (at % b.length))), at % b.length)
        return b
      }),
      fc.tuple(fc.constantFrom(...valid), fc.nat()).map(([v, cut]) => v.subarray(0, cut % v.length)),
    )
    await fc.assert(
      fc.asyncProperty(bytes, name, async (b, n) => {
        const before = { rows: await fileRows(), objects: objects().length }
        const res = await upload(b, n)
        expect([201, 400, 413, 415], `${n}: ${res.status} ${res.text.slice(0, 200)}`).toContain(res.status)
        if (res.status !== 201) {
          expect(res.body.error.code).toEqual(expect.any(String))
          expect(await fileRows()).toBe(before.rows)
          expect(objects().length).toBe(before.objects)
        }
      }),
      fcParams(60),
    )
  }, fuzzTimeout(120_000))
  it('broken multipart bodies answer 400, never 500, and store nothing', async () => {
    const before = { rows: await fileRows(), objects: objects().length }
    const raw = fc.oneof(fc.uint8Array({ maxLength: 2000 }).map((u) => Buffer.from(u)), fc.string({ maxLength: 300 }).map((s) => Buffer.from(`--b\r\nContent-Disposition: form-data; name="file"; filename="${s}"\r\n\r\n${s}`)))
    await fc.assert(
      fc.asyncProperty(raw, async (b) => {
        const res = await post(b, 'multipart/form-data; boundary=b')
        expect(res.status, res.text.slice(0, 200)).toBeGreaterThanOrEqual(400)
        expect(res.status).toBeLessThan(500)
      }),
      fcParams(60),
    )
    expect(await fileRows()).toBe(before.rows)
    expect(objects().length).toBe(before.objects)
  }, fuzzTimeout(120_000))
})

describe('markdown: the XSS corpus through messages', () => {
  const corpus = xssCorpus()
  it("every payload posted by an advisor: the message's html and the listener's e-mail html carry no script, handler or javascript: URL; the body is kept as written", async () => {
    const problems: string[] = []
    const t0 = new Date()
    for (const payload of corpus) {
      const posted = (await advisor.c.post(`/api/cases/${caseId}/messages`, { body: `Reply: ${payload}` }).expect(201)).body
      expect(posted.body).toBe(`Reply: ${payload}`.trim())
      for (const p of unsafeHtml(posted.html)) problems.push(`api ${payload}: ${p}`)
    }
    const thread = (await listener.c.get(`/api/cases/${caseId}/messages`).expect(200)).body.messages as { html: string }[]
    for (const m of thread) for (const p of unsafeHtml(m.html)) problems.push(`thread: ${p}`)
    const mails = await q<{ html: string; text: string }>(`SELECT html, text FROM email_outbox WHERE case_id = $1 AND kind = 'reply' AND created_at >= $2`, [caseId, t0])
    expect(mails.length).toBe(corpus.length)
    // the e-mail layout has its own <meta> tags and inline styles; nothing else may appear
    for (const m of mails) for (const p of unsafeHtml(m.html, { allowStyle: true, allowTags: ['meta'] })) problems.push(`e-mail: ${p}`)
    expect(problems).toEqual([])
  }, 120_000)
  it('a listener message with a payload is just as safe in the advisor view', async () => {
    const payload = '<img src=x onerror=alert(1)>[x](javascript:alert(1))<script>alert(1)</script>'
    const posted = (await listener.c.post(`/api/cases/${caseId}/messages`, { body: payload }).expect(201)).body
    expect(unsafeHtml(posted.html)).toEqual([])
    const seen = ((await advisor.c.get(`/api/cases/${caseId}/messages`).expect(200)).body.messages as { id: string; html: string }[]).find((m) => m.id === posted.id)!
    expect(unsafeHtml(seen.html)).toEqual([])
  })
})
