import type { RoomDescription, Surface, Treatment as EngineTreatment } from '../acoustics'
import type { PlanBody } from '../schemas/plan'
import { engineTreatment } from './absorption'

/** The room fields the plan works on (a stored room revision has them all). */
export interface PlanRoom {
  length: number
  width: number
  height: number
  celsius?: number
  speakers: { label: string; x: number; y: number; z: number; kind?: string }[]
  subwoofers?: { label: string; x: number; y: number; z: number; kind?: string }[]
  seats: { label: string; x: number; y: number; z: number }[]
  openings?: { wall: Surface; kind: string; from: number; to: number; bottom: number; top: number }[]
  surfaces: Record<Surface, string>
  furnishings?: { materialId: string; area: number }[]
  treatments?: { type: string; surface: Surface; materialId?: string; thickness: number; airGap?: number; width: number; height: number; x: number; y: number; z: number; mounting?: string; label?: string }[]
}

/** Every change id of a plan, setup first (seat, speakers, subwoofers) then treatments in their list order. */
export function changeIds(body: PlanBody): string[] {
  return [...(body.seat ? ['seat'] : []), ...(body.speakers.length ? ['speakers'] : []), ...(body.subwoofers?.length ? ['subwoofers'] : []), ...body.treatments.map((t) => t.id)]
}

/**
 * A copy of the room with some of the plan's changes made (all of them by default): the main seat
 * moved, speakers and subwoofers moved by label, the plan's treatments added after the room's own. The input room
 * and plan are not changed.
 */
export function applyPlan(room: PlanRoom, body: PlanBody, only?: readonly string[]): RoomDescription {
  const use = (id: string) => !only || only.includes(id)
  const seats = room.seats.map((s, i) => (i === 0 && body.seat && use('seat') ? { ...s, x: body.seat.x, y: body.seat.y, z: body.seat.z } : { ...s }))
  const moved = new Map(use('speakers') ? body.speakers.map((s) => [s.label, s]) : [])
  const speakers = room.speakers.map((s) => {
    const to = moved.get(s.label)
    return to ? { ...s, x: to.x, y: to.y, z: to.z } : { ...s }
  })
  const movedSubs = new Map(use('subwoofers') ? (body.subwoofers ?? []).map((s) => [s.label, s]) : [])
  const subwoofers = (room.subwoofers ?? []).map((s) => {
    const to = movedSubs.get(s.label)
    return to ? { ...s, x: to.x, y: to.y, z: to.z } : { ...s }
  })
  const existing: EngineTreatment[] = (room.treatments ?? []).map((t) => ({ ...t }))
  const added = body.treatments.filter((t) => use(t.id)).map(engineTreatment)
  return {
    length: room.length,
    width: room.width,
    height: room.height,
    celsius: room.celsius,
    speakers,
    subwoofers,
    seats,
    openings: (room.openings ?? []).map((o) => ({ ...o })),
    surfaces: { ...room.surfaces },
    furnishings: (room.furnishings ?? []).map((f) => ({ ...f })),
    treatments: [...existing, ...added],
  }
}
