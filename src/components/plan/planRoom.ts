import { applyPlan } from '../../../shared/plan'
import type { PlanBody } from '../../../shared/schemas/plan'
import type { Room } from '../../../shared/schemas/room'
import type { RoomPlanRoom } from '../room/planDrawing'

/** The room as the plan leaves it, in the shape the room plan drawing takes (existing treatments first). */
export function roomAfterPlan(room: Room, body: PlanBody): RoomPlanRoom {
  const after = applyPlan(room, body)
  return {
    length: room.length,
    width: room.width,
    height: room.height,
    speakers: after.speakers,
    subwoofers: after.subwoofers ?? [],
    seats: after.seats,
    openings: room.openings,
    treatments: [
      ...room.treatments,
      ...body.treatments.map((t) => ({ type: t.type, surface: t.surface, thickness: t.thickness, width: t.width, height: t.height, x: t.x, y: t.y, z: t.z })),
    ],
  }
}

/** Step numbers by change id, in the plan's order. */
export function stepNumbers(order: readonly string[]): Record<string, number> {
  return Object.fromEntries(order.map((id, i) => [id, i + 1]))
}
