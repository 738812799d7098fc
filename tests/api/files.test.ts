import { afterAll, beforeAll, describe, expect, it } from 'vitest'
import { QueryTypes } from 'sequelize'
import { closeTestApp, signedIn } from '../helpers/api'
import { filesUnder } from '../helpers/files'
import { openCase } from '../helpers/cases'
import { jpeg, png } from '../unit/uploads/make-files'
import { addPulse, exponentialDecay, writeWav } from '../unit/signal/synthetic'
import { db } from '../../server/db/sequelize'
import { startBackground, type Background } from '../../server/background'

let background: Background
beforeAll(async () => {
  // The analysis job runs in this process, as it does in the server.
  background = await startBackground({ jobs: true })
})
afterAll(async () => {
  await background.stop()
  await closeTestApp()
})

const countFiles = async (caseId: string) =>
  (await db().query<{ n: number }>('SELECT count(*)::int AS n FROM files WHERE case_id = $1', { bind: [caseId], type: QueryTypes.SELECT }))[0].n

const storedObjects = () => filesUnder(process.env.STORAGE_DIR!)

/** A synthetic impulse response: an exponential decay of T = 0.45 s with a reflection 4 ms after the direct sound. */
function impulseResponseWav(): Buffer {
  const sr = 48_000
  const x = exponentialDecay({ rt: 0.45, sampleRate: sr, seconds: 1.5, seed: 11, startIndex: 480 })
  addPulse(x, sr, 10, 0.9)
  addPulse(x, sr, 14, 0.3)
  return Buffer.from(writeWav([x], sr, '24'))
}

async function waitForAnalysis(c: Awaited<ReturnType<typeof signedIn>>['c'], caseId: string, fileId: string) {
  const until = Date.now() + 30_000
  for (;;) {
    const files = (await c.get(`/api/cases/${caseId}/files`).expect(200)).body.files as { id: string; analysis: { status: string; error?: string; result?: { kind: string; channels: { bands: { centerHz: number; t30: number | null }[] }[] } } }[]
    const f = files.find((x) => x.id === fileId)!
    if (f.analysis && (f.analysis.status === 'done' || f.analysis.status === 'failed')) return f
    if (Date.now() > until) throw new Error(`analysis still ${f.analysis?.status} after 30 s`)
    await new Promise((r) => setTimeout(r, 250))
  }
}

describe('POST /api/cases/:id/files', () => {
  it('a photo is stored with a thumbnail and served inline only to those who may read the case', async () => {
    const listener = await signedIn('listener')
    const advisor = await signedIn('advisor')
    const stranger = await signedIn('listener')
    const { case: c } = await openCase(listener.c)
    const res = await listener.c.agent.post(`/api/cases/${c.id}/files`).set('X-CSRF-Token', listener.c.csrf).attach('file', await jpeg(640, 400), 'sofa-corner.jpg').expect(201)
    expect(res.body).toMatchObject({ kind: 'photo', mime: 'image/jpeg', name: 'sofa-corner.jpg', hasThumbnail: true, analysis: null })
    const img = await advisor.c.get(`/api/files/${res.body.id}`).expect(200)
    expect(img.headers['content-type']).toBe('image/jpeg')
    expect(img.headers['content-disposition']).toMatch(/^inline/)
    const thumb = await listener.c.get(`/api/files/${res.body.id}/thumbnail`).expect(200)
    expect(thumb.headers['content-type']).toBe('image/webp')
    await stranger.c.get(`/api/files/${res.body.id}`).expect(404)
  })
  it('a text file posing as a WAV answers 415 and nothing is stored', async () => {
    const listener = await signedIn('listener')
    const { case: c } = await openCase(listener.c)
    const before = storedObjects().length
    const res = await listener.c.agent.post(`/api/cases/${c.id}/files`).set('X-CSRF-Token', listener.c.csrf)
      .attach('file', Buffer.from('This is not audio at all, just a note about my room.\n'.repeat(20)), { filename: 'left-speaker.wav', contentType: 'audio/wav' }).expect(415)
    expect(res.body.error.code).toBe('unsupported_type')
    expect(await countFiles(c.id)).toBe(0)
    expect(storedObjects().length).toBe(before)
  })
  it('an oversized photo answers 413 and nothing is stored', async () => {
    const listener = await signedIn('listener')
    const { case: c } = await openCase(listener.c)
    const big = Buffer.concat([await png(32, 32), Buffer.alloc(15 * 1024 * 1024 + 10, 7)])
    const res = await listener.c.agent.post(`/api/cases/${c.id}/files`).set('X-CSRF-Token', listener.c.csrf).attach('file', big, 'huge.png').expect(413)
    expect(res.body.error.code).toBe('too_large')
    expect(await countFiles(c.id)).toBe(0)
  })
  it("a stranger's upload answers 404 before anything is stored", async () => {
    const listener = await signedIn('listener')
    const stranger = await signedIn('listener')
    const { case: c } = await openCase(listener.c)
    const before = storedObjects().length
    await stranger.c.agent.post(`/api/cases/${c.id}/files`).set('X-CSRF-Token', stranger.c.csrf).attach('file', await jpeg(), 'x.jpg').expect(404)
    expect(storedObjects().length).toBe(before)
  })
  it('a measurement is analysed by the background job; the case shows the result', async () => {
    const listener = await signedIn('listener')
    const { case: c } = await openCase(listener.c)
    const res = await listener.c.agent.post(`/api/cases/${c.id}/files`).set('X-CSRF-Token', listener.c.csrf).attach('file', impulseResponseWav(), 'seat-left.wav').expect(201)
    expect(res.body).toMatchObject({ kind: 'measurement', analysis: { status: 'queued' } })
    const f = await waitForAnalysis(listener.c, c.id, res.body.id)
    expect(f.analysis.status).toBe('done')
    expect(f.analysis.result!.kind).toBe('impulse-response')
    // A pure exponential decay of T: T30 = T (ISO 3382-2 least-squares fit; REFERENCES.md closed form), here T = 0.45 s.
    const b1k = f.analysis.result!.channels[0].bands.find((b) => b.centerHz === 1000)!
    expect(b1k.t30).toBeGreaterThan(0.4)
    expect(b1k.t30).toBeLessThan(0.5)
    const events = (await listener.c.get(`/api/cases/${c.id}/events`)).body.events as { kind: string; data: { status?: string } }[]
    expect(events.some((e) => e.kind === 'analysis' && e.data.status === 'done')).toBe(true)
  })
  it('a WAV of pure silence fails its analysis with a reason shown on the case', async () => {
    const listener = await signedIn('listener')
    const { case: c } = await openCase(listener.c)
    const silent = Buffer.from(writeWav([new Float64Array(48_000)], 48_000, '16'))
    const res = await listener.c.agent.post(`/api/cases/${c.id}/files`).set('X-CSRF-Token', listener.c.csrf).attach('file', silent, 'silence.wav')
    if (res.status === 201) {
      const f = await waitForAnalysis(listener.c, c.id, res.body.id)
      expect(f.analysis.status).toBe('failed')
      expect(f.analysis.error).toMatch(/silen/i)
    } else {
      // The upload sniffer may already refuse it; either way a clear reason comes back.
      expect(res.status).toBe(415)
      expect(res.body.error.message).toMatch(/silen|audio|sound/i)
    }
  })
})

describe('the queue score follows the information the case holds', () => {
  it('adding a photo removes the "no photo yet" points from the score and the triage breakdown', async () => {
    const listener = await signedIn('listener')
    const { case: c } = await openCase(listener.c)
    const before = (await listener.c.get(`/api/cases/${c.id}/triage`).expect(200)).body
    expect(before.scoreParts.map((p: { label: string }) => p.label)).toContain('no photo yet')
    await listener.c.agent.post(`/api/cases/${c.id}/files`).set('X-CSRF-Token', listener.c.csrf).attach('file', await jpeg(), 'corner.jpg').expect(201)
    const after = (await listener.c.get(`/api/cases/${c.id}/triage`).expect(200)).body
    expect(after.scoreParts.map((p: { label: string }) => p.label)).not.toContain('no photo yet')
    expect(after.score).toBe(before.score - 3)
    const detail = (await listener.c.get(`/api/cases/${c.id}`).expect(200)).body
    expect(detail.score).toBe(after.score)
  })
})

describe('attachments on messages', () => {
  it("a message names files uploaded to its case; a file of another case answers 400 and nothing is posted", async () => {
    const listener = await signedIn('listener')
    const advisor = await signedIn('advisor')
    const { case: c } = await openCase(listener.c)
    const { case: other } = await openCase(listener.c, { title: 'Another room entirely' })
    const up = (await advisor.c.agent.post(`/api/cases/${c.id}/files`).set('X-CSRF-Token', advisor.c.csrf).attach('file', await png(40, 30), 'panel-sketch.png').expect(201)).body
    const foreign = (await listener.c.agent.post(`/api/cases/${other.id}/files`).set('X-CSRF-Token', listener.c.csrf).attach('file', await png(20, 20), 'x.png').expect(201)).body
    const msg = (await advisor.c.post(`/api/cases/${c.id}/messages`, { body: 'Here is the panel layout sketch.', fileIds: [up.id] }).expect(201)).body
    expect(msg.fileIds).toEqual([up.id])
    const res = await advisor.c.post(`/api/cases/${c.id}/messages`, { body: 'Wrong file', fileIds: [foreign.id] }).expect(400)
    expect(res.body.error.fields[0].path).toBe('fileIds')
    const thread = (await listener.c.get(`/api/cases/${c.id}/messages`).expect(200)).body.messages
    expect(thread.map((m: { body: string }) => m.body)).not.toContain('Wrong file')
  })

  it("a file attached to an internal note is as internal as the note: the listener's file list, download and history leave it out", async () => {
    const listener = await signedIn('listener')
    const advisor = await signedIn('advisor')
    const { case: c } = await openCase(listener.c)
    const up = (await advisor.c.agent.post(`/api/cases/${c.id}/files`).set('X-CSRF-Token', advisor.c.csrf).attach('file', await png(36, 24), 'bass-trap-quote.png').expect(201)).body
    await advisor.c.post(`/api/cases/${c.id}/messages`, { body: 'Supplier quote for the corner traps, team only.', internal: true, fileIds: [up.id] }).expect(201)
    const teamFiles = (await advisor.c.get(`/api/cases/${c.id}/files`).expect(200)).body.files as { id: string }[]
    expect(teamFiles.map((f) => f.id)).toContain(up.id)
    const listenerFiles = (await listener.c.get(`/api/cases/${c.id}/files`).expect(200)).body.files as { id: string }[]
    expect(listenerFiles.map((f) => f.id)).not.toContain(up.id)
    await listener.c.get(`/api/files/${up.id}`).expect(404)
    await listener.c.get(`/api/files/${up.id}/thumbnail`).expect(404)
    await advisor.c.get(`/api/files/${up.id}`).expect(200)
    const kinds = ((await listener.c.get(`/api/cases/${c.id}/events`).expect(200)).body.events as { kind: string }[]).map((e) => e.kind)
    expect(kinds).not.toContain('note')
    const teamKinds = ((await advisor.c.get(`/api/cases/${c.id}/events`).expect(200)).body.events as { kind: string }[]).map((e) => e.kind)
    expect(teamKinds).toContain('note')
  })
})
