import { describe, expect, it } from 'vitest'
import { demoPlanBody } from '../../../server/seed/demo-plan'
import { demoRooms, type DemoRoomKey } from '../../../server/seed/rooms'
import { computeRoomAnalysis } from '../../../shared/acoustics'
import { applyPlan } from '../../../shared/plan'
import { roomSchema } from '../../../shared/schemas/room'

describe('the demo plans (server/seed/demo-plan.ts)', () => {
  it.each(Object.keys(demoRooms) as DemoRoomKey[])('%s: the planned seat is 38 per cent of the length from the front wall, and the room with the plan raises no seat-near-wall check', (key) => {
    const room = roomSchema.parse(demoRooms[key])
    const body = demoPlanBody(room, 'Corner traps first.')
    const seat = body.seat ?? room.seats[0]
    // 38 % of the length from the front wall: a usual starting point (common practice, no source)
    if (body.seat) {
      expect(body.seat.x).toBeCloseTo(0.38 * room.length, 2)
      expect(body.seatNote).toMatch(/38 % of the length/)
    }
    expect(room.length - seat.x, 'metres to the back wall').toBeGreaterThan(0.6)
    const planned = computeRoomAnalysis(applyPlan(room, body))
    expect(planned.flags.map((f) => f.id)).not.toContain('seat-near-wall')
  })
})
