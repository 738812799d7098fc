import type { RoomAnalysis } from '../acoustics'
import type { PlanRoom } from './apply'
import { m } from './names'

export interface SetupSuggestions {
  /** the engine's best seat on the centre line (keeps ear height), or null when it is no better than today */
  seat: { x: number; y: number; z: number; spreadDb: number; currentSpreadDb: number; reason: string } | null
  /** the seat at 38 % of the length from the front wall, a usual starting point (common practice, no source) */
  seat38: { x: number; y: number; z: number; spreadDb: number; reason: string }
  /** all speakers at the engine's best distance from the front wall, or null when no better */
  speakers: { distanceFromFront: number; spreadDb: number; currentSpreadDb: number; moves: { label: string; x: number; y: number; z: number }[]; reason: string } | null
}

/** Seat and speaker positions from the engine's position search, as plan changes with their reason. */
export function setupSuggestions(room: PlanRoom, analysis: RoomAnalysis, minGainDb = 0.5): SetupSuggestions {
  const ps = analysis.seat.positionSearch
  const best = ps.seat.best
  const cur = ps.seat.current
  const r2 = (v: number) => Math.round(v * 100) / 100
  const seat = cur.spreadDb - best.spreadDb >= minGainDb
    ? {
        x: r2(best.point.x), y: r2(best.point.y), z: r2(best.point.z), spreadDb: best.spreadDb, currentSpreadDb: cur.spreadDb,
        reason: `The engine's position search finds the smoothest bass on the centre line ${m(best.point.x)} from the front wall: a peak-to-dip spread of ${best.spreadDb.toFixed(1)} dB instead of ${cur.spreadDb.toFixed(1)} dB today.`,
      }
    : null
  const a38 = ps.seat.at38Percent
  const seat38 = {
    x: r2(a38.point.x), y: r2(a38.point.y), z: r2(a38.point.z), spreadDb: a38.spreadDb,
    reason: `38 % of the length from the front wall (${m(a38.point.x)}), a usual starting point (common practice, no source): spread ${a38.spreadDb.toFixed(1)} dB.`,
  }
  const sb = ps.speakers.best
  const sc = ps.speakers.current
  const speakers = sc.spreadDb - sb.spreadDb >= minGainDb
    ? {
        distanceFromFront: r2(sb.distanceFromFront), spreadDb: sb.spreadDb, currentSpreadDb: sc.spreadDb,
        moves: room.speakers.map((s) => ({ label: s.label, x: r2(sb.distanceFromFront), y: s.y, z: s.z })),
        reason: `With the speakers ${m(sb.distanceFromFront)} from the front wall the engine predicts a bass spread at the seat of ${sb.spreadDb.toFixed(1)} dB instead of ${sc.spreadDb.toFixed(1)} dB.`,
      }
    : null
  return { seat, seat38, speakers }
}
