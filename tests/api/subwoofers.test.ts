import { afterAll, describe, expect, it } from 'vitest'
import { closeTestApp, signedIn } from '../helpers/api'
import { testRoom } from '../helpers/rooms'
import { subwooferAdvice } from '../../shared/acoustics'
import { roomSchema } from '../../shared/schemas/room'
import { subwooferAdviceSchema } from '../../shared/schemas/subwoofers'

afterAll(closeTestApp)

const sofa = [
  { label: 'Sofa left', x: 3.6, y: 1.45, z: 1.1 },
  { label: 'Sofa middle', x: 3.6, y: 2.05, z: 1.1 },
  { label: 'Sofa right', x: 3.6, y: 2.65, z: 1.1 },
]

describe('POST /api/rooms/subwoofers', () => {
  it("answers the best layout of 1, 2 and 4 subwoofers for every seat, computed in the worker pool, equal to the engine's own answer", async () => {
    const { c } = await signedIn('listener')
    const room = testRoom({ seats: sofa, subwoofers: [{ label: 'Sub', x: 0.2, y: 0.2, z: 0.3 }] })
    const res = await c.post('/api/rooms/subwoofers', { room }).expect(200)
    const body = subwooferAdviceSchema.parse(res.body)
    expect(body.best.map((b) => b.count)).toEqual([1, 2, 4])
    expect(body.best.every((b) => b.layout.response.seats.length === 3)).toBe(true)
    expect(body.current).not.toBeNull()
    // regression guard: the worker's answer is the engine's, not a second implementation
    expect(body).toEqual(JSON.parse(JSON.stringify(subwooferAdvice(roomSchema.parse(room)))))
  })
  it('answers 400 with the field path for a room with a seat outside it', async () => {
    const { c } = await signedIn('advisor')
    const res = await c.post('/api/rooms/subwoofers', { room: testRoom({ seats: [{ label: 'Main seat', x: 9, y: 1, z: 1 }] }) }).expect(400)
    expect(res.body.error.fields.map((f: { path: string }) => f.path)).toContain('room.seats.0.x')
  })
})
