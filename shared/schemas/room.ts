import { z } from 'zod'

export const surfaces = ['front', 'back', 'left', 'right', 'floor', 'ceiling'] as const
export const surfaceSchema = z.enum(surfaces)
export const walls = ['front', 'back', 'left', 'right'] as const

export const speakerKinds = ['sealed', 'ported-front', 'ported-rear', 'open-baffle', 'other'] as const
export const openingKinds = ['door', 'window', 'fireplace', 'open-shelving', 'alcove', 'open-doorway'] as const
export const treatmentTypes = ['panel', 'bass-trap', 'corner-trap', 'cloud', 'diffuser', 'rug', 'curtain'] as const

const metres = (what: string, max = 100) =>
  z.number({ error: `${what} must be a number of metres` }).finite(`${what} must be a finite number`).min(0, `${what} cannot be negative`).max(max, `${what} must be at most ${max} m`)
const dimension = (what: string) => z.number({ error: `${what} must be a number of metres` }).finite().gt(0, `${what} must be more than 0 m`).max(100, `${what} must be at most 100 m`)

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
  length: dimension('length'),
  width: dimension('width'),
  height: dimension('height'),
  celsius: z.number().finite().min(-10).max(45).default(20),
  speakers: z.array(speakerSchema).min(2, 'add at least two speakers').max(16),
  subwoofers: z.array(subwooferSchema).max(8).default([]),
  seats: z.array(seatSchema).min(1, 'add the main seat').max(12),
  openings: z.array(openingSchema).max(40).default([]),
  surfaces: surfacesSchema,
  furnishings: z.array(furnishingSchema).max(40).default([]),
  treatments: z.array(treatmentSchema).max(60).default([]),
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
