import { z } from 'zod'
import { surfaceSchema, treatmentTypes } from './room'
import { caseStatusSchema } from './case'

const metres = (what: string, max = 100) =>
  z.number({ error: `${what} must be a number of metres` }).finite(`${what} must be a finite number`).min(0, `${what} cannot be negative`).max(max, `${what} must be at most ${max} m`)

export const treatmentMountings = ['wall', 'ceiling-hung', 'stand', 'floor', 'corner'] as const

/** A point in the room frame (metres). */
export const planPointSchema = z.object({ x: metres('x'), y: metres('y'), z: metres('z') })

/**
 * One treatment the plan adds. Its centre (x, y, z) lies on `surface`; `width` runs along the
 * surface's first in-plane axis (front/back walls: y; left/right walls: x; floor/ceiling: x),
 * `height` along the second (walls: z; floor/ceiling: y). Absorption comes from `materialId` (a row of
 * the materials table) or, without one, from the porous model (`thickness`, `flowResistivity`, `airGap`).
 */
export const planTreatmentSchema = z.object({
  /** stable id within the plan (the client makes it up), used by `order` */
  id: z.string().trim().min(1).max(40).regex(/^[a-z0-9-]+$/i, 'use letters, digits and dashes'),
  type: z.enum(treatmentTypes),
  surface: surfaceSchema,
  materialId: z.string().max(60).optional(),
  /** metres: the absorbing layer's thickness (a diffuser's depth) */
  thickness: z.number().finite().min(0).max(1.5),
  airGap: z.number().finite().min(0).max(1).optional(),
  /** Pa·s/m², for the porous model (default 36 000, the engine's PANEL_FLOW_RESISTIVITY) */
  flowResistivity: z.number().finite().min(1000).max(200_000).optional(),
  width: z.number().finite().gt(0, 'width must be more than 0 m').max(20),
  height: z.number().finite().gt(0, 'height must be more than 0 m').max(20),
  x: metres('x'),
  y: metres('y'),
  z: metres('z'),
  mounting: z.enum(treatmentMountings).optional(),
  label: z.string().trim().max(60).optional(),
  /** the snap target it was placed on, with the reason shown to the advisor */
  snap: z.object({ targetId: z.string().max(120), reason: z.string().max(1000) }).optional(),
  note: z.string().max(2000).default(''),
})
export type PlanTreatment = z.output<typeof planTreatmentSchema>
export type PlanTreatmentInput = z.input<typeof planTreatmentSchema>

export const planSpeakerMoveSchema = planPointSchema.extend({ label: z.string().trim().min(1).max(40) })

/**
 * Subwoofers the plan places (a layout of the subwoofer search, adopted as it is or edited): where
 * each stands and its relative level, 0 dB for the loudest. Predicted on its own (seat-to-seat
 * variation and spread before and after), beside the changes below.
 */
export const planSubwoofersSchema = z.object({
  positions: z.array(planPointSchema).min(1, 'place at least one subwoofer').max(4),
  gainsDb: z.array(z.number().finite().min(-30, 'a subwoofer turned down more than 30 dB is as good as off').max(0, 'levels are relative to the loudest: 0 dB or below')).max(4),
  note: z.string().max(2000).default(''),
})
export type PlanSubwoofers = z.output<typeof planSubwoofersSchema>

/** The content of one plan version. Change ids: 'seat', 'speakers', 'subwoofers' and each treatment's id. */
export const planBodySchema = z.object({
  /** where the main seat should go (null: stays) */
  seat: planPointSchema.nullable().default(null),
  seatNote: z.string().max(2000).default(''),
  /** new positions of the speakers that move (by label; others stay) */
  speakers: z.array(planSpeakerMoveSchema).max(16).default([]),
  speakersNote: z.string().max(2000).default(''),
  /** new positions of the subwoofers that move (by label; others stay) */
  subwoofers: z.array(planSpeakerMoveSchema).max(8).default([]),
  subwoofersNote: z.string().max(2000).default(''),
  treatments: z.array(planTreatmentSchema).max(60).default([]),
  /** markdown, shown to the listener */
  notes: z.string().max(20_000).default(''),
  /** the advisor's order of the changes (ids); empty: biggest effect first */
  order: z.array(z.string().max(40)).max(80).default([]),
  /** a subwoofer layout adopted from the subwoofer search (predicted on its own, not an ordered change) */
  subwooferLayout: planSubwoofersSchema.optional(),
})
export type PlanBody = z.output<typeof planBodySchema>
export type PlanBodyInput = z.input<typeof planBodySchema>

/** Checks against the room: ids unique, order names existing changes, speakers exist. */
export function planIssues(body: PlanBody, room: { length: number; width: number; height: number; speakers: { label: string }[]; subwoofers?: { label: string }[] }): { path: string; message: string }[] {
  const issues: { path: string; message: string }[] = []
  const ids = new Set<string>()
  body.treatments.forEach((t, i) => {
    if (ids.has(t.id) || t.id === 'seat' || t.id === 'speakers' || t.id === 'subwoofers') issues.push({ path: `treatments.${i}.id`, message: `the id "${t.id}" is used twice` })
    ids.add(t.id)
    if (t.x > room.length) issues.push({ path: `treatments.${i}.x`, message: `x = ${t.x} m lies beyond the length ${room.length} m` })
    if (t.y > room.width) issues.push({ path: `treatments.${i}.y`, message: `y = ${t.y} m lies beyond the width ${room.width} m` })
    if (t.z > room.height) issues.push({ path: `treatments.${i}.z`, message: `z = ${t.z} m lies above the height ${room.height} m` })
  })
  const labels = new Set(room.speakers.map((s) => s.label))
  body.speakers.forEach((s, i) => {
    if (!labels.has(s.label)) issues.push({ path: `speakers.${i}.label`, message: `the room has no speaker "${s.label}"` })
  })
  const subLabels = new Set((room.subwoofers ?? []).map((s) => s.label))
  body.subwoofers.forEach((s, i) => {
    if (!subLabels.has(s.label)) issues.push({ path: `subwoofers.${i}.label`, message: `the room has no subwoofer "${s.label}"` })
  })
  const points: [string, { x: number; y: number; z: number }][] = [
    ...(body.seat ? [['seat', body.seat] as [string, { x: number; y: number; z: number }]] : []),
    ...body.speakers.map((s, i) => [`speakers.${i}`, s] as [string, { x: number; y: number; z: number }]),
    ...body.subwoofers.map((s, i) => [`subwoofers.${i}`, s] as [string, { x: number; y: number; z: number }]),
  ]
  for (const [path, p] of points) {
    if (p.x > room.length) issues.push({ path: `${path}.x`, message: `x = ${p.x} m lies beyond the length ${room.length} m` })
    if (p.y > room.width) issues.push({ path: `${path}.y`, message: `y = ${p.y} m lies beyond the width ${room.width} m` })
    if (p.z > room.height) issues.push({ path: `${path}.z`, message: `z = ${p.z} m lies above the height ${room.height} m` })
  }
  if (body.subwooferLayout) {
    if (body.subwooferLayout.gainsDb.length !== body.subwooferLayout.positions.length) {
      issues.push({ path: 'subwooferLayout.gainsDb', message: `give one level per subwoofer (${body.subwooferLayout.positions.length})` })
    }
    body.subwooferLayout.positions.forEach((p, i) => {
      const path = `subwooferLayout.positions.${i}`
      if (p.x > room.length) issues.push({ path: `${path}.x`, message: `x = ${p.x} m lies beyond the length ${room.length} m` })
      if (p.y > room.width) issues.push({ path: `${path}.y`, message: `y = ${p.y} m lies beyond the width ${room.width} m` })
      if (p.z > room.height) issues.push({ path: `${path}.z`, message: `z = ${p.z} m lies above the height ${room.height} m` })
    })
  }
  const known = new Set(['seat', 'speakers', 'subwoofers', ...ids])
  body.order.forEach((id, i) => { if (!known.has(id)) issues.push({ path: `order.${i}`, message: `no change has the id "${id}"` }) })
  return issues
}

export const createPlanSchema = planBodySchema
export const sendPlanSchema = z.object({
  /** the case status the advisor last saw; another status answers 409 */
  fromStatus: caseStatusSchema,
  /** optional words for the e-mail above the list of changes (markdown) */
  message: z.string().max(4000).optional(),
})
export type SendPlanInput = z.infer<typeof sendPlanSchema>

export const previewPlanSchema = z.object({ caseId: z.string().uuid('name the case the plan is for'), plan: planBodySchema })
export type PreviewPlanInput = z.input<typeof previewPlanSchema>

export const planVersionParamsSchema = z.object({ version: z.coerce.number().int().min(1).max(100_000) })

import type { PlanPredictions } from '../plan/predict'

export type PlanStatus = 'draft' | 'sent'

/** One saved plan version as the API answers it. */
export interface PlanVersion {
  caseId: string
  version: number
  status: PlanStatus
  /** the room revision the plan was made for */
  roomId: string
  roomRevision: number
  body: PlanBody
  predictions: PlanPredictions
  engineVersion: string
  createdBy: { id: string; name: string } | null
  createdAt: string
  sentAt: string | null
  sentBy: { id: string; name: string } | null
}

/** A version in the list: what it is, without the figures. */
export interface PlanVersionSummary {
  version: number
  status: PlanStatus
  roomRevision: number
  createdBy: { id: string; name: string } | null
  createdAt: string
  sentAt: string | null
  /** changes in the plan (setup moves and treatments) */
  changeCount: number
  /** the newest version this caller may see (for a listener: the newest sent one) */
  current: boolean
}
