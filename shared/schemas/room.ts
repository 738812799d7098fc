import { z } from 'zod'
import { bandReverberation, modeCountEstimate, type RoomDescription } from '../acoustics'

export const surfaces = ['front', 'back', 'left', 'right', 'floor', 'ceiling'] as const
export const surfaceSchema = z.enum(surfaces)
export const walls = ['front', 'back', 'left', 'right'] as const

export const speakerKinds = ['sealed', 'ported-front', 'ported-rear', 'open-baffle', 'other'] as const
export const openingKinds = ['door', 'window', 'fireplace', 'open-shelving', 'alcove', 'open-doorway'] as const
export const treatmentTypes = ['panel', 'bass-trap', 'corner-trap', 'cloud', 'diffuser', 'rug', 'curtain'] as const

/**
 * What the room engine accepts: Roomwright is for listening rooms, home studios and home cinemas, and
 * these bounds keep the worst accepted room's complete analysis well under a second (see `npm run bench`,
 * "engine: worst accepted room"). The counts and dimensions are schema limits (400 with the field path);
 * the pairs and mode counts depend on several fields and are checked by `engineLimitIssues` (the server
 * answers 422 `beyond_engine_limits`, the client shows the same sentence instead of a preview).
 */
export const ROOM_LIMITS = {
  /** metres */
  length: 40,
  width: 40,
  height: 15,
  speakers: 16,
  subwoofers: 8,
  seats: 12,
  openings: 40,
  treatments: 60,
  furnishings: 40,
  /** speakers × seats: the reflections are traced for every pair */
  speakerSeatPairs: 64,
  /** modes summed for the modal response and the position search (up to MODAL_SUM_HZ) */
  summedModes: 4000,
  /** modes in the mode table (up to the larger of 300 Hz and twice the Schroeder frequency) */
  listedModes: 16000,
} as const

/** The engine sums modes up to 1.25 × 300 Hz for the seat's response (buildModalSystem's default). */
export const MODAL_SUM_HZ = 1.25 * 300

const metres = (what: string, max = 100) =>
  z.number({ error: `${what} must be a number of metres` }).finite(`${what} must be a finite number`).min(0, `${what} cannot be negative`).max(max, `${what} must be at most ${max} m`)
const dimension = (what: string, max: number) => z.number({ error: `${what} must be a number of metres` }).finite().gt(0, `${what} must be more than 0 m`).max(max, `${what} must be at most ${max} m`)

export const pointSchema = z.object({ x: metres('x'), y: metres('y'), z: metres('z') })
export const speakerSchema = pointSchema.extend({
  label: z.string().trim().min(1).max(40),
  kind: z.enum(speakerKinds).optional(),
})
export const seatSchema = pointSchema.extend({ label: z.string().trim().min(1).max(40) })
export const subwooferSchema = pointSchema.extend({ label: z.string().trim().min(1).max(40), kind: z.enum(speakerKinds).optional() })

/** A rectangle on a wall: from/to along the wall (x on left/right walls, y on front/back), bottom/top above the floor. */
export const openingSchema = z.object({
  wall: z.enum(walls),
  kind: z.enum(openingKinds),
  from: metres('from'),
  to: metres('to'),
  bottom: metres('bottom'),
  top: metres('top'),
})

/** Existing or planned treatment; its centre (x, y, z) lies on its surface, size in metres. */
export const treatmentSchema = z.object({
  type: z.enum(treatmentTypes),
  surface: surfaceSchema,
  materialId: z.string().max(60).optional(),
  thickness: z.number().finite().min(0).max(1.5),
  airGap: z.number().finite().min(0).max(1).optional(),
  width: z.number().finite().gt(0).max(20),
  height: z.number().finite().gt(0).max(20),
  x: metres('x'),
  y: metres('y'),
  z: metres('z'),
  mounting: z.enum(['wall', 'ceiling-hung', 'stand', 'floor', 'corner']).optional(),
  label: z.string().max(60).optional(),
})

export const furnishingSchema = z.object({ materialId: z.string().min(1).max(60), area: z.number().finite().gt(0).max(500) })

const surfacesSchema = z.object(Object.fromEntries(surfaces.map((s) => [s, z.string().min(1).max(60)])) as Record<(typeof surfaces)[number], z.ZodString>)

const roomObject = z.object({
  name: z.string().trim().min(1, 'give the room a name').max(120),
  length: dimension('length', ROOM_LIMITS.length),
  width: dimension('width', ROOM_LIMITS.width),
  height: dimension('height', ROOM_LIMITS.height),
  celsius: z.number().finite().min(-10).max(45).default(20),
  speakers: z.array(speakerSchema).min(2, 'add at least two speakers').max(ROOM_LIMITS.speakers, `at most ${ROOM_LIMITS.speakers} speakers`),
  subwoofers: z.array(subwooferSchema).max(ROOM_LIMITS.subwoofers, `at most ${ROOM_LIMITS.subwoofers} subwoofers`).default([]),
  seats: z.array(seatSchema).min(1, 'add the main seat').max(ROOM_LIMITS.seats, `at most ${ROOM_LIMITS.seats} seats`),
  openings: z.array(openingSchema).max(ROOM_LIMITS.openings, `at most ${ROOM_LIMITS.openings} openings`).default([]),
  surfaces: surfacesSchema,
  furnishings: z.array(furnishingSchema).max(ROOM_LIMITS.furnishings, `at most ${ROOM_LIMITS.furnishings} furnishings`).default([]),
  treatments: z.array(treatmentSchema).max(ROOM_LIMITS.treatments, `at most ${ROOM_LIMITS.treatments} treatments`).default([]),
  notes: z.string().max(4000).default(''),
})

type RoomShape = z.infer<typeof roomObject>

/** Cross-field checks, with the field path of the offending value. */
function checkGeometry(room: RoomShape, ctx: z.RefinementCtx) {
  const { length, width, height } = room
  const inside = (p: { x: number; y: number; z: number }, path: (string | number)[]) => {
    if (p.x > length) ctx.addIssue({ code: 'custom', path: [...path, 'x'], message: `x = ${p.x} m lies beyond the length ${length} m` })
    if (p.y > width) ctx.addIssue({ code: 'custom', path: [...path, 'y'], message: `y = ${p.y} m lies beyond the width ${width} m` })
    if (p.z > height) ctx.addIssue({ code: 'custom', path: [...path, 'z'], message: `z = ${p.z} m lies above the height ${height} m` })
  }
  room.speakers.forEach((s, i) => inside(s, ['speakers', i]))
  room.subwoofers.forEach((s, i) => inside(s, ['subwoofers', i]))
  room.seats.forEach((s, i) => inside(s, ['seats', i]))
  room.treatments.forEach((t, i) => inside(t, ['treatments', i]))
  room.openings.forEach((o, i) => {
    const span = o.wall === 'left' || o.wall === 'right' ? length : width
    if (o.to <= o.from) ctx.addIssue({ code: 'custom', path: ['openings', i, 'to'], message: 'the opening must end after it starts' })
    if (o.to > span) ctx.addIssue({ code: 'custom', path: ['openings', i, 'to'], message: `the opening runs past the end of the ${o.wall} wall (${span} m)` })
    if (o.top <= o.bottom) ctx.addIssue({ code: 'custom', path: ['openings', i, 'top'], message: 'the top must be above the bottom' })
    if (o.top > height) ctx.addIssue({ code: 'custom', path: ['openings', i, 'top'], message: `the opening reaches above the ceiling (${height} m)` })
  })
  const labels = new Set<string>()
  room.speakers.forEach((s, i) => {
    if (labels.has(s.label)) ctx.addIssue({ code: 'custom', path: ['speakers', i, 'label'], message: 'each speaker needs its own label' })
    labels.add(s.label)
  })
}

/** One room description, in metres in the engine's room frame; shared by the client and the server. */
export const roomSchema = roomObject.superRefine(checkGeometry)
export type Room = z.output<typeof roomSchema>
export type RoomInput = z.input<typeof roomSchema>
export type Opening = z.infer<typeof openingSchema>

export interface EngineLimitIssue {
  /** which limit of ROOM_LIMITS */
  limit: 'speakerSeatPairs' | 'summedModes' | 'listedModes'
  /** the field path to point at ('' for the room as a whole) */
  path: string
  message: string
  /** the room's figure and the limit */
  value: number
  max: number
}

const fmtCount = (n: number) => Math.round(n).toLocaleString('en-GB')

/**
 * The limits that depend on several fields, checked on a room the schema accepted (cheap: no mode is
 * computed, the counts are the closed-form estimate, within 2 % of the exact counts for box rooms).
 * Empty when the engine takes the room; the client and the server both use it.
 * @see Kuttruff, Room Acoustics: N(f) ≈ 4πVf³/(3c³) + πSf²/(4c²) + Lf/(8c) (modeCountEstimate)
 */
export function engineLimitIssues(room: RoomDescription): EngineLimitIssue[] {
  const issues: EngineLimitIssue[] = []
  const pairs = room.speakers.length * room.seats.length
  if (pairs > ROOM_LIMITS.speakerSeatPairs) {
    issues.push({
      limit: 'speakerSeatPairs', path: 'seats', value: pairs, max: ROOM_LIMITS.speakerSeatPairs,
      message: `${room.speakers.length} speakers × ${room.seats.length} seats make ${pairs} speaker–seat pairs; Roomwright traces reflections for at most ${ROOM_LIMITS.speakerSeatPairs} pairs`,
    })
  }
  const box = { length: room.length, width: room.width, height: room.height }
  const celsius = room.celsius ?? 20
  const summed = modeCountEstimate(box, MODAL_SUM_HZ, celsius)
  if (summed > ROOM_LIMITS.summedModes) {
    issues.push({
      limit: 'summedModes', path: 'length', value: Math.round(summed), max: ROOM_LIMITS.summedModes,
      message: `a room of ${fmtCount(room.length * room.width * room.height)} m³ has about ${fmtCount(summed)} room modes below ${MODAL_SUM_HZ} Hz; Roomwright analyses rooms with at most ${fmtCount(ROOM_LIMITS.summedModes)} (about 650 m³, e.g. 12 × 9.5 × 5.5 m)`,
    })
  }
  let schroederHz: number | null = null
  try {
    schroederHz = bandReverberation({ room: box, surfaces: room.surfaces, openings: room.openings, furnishings: room.furnishings, treatments: room.treatments, celsius }).schroederHz
  } catch {
    // an impossible room (e.g. openings larger than their wall) is the engine's own 422 with its reason
  }
  if (schroederHz !== null && Number.isFinite(schroederHz)) {
    const topHz = Math.max(300, 2 * schroederHz)
    const listed = modeCountEstimate(box, topHz, celsius)
    if (listed > ROOM_LIMITS.listedModes) {
      issues.push({
        limit: 'listedModes', path: 'surfaces', value: Math.round(listed), max: ROOM_LIMITS.listedModes,
        message: `the mode table up to ${Math.round(topHz)} Hz (twice the Schroeder frequency) would hold about ${fmtCount(listed)} modes; Roomwright lists at most ${fmtCount(ROOM_LIMITS.listedModes)}: the surfaces are unusually hard — add the floor covering, furnishings and openings the room has`,
      })
    }
  }
  return issues
}
export type Treatment = z.infer<typeof treatmentSchema>

export const roomSummarySchema = z.object({
  id: z.string().uuid(),
  name: z.string(),
  revision: z.number().int(),
  length: z.number(),
  width: z.number(),
  height: z.number(),
  updatedAt: z.string(),
})
export type RoomSummary = z.infer<typeof roomSummarySchema>

export interface RoomRecord {
  id: string
  ownerId: string
  revision: number
  revisions: number[]
  room: Room
  createdAt: string
  updatedAt: string
}
