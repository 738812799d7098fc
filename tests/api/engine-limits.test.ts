import { afterAll, describe, expect, it } from 'vitest'
import request from 'supertest'
import { closeTestApp, signedIn, testApp } from '../helpers/api'
import { testRoom } from '../helpers/rooms'
import { largestAcceptedRoom } from '../fixtures/worst-rooms'

afterAll(closeTestApp)

describe('the room engine runs off the event loop, within stated limits', () => {
  it('POST /api/rooms/preview — a 99.9 × 99.9 × 29.9 m room answers 400 naming the 40 m and 15 m limits (it used to hold the server ~25 s)', async () => {
    const { c } = await signedIn('listener')
    const res = await c.post('/api/rooms/preview', testRoom({ length: 99.9, width: 99.9, height: 29.9 })).expect(400)
    const fields = Object.fromEntries(res.body.error.fields.map((f: { path: string; message: string }) => [f.path, f.message]))
    expect(fields.length).toBe('length must be at most 40 m')
    expect(fields.height).toBe('height must be at most 15 m')
  })
  it('a 30 × 30 × 12 m room (within the field limits) answers 422 beyond_engine_limits naming the mode count and its limit', async () => {
    const { c } = await signedIn('listener')
    const res = await c.post('/api/rooms/preview', testRoom({ length: 30, width: 30, height: 12 })).expect(422)
    expect(res.body.error.code).toBe('beyond_engine_limits')
    expect(res.body.error.message).toMatch(/about [\d,]+ room modes below 375 Hz; Roomwright analyses rooms with at most 4,000/)
    expect(res.body.error.fields[0].path).toBe('length')
    // saving it is refused the same way
    expect((await c.post('/api/rooms', testRoom({ length: 30, width: 30, height: 12 })).expect(422)).body.error.code).toBe('beyond_engine_limits')
  })
  it('16 speakers and 5 seats (80 pairs) answer 422 naming the 64-pair limit', async () => {
    const { c } = await signedIn('listener')
    const speakers = Array.from({ length: 16 }, (_, i) => ({ label: `S${i}`, x: 0.5, y: 0.2 + i * 0.24, z: 1 }))
    const seats = Array.from({ length: 5 }, (_, i) => ({ label: `seat ${i}`, x: 3.5, y: 1 + i * 0.5, z: 1.1 }))
    const res = await c.post('/api/rooms/preview', testRoom({ speakers, seats })).expect(422)
    expect(res.body.error.message).toMatch(/80 speaker–seat pairs; Roomwright traces reflections for at most 64 pairs/)
  })
  it("a room the engine finds impossible (a speaker on the seat) answers 422 engine_refused with the engine's reason, not 500", async () => {
    const { c } = await signedIn('listener')
    const r = testRoom()
    const res = await c.post('/api/rooms/preview', { ...r, seats: [{ label: 'Main seat', x: r.speakers[0].x, y: r.speakers[0].y, z: r.speakers[0].z }] }).expect(422)
    expect(res.body.error.code).toBe('engine_refused')
    expect(res.body.error.message).toMatch(/same point/)
  })
  it('the largest accepted room previews (200); while it computes, GET /api/health answers first', async () => {
    const { c } = await signedIn('listener')
    await c.post('/api/rooms/preview', testRoom()).expect(200) // the worker is up
    const order: string[] = []
    const preview = c.post('/api/rooms/preview', largestAcceptedRoom()).then((r) => { order.push('preview'); return r })
    // ordering, not timing: on the event loop the preview would finish before the health request is even read
    await new Promise((r) => setTimeout(r, 20))
    const health = request(testApp()).get('/api/health').then((r) => { order.push('health'); return r })
    const [p, h] = await Promise.all([preview, health])
    expect(p.status).toBe(200)
    expect(h.status).toBe(200)
    expect(p.body.modes.length).toBeGreaterThan(1000)
    expect(order).toEqual(['health', 'preview'])
  }, 60_000)
  it('a case on the largest accepted room can be submitted; its triage is stored', async () => {
    const { c } = await signedIn('listener')
    const room = (await c.post('/api/rooms', largestAcceptedRoom()).expect(201)).body
    const kase = (await c.post('/api/cases', { roomId: room.id, title: 'Largest accepted room case' }).expect(201)).body
    await c.patch(`/api/cases/${kase.id}`, { status: 'submitted', fromStatus: 'draft' }).expect(200)
    const triage = (await c.get(`/api/cases/${kase.id}/triage`)).body
    expect(triage?.modes?.length ?? 1).toBeGreaterThan(0)
  }, 60_000)
})
