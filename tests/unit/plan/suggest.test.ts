import { describe, expect, it } from 'vitest'
import { computeRoomAnalysis, modalResponse } from '../../../shared/acoustics'
import { predictPlan, setupSuggestions } from '../../../shared/plan'
import { roomSchema, type Room } from '../../../shared/schemas/room'
import { demoRooms } from '../../../server/seed/rooms'
import { plan, planRoom } from './fixtures'

const withSub = planRoom({ subwoofers: [{ label: 'Sub', x: 0.35, y: 0.4, z: 0.3 }] })
const rooms: [string, Room][] = [
  ['the plan test room (no subwoofer)', planRoom()],
  ['the plan test room with a subwoofer in the front-left corner', withSub],
  ...Object.entries(demoRooms).map(([k, r]): [string, Room] => [`demo room "${k}"${r.subwoofers?.length ? ' (subwoofer)' : ''}`, roomSchema.parse(r)]),
]

describe('setupSuggestions — the suggestion, the search and the plan agree', () => {
  for (const [name, room] of rooms) {
    it(`${name}: each promised spread is the plan's prediction for exactly that move, and the right sources move`, () => {
      const today = computeRoomAnalysis(room)
      const s = setupSuggestions(room, today, -Infinity) // always suggest, so every branch is checked
      const hasSub = (room.subwoofers ?? []).length > 0
      expect(today.seat.bassSourceKind).toBe(hasSub ? 'subwoofers' : 'speakers')
      const seat = s.seat!
      expect(seat.currentSpreadDb).toBeCloseTo(predictPlan(room, plan()).before.spreadDb, 9)
      expect(seat.spreadDb).toBeCloseTo(predictPlan(room, plan({ seat: { x: seat.x, y: seat.y, z: seat.z } })).after.spreadDb, 9)
      expect(seat.spreadDb).toBeCloseTo(today.seat.positionSearch.seat.best.spreadDb, 9)
      expect(seat.from).toEqual({ x: room.seats[0].x, y: room.seats[0].y, z: room.seats[0].z })
      expect(seat.reason).toContain(`from ${room.seats[0].x.toFixed(2)} m to ${seat.x.toFixed(2)} m from the front wall`)
      expect(s.seat38.spreadDb).toBeCloseTo(predictPlan(room, plan({ seat: { x: s.seat38.x, y: s.seat38.y, z: s.seat38.z } })).after.spreadDb, 9)

      const move = hasSub ? s.subwoofers! : s.speakers!
      expect(hasSub ? s.speakers : s.subwoofers).toBeNull()
      expect(move.sources).toBe(hasSub ? 'subwoofers' : 'speakers')
      const movers = hasSub ? room.subwoofers! : room.speakers
      expect(move.moves.map((x) => x.label)).toEqual(movers.map((x) => x.label))
      expect(move.from).toEqual(movers.map((x) => ({ label: x.label, x: x.x, y: x.y, z: x.z })))
      for (const f of movers) expect(move.reason).toContain(`${f.label} from ${f.x.toFixed(2)} m`)
      expect(move.reason).toMatch(hasSub ? /Move the subwoofers? / : /Move the speakers? /)
      const body = hasSub ? plan({ subwoofers: move.moves }) : plan({ speakers: move.moves })
      const predicted = predictPlan(room, body)
      expect(move.spreadDb).toBeCloseTo(predicted.after.spreadDb, 9)
      expect(move.spreadDb).toBeCloseTo(today.seat.positionSearch.speakers.best.spreadDb, 9)
      expect(predicted.changes[0].kind).toBe(hasSub ? 'subwoofers' : 'speakers')
      expect(predicted.changes[0].summary).toMatch(hasSub ? /^Move subwoofer / : /^Move speaker /)
    })
  }

  it('in a room with a subwoofer, moving the main speakers (what the old suggestion told the listener) leaves the predicted spread unchanged', () => {
    const today = computeRoomAnalysis(withSub)
    const d = today.seat.positionSearch.speakers.best.distanceFromFront
    const p = predictPlan(withSub, plan({ speakers: withSub.speakers.map((s) => ({ label: s.label, x: d, y: s.y, z: s.z })) }))
    expect(p.after.spreadDb).toBeCloseTo(p.before.spreadDb, 9)
    expect(setupSuggestions(withSub, today).speakers).toBeNull()
  })

  for (const [name, room] of [rooms[0], rooms[1]]) {
    it(`${name}: a brute-force search over the same grid with the public modalResponse finds nothing better`, () => {
      const today = computeRoomAnalysis(room)
      const s = setupSuggestions(room, today, -Infinity)
      const rt60 = today.reverberation.bands.map((b) => ({ hz: b.hz, seconds: b.eyring }))
      const bass = (room.subwoofers?.length ? room.subwoofers : room.speakers).map((p) => ({ x: p.x, y: p.y, z: p.z }))
      const seatZ = room.seats[0].z
      const grid = today.seat.positionSearch.seat.scan.filter((_, i) => i % 4 === 0 || today.seat.positionSearch.seat.scan[i].spreadDb === today.seat.positionSearch.seat.best.spreadDb)
      const seatBrute = Math.min(...grid.map((p) => modalResponse(room, bass, { x: p.x, y: p.y, z: seatZ }, { rt60 }).spreadDb))
      expect(seatBrute).toBeGreaterThanOrEqual(s.seat!.spreadDb - 1e-9)
      const move = (s.subwoofers ?? s.speakers)!
      const spkBrute = Math.min(...today.seat.positionSearch.speakers.scan.map((p) =>
        modalResponse(room, bass.map((b) => ({ ...b, x: p.distanceFromFront })), room.seats[0], { rt60 }).spreadDb))
      expect(spkBrute).toBeGreaterThanOrEqual(move.spreadDb - 1e-9)
      expect(spkBrute).toBeCloseTo(move.spreadDb, 9)
    })
  }
})
