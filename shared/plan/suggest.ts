import { computeRoomAnalysis } from '../acoustics'
import type { RoomAnalysis } from '../acoustics'
import { planBodySchema } from '../schemas/plan'
import type { PlanBody } from '../schemas/plan'
import type { PlanRoom } from './apply'
import { applyPlan } from './apply'
import { m } from './names'
import { PLAN_ANALYSIS_OPTIONS } from './predict'

type P3 = { x: number; y: number; z: number }

/** Moving the bass sources (all to one distance from the front wall, each keeping its y and height). */
export interface SourceMoveSuggestion {
  /** which sources move: the main speakers, or the subwoofers when the room has them (they carry the bass the engine models) */
  sources: 'speakers' | 'subwoofers'
  distanceFromFront: number
  /** the plan's own prediction of the main seat's peak-to-null spread with exactly these moves, dB */
  spreadDb: number
  /** today's spread at the main seat, dB */
  currentSpreadDb: number
  /** the new positions, ready for the plan's `speakers` or `subwoofers` list */
  moves: { label: string; x: number; y: number; z: number }[]
  /** where each moving source stands today */
  from: { label: string; x: number; y: number; z: number }[]
  reason: string
}

export interface SetupSuggestions {
  /** the engine's best seat on the centre line (keeps ear height), or null when it is no better than today */
  seat: { x: number; y: number; z: number; spreadDb: number; currentSpreadDb: number; from: P3; reason: string } | null
  /** the seat at 38 % of the length from the front wall, a usual starting point (common practice, no source) */
  seat38: { x: number; y: number; z: number; spreadDb: number; reason: string }
  /** the main speakers at the engine's best distance from the front wall; null when no better, or when the room has subwoofers (then see `subwoofers`) */
  speakers: SourceMoveSuggestion | null
  /** the subwoofers at the engine's best distance from the front wall; null without subwoofers or when no better */
  subwoofers: SourceMoveSuggestion | null
}

/** The main seat's spread the plan predicts for a body of changes (the same engine call as `predictPlan`). */
function predictedSpread(room: PlanRoom, body: Partial<PlanBody>): number {
  const full = planBodySchema.parse({ ...body })
  return computeRoomAnalysis(applyPlan(room, full), PLAN_ANALYSIS_OPTIONS).seat.modalResponse.spreadDb
}

const pt = (p: P3): P3 => ({ x: p.x, y: p.y, z: p.z })

/**
 * Seat and source positions from the engine's position search, as plan changes with their reason.
 * Each promised spread is the plan's own prediction for exactly that change (positions are not rounded,
 * so the suggestion, the search and the plan agree). In a room with subwoofers the search moves the
 * subwoofers (the engine's bass sources), and so does the suggestion.
 */
export function setupSuggestions(room: PlanRoom, analysis: RoomAnalysis, minGainDb = 0.5): SetupSuggestions {
  const ps = analysis.seat.positionSearch
  const currentSpreadDb = analysis.seat.modalResponse.spreadDb
  const seatNow = room.seats[0]

  const best = ps.seat.best.point
  const bestSpread = predictedSpread(room, { seat: pt(best) })
  const sideways = Math.abs(best.y - seatNow.y) >= 0.005
  const seat = currentSpreadDb - bestSpread >= minGainDb
    ? {
        ...pt(best), spreadDb: bestSpread, currentSpreadDb, from: pt(seatNow),
        reason: `Move the main seat from ${m(seatNow.x)} to ${m(best.x)} from the front wall${sideways ? ` and from ${m(seatNow.y)} to ${m(best.y)} from the left wall (onto the centre line)` : ''}: the engine's position search finds the smoothest bass there, a peak-to-dip spread of ${bestSpread.toFixed(1)} dB instead of ${currentSpreadDb.toFixed(1)} dB today.`,
      }
    : null

  const a38 = ps.seat.at38Percent.point
  const spread38 = predictedSpread(room, { seat: pt(a38) })
  const seat38 = {
    ...pt(a38), spreadDb: spread38,
    reason: `38 % of the length from the front wall (${m(a38.x)}), a usual starting point (common practice, no source): spread ${spread38.toFixed(1)} dB.`,
  }

  const subs = room.subwoofers ?? []
  const kind: 'speakers' | 'subwoofers' = subs.length ? 'subwoofers' : 'speakers'
  const movers = kind === 'subwoofers' ? subs : room.speakers
  const d = ps.speakers.best.distanceFromFront
  const moves = movers.map((s) => ({ label: s.label, x: d, y: s.y, z: s.z }))
  const moveSpread = predictedSpread(room, kind === 'subwoofers' ? { subwoofers: moves } : { speakers: moves })
  const noun = kind === 'subwoofers' ? (movers.length === 1 ? 'subwoofer' : 'subwoofers') : (movers.length === 1 ? 'speaker' : 'speakers')
  const fromWords = movers.map((s) => `${s.label} from ${m(s.x)}`).join(', ')
  const source: SourceMoveSuggestion | null = currentSpreadDb - moveSpread >= minGainDb
    ? {
        sources: kind, distanceFromFront: d, spreadDb: moveSpread, currentSpreadDb, moves,
        from: movers.map((s) => ({ label: s.label, x: s.x, y: s.y, z: s.z })),
        reason: `Move the ${noun} (${fromWords}) to ${m(d)} from the front wall, each keeping its distance from the left wall and its height: the engine predicts a bass spread at the seat of ${moveSpread.toFixed(1)} dB instead of ${currentSpreadDb.toFixed(1)} dB today.`,
      }
    : null
  return { seat, seat38, speakers: kind === 'speakers' ? source : null, subwoofers: kind === 'subwoofers' ? source : null }
}
