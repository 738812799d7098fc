import type { Reflection, RoomAnalysis } from '../acoustics'

/** The engine's Reflection plus which speaker–seat pair it belongs to; second-order entries name both surfaces. */
export type TriageReflection = Reflection & { order: 1 | 2; speaker: string; seat: string; inWindow: boolean; surfaces?: [string, string] }

/** What GET /api/cases/:id/triage answers: the engine's output for one room revision, stored with the engine's version. */
export interface TriageSnapshot {
  engineVersion: string
  roomRevision: number
  room: RoomAnalysis['room']
  modes: RoomAnalysis['modes']
  modeAnalysis: RoomAnalysis['modeAnalysis']
  /** every first- and second-order reflection per speaker–seat pair, flagged against the window */
  reflections: TriageReflection[]
  reflectionWindow: RoomAnalysis['reflectionWindow']
  /** the same reflections grouped per pair, as the engine gives them (what the display components take) */
  reflectionPairs: RoomAnalysis['reflections']
  notches: RoomAnalysis['notches']
  reverberation: RoomAnalysis['reverberation']
  flags: RoomAnalysis['flags']
  seat: RoomAnalysis['seat']
  score: number
  scoreParts: { label: string; points: number }[]
  computedAt: string
}

export function flattenReflections(pairs: RoomAnalysis['reflections']): TriageReflection[] {
  const out: TriageReflection[] = []
  for (const p of pairs) {
    for (const r of p.first) out.push({ surface: r.surface, point: r.point, pathLength: r.pathLength, delayMs: r.delayMs, levelDb: r.levelDb, order: 1, speaker: p.speaker, seat: p.seat, inWindow: r.inWindow })
    for (const r of p.second) out.push({ surface: r.surfaces[1], surfaces: r.surfaces, point: r.points[1], pathLength: r.pathLength, delayMs: r.delayMs, levelDb: r.levelDb, order: 2, speaker: p.speaker, seat: p.seat, inWindow: r.inWindow })
  }
  return out
}

/** One line of a case's triage history: the figures an advisor compares between room revisions. */
export interface TriageHistoryEntry {
  roomRevision: number
  computedAt: string
  engineVersion: string
  score: number
  flags: { id: string; severity: string }[]
  /** Eyring RT at 500 Hz, s */
  rt500: number | null
  /** peak-to-null spread of the smoothed modal response at the main seat, dB */
  seatSpreadDb: number | null
  /** first- and second-order reflections inside the window, all pairs */
  reflectionsInWindow: number
}
