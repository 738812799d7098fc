import { z } from 'zod'
import { roomSchema } from './room'

/** POST /api/rooms/subwoofers: the room as described (saved or not) and the layouts to search. */
export const subwooferSearchRequestSchema = z.object({
  room: roomSchema,
  counts: z.array(z.number().int().min(1).max(4)).min(1).max(3).default([1, 2, 4]),
})
export type SubwooferSearchRequest = z.input<typeof subwooferSearchRequestSchema>

const point = z.object({ x: z.number(), y: z.number(), z: z.number() })

export const subwooferAdviceLayoutSchema = z.object({
  positions: z.array(point).min(1),
  gainsDb: z.array(z.number()),
  seatToSeatDb: z.number(),
  meanSpreadDb: z.number(),
  response: z.object({ seats: z.array(z.object({ label: z.string(), smoothedDb: z.array(z.number()), spreadDb: z.number() })) }),
})
export type SubwooferAdviceLayoutShape = z.infer<typeof subwooferAdviceLayoutSchema>

/** The answer: the search's best layout per count with each seat's predicted response (the engine's SubwooferAdvice). */
export const subwooferAdviceSchema = z.object({
  bandHz: z.tuple([z.number(), z.number()]),
  freqsHz: z.array(z.number()),
  seats: z.array(point.extend({ label: z.string() })),
  current: subwooferAdviceLayoutSchema.nullable(),
  best: z.array(z.object({ count: z.number().int(), layout: subwooferAdviceLayoutSchema })),
  candidateCount: z.number().int(),
})
export type SubwooferAdviceShape = z.infer<typeof subwooferAdviceSchema>
