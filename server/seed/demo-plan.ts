import { computeRoomAnalysis } from '../../shared/acoustics'
import { setupSuggestions, snapTargets, treatmentFromTarget, type SnapKind } from '../../shared/plan'
import { planBodySchema, type PlanBody } from '../../shared/schemas/plan'
import type { Room } from '../../shared/schemas/room'

/**
 * A plausible treatment plan for an invented demo room, made the way an advisor makes one in the plan
 * editor: the engine's snap targets (front corners, side-wall mirror points, the ceiling above the seat,
 * the wall behind a seat that is close to it) and its seat suggestion when it gains anything.
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
  const suggestion = setupSuggestions(room, analysis).seat
  return planBodySchema.parse({
    seat: suggestion ? { x: suggestion.x, y: suggestion.y, z: suggestion.z } : null,
    seatNote: suggestion?.reason ?? '',
    treatments,
    notes,
  })
}
