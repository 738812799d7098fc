import { computeRoomAnalysis } from '../../shared/acoustics'
import { setupSuggestions, snapTargets, treatmentFromTarget, type SnapKind } from '../../shared/plan'
import { planBodySchema, type PlanBody } from '../../shared/schemas/plan'
import type { Room } from '../../shared/schemas/room'

/**
 * A plausible treatment plan for an invented demo room, made the way an advisor makes one in the plan
 * editor: the engine's snap targets (front corners, side-wall mirror points, the ceiling above the seat,
 * the wall behind a seat that is close to it) and the seat moved to 38 % of the length.
 */
export function demoPlanBody(room: Room, notes: string): PlanBody {
  const analysis = computeRoomAnalysis(room)
  const targets = snapTargets(room, analysis)
  const seat = room.seats[0]
  const wanted: { kind: SnapKind; count: number; when?: boolean }[] = [
    { kind: 'corner', count: 2 },
    { kind: 'mirror', count: 2 },
    { kind: 'ceiling', count: 1, when: room.length * room.width > 14 },
    { kind: 'back-wall', count: 1, when: room.length - seat.x < 1.2 },
  ]
  const chosen = wanted.flatMap((w) => (w.when === false ? [] : targets.filter((t) => t.kind === w.kind && (t.kind !== 'mirror' || t.surface === 'left' || t.surface === 'right')).slice(0, w.count)))
  const treatments = chosen.map((t, i) => treatmentFromTarget(t, `${t.kind}-${i + 1}`))
  // The seat goes to 38 % of the length from the front wall, on the centre line (a usual starting point,
  // common practice, no source), when that moves it at all. Not the engine's smoothest-bass point: its
  // scan runs up to the back wall, and a seat placed there is what the seat-near-wall check then warns of.
  const at38 = setupSuggestions(room, analysis).seat38
  const move = Math.hypot(at38.x - seat.x, at38.y - seat.y) >= 0.1
  const m = (v: number) => `${v.toFixed(2)} m`
  return planBodySchema.parse({
    seat: move ? { x: at38.x, y: at38.y, z: at38.z } : null,
    seatNote: move
      ? `Move the main seat from ${m(seat.x)} to ${m(at38.x)} from the front wall, on the room's centre line: 38 % of the length is a usual starting point (common practice, no source), and the engine predicts a bass spread of ${at38.spreadDb.toFixed(1)} dB there.`
      : '',
    treatments,
    notes,
  })
}
