import { afterAll, describe, expect, it } from 'vitest'
import { client, closeTestApp, signedIn } from '../helpers/api'
import { testRoom } from '../helpers/rooms'

afterAll(closeTestApp)

describe('POST /api/rooms', () => {
  it('a listener saves a room as revision 1', async () => {
    const { c } = await signedIn('listener')
    const res = await c.post('/api/rooms', testRoom({ name: 'Loft of the Vantongeren family' })).expect(201)
    expect(res.body).toMatchObject({ revision: 1, revisions: [1], room: { name: 'Loft of the Vantongeren family', length: 5.8 } })
    const list = await c.get('/api/rooms').expect(200)
    expect(list.body.rooms.map((r: { id: string }) => r.id)).toContain(res.body.id)
  })
  it('when the length is negative, answers 400 with the field path', async () => {
    const { c } = await signedIn('listener')
    const res = await c.post('/api/rooms', testRoom({ length: -3 })).expect(400)
    expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain('length')
  })
  it('when the seat lies outside the room, answers 400 naming seats.0.x', async () => {
    const { c } = await signedIn('listener')
    const res = await c.post('/api/rooms', testRoom({ seats: [{ label: 'Sofa', x: 7.3, y: 2, z: 1.1 }] })).expect(400)
    expect(res.body.error.fields).toContainEqual({ path: 'seats.0.x', message: expect.stringContaining('7.3') })
  })
  it('when an opening runs off its wall, answers 400 naming openings.0.to', async () => {
    const { c } = await signedIn('listener')
    const res = await c.post('/api/rooms', testRoom({ openings: [{ wall: 'front', kind: 'window', from: 3, to: 4.6, bottom: 0.9, top: 2.1 }] })).expect(400)
    expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain('openings.0.to')
  })
  it('when a surface names an unknown material, answers 400 naming the surface', async () => {
    const { c } = await signedIn('listener')
    const room = testRoom()
    const res = await c.post('/api/rooms', { ...room, surfaces: { ...room.surfaces, ceiling: 'moon-rock' } }).expect(400)
    expect(res.body.error.fields).toContainEqual({ path: 'surfaces.ceiling', message: expect.stringContaining('moon-rock') })
  })
  it('with only one speaker, answers 400', async () => {
    const { c } = await signedIn('listener')
    const res = await c.post('/api/rooms', testRoom({ speakers: [{ label: 'Mono', x: 1, y: 2, z: 1 }] })).expect(400)
    expect(res.body.error.fields[0].path).toBe('speakers')
  })
  it.each(['advisor', 'supervisor'] as const)('a %s cannot create rooms (403)', async (role) => {
    const { c } = await signedIn(role)
    await c.post('/api/rooms', testRoom()).expect(403)
  })
  it('signed out answers 401', async () => {
    const c = await client()
    await c.post('/api/rooms', testRoom()).expect(401)
  })
})

describe('PUT /api/rooms/:id and revisions', () => {
  it('a PUT makes revision 2 and revision 1 stays readable', async () => {
    const { c } = await signedIn('listener')
    const created = (await c.post('/api/rooms', testRoom()).expect(201)).body
    const res = await c.put(`/api/rooms/${created.id}`, testRoom({ width: 4.35 })).expect(200)
    expect(res.body.revision).toBe(2)
    expect(res.body.revisions).toEqual([1, 2])
    expect((await c.get(`/api/rooms/${created.id}`).expect(200)).body.room.width).toBe(4.35)
    expect((await c.get(`/api/rooms/${created.id}?revision=1`).expect(200)).body.room.width).toBe(4.1)
  })
  it("another listener's room answers 404 for GET and PUT", async () => {
    const owner = await signedIn('listener')
    const stranger = await signedIn('listener')
    const created = (await owner.c.post('/api/rooms', testRoom()).expect(201)).body
    await stranger.c.get(`/api/rooms/${created.id}`).expect(404)
    await stranger.c.put(`/api/rooms/${created.id}`, testRoom()).expect(404)
  })
  it('an advisor cannot read a room that is on no submitted case (404)', async () => {
    const owner = await signedIn('listener')
    const advisor = await signedIn('advisor')
    const created = (await owner.c.post('/api/rooms', testRoom()).expect(201)).body
    await advisor.c.get(`/api/rooms/${created.id}`).expect(404)
  })
})

describe('POST /api/rooms/preview', () => {
  it("answers the engine's analysis of an unsaved room", async () => {
    const { c } = await signedIn('listener')
    const res = await c.post('/api/rooms/preview', testRoom()).expect(200)
    // Lowest axial mode along the 5.8 m length: c/(2L) with c = 331.3·√(1 + 21/273.15) ≈ 343.8 m/s → ≈ 29.6 Hz (Rayleigh; REFERENCES.md).
    const first = res.body.modes.find((m: { n: number[] }) => m.n.join() === '1,0,0')
    expect(first.hz).toBeCloseTo(343.8 / (2 * 5.8), 0)
    expect(Array.isArray(res.body.flags)).toBe(true)
    expect(res.body.reflections.length).toBeGreaterThan(0)
  })
  it('answers 400 for an invalid room', async () => {
    const { c } = await signedIn('listener')
    await c.post('/api/rooms/preview', testRoom({ height: 0 })).expect(400)
  })
})
