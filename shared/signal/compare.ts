/**
 * Comparisons between measurements: left speaker against right speaker at the same
 * seat, and before against after a change from the same position.
 */
import { round } from './decay'
import type { MeasurementAnalysis } from './analyze'

/**
 * Left/right level difference worth flagging per one-third-octave band: 3 dB from
 * 300 Hz up, 6 dB below, where room modes make the two speakers differ anyway.
 * Common practice, no source.
 */
export const LEFT_RIGHT_THRESHOLDS = { splitHz: 300, belowDb: 6, aboveDb: 3 } as const

export interface LeftRightComparison {
  thresholds: { splitHz: number; belowDb: number; aboveDb: number }
  bands: { centerHz: number; leftDb: number; rightDb: number; differenceDb: number; flagged: boolean }[]
  flaggedCount: number
  /** median left − right over the bands, dB: an overall gain difference rather than a room effect */
  medianDifferenceDb: number
}

type WithBands = Pick<MeasurementAnalysis, 'thirdOctaveLevels'>

/** Level difference left − right per one-third-octave band present in both. */
export function compareLeftRight(left: WithBands, right: WithBands, thresholds: Partial<LeftRightComparison['thresholds']> = {}): LeftRightComparison {
  const t = { ...LEFT_RIGHT_THRESHOLDS, ...thresholds }
  const rightByHz = new Map(right.thirdOctaveLevels.map((b) => [b.centerHz, b.levelDb]))
  const bands = left.thirdOctaveLevels
    .filter((b) => rightByHz.has(b.centerHz))
    .map((b) => {
      const rightDb = rightByHz.get(b.centerHz) as number
      const differenceDb = round(b.levelDb - rightDb, 2)
      const limit = b.centerHz < t.splitHz ? t.belowDb : t.aboveDb
      return { centerHz: b.centerHz, leftDb: b.levelDb, rightDb, differenceDb, flagged: Math.abs(differenceDb) > limit }
    })
  const sorted = bands.map((b) => b.differenceDb).sort((a, b) => a - b)
  const mid = sorted.length / 2
  const median = sorted.length === 0 ? 0 : sorted.length % 2 ? sorted[Math.floor(mid)] : (sorted[mid - 1] + sorted[mid]) / 2
  return { thresholds: t, bands, flaggedCount: bands.filter((b) => b.flagged).length, medianDifferenceDb: round(median, 2) }
}

export interface BeforeAfterComparison {
  /** per octave band: figures before and after, and after − before (s), null where either is null */
  bands: {
    centerHz: number
    before: { edt: number | null; t20: number | null; t30: number | null }
    after: { edt: number | null; t20: number | null; t30: number | null }
    change: { edt: number | null; t20: number | null; t30: number | null }
  }[]
  /** after − before per one-third-octave band, dB */
  thirdOctave: { centerHz: number; beforeDb: number; afterDb: number; changeDb: number }[]
  lowFrequencySpreadDb: { before: number; after: number }
  /** reflections inside the reflection window */
  reflectionsInWindow: { before: number; after: number }
  /** shift of the direct sound's arrival; more than about 0.3 ms hints the microphone or the timing moved */
  directSoundShiftMs: number
}

/** Compares two analyses of measurements from the same position (e.g. before and after treatment). */
export function compareBeforeAfter(before: MeasurementAnalysis, after: MeasurementAnalysis): BeforeAfterComparison {
  const diff = (a: number | null, b: number | null) => (a === null || b === null ? null : round(b - a, 4))
  const afterBands = new Map(after.bands.map((b) => [b.centerHz, b]))
  const pick = (b: { edt: number | null; t20: number | null; t30: number | null }) => ({ edt: b.edt, t20: b.t20, t30: b.t30 })
  const bands = before.bands
    .filter((b) => afterBands.has(b.centerHz))
    .map((b) => {
      const a = afterBands.get(b.centerHz)!
      return { centerHz: b.centerHz, before: pick(b), after: pick(a), change: { edt: diff(b.edt, a.edt), t20: diff(b.t20, a.t20), t30: diff(b.t30, a.t30) } }
    })
  const afterThirds = new Map(after.thirdOctaveLevels.map((b) => [b.centerHz, b.levelDb]))
  const thirdOctave = before.thirdOctaveLevels
    .filter((b) => afterThirds.has(b.centerHz))
    .map((b) => ({ centerHz: b.centerHz, beforeDb: b.levelDb, afterDb: afterThirds.get(b.centerHz)!, changeDb: round(afterThirds.get(b.centerHz)! - b.levelDb, 2) }))
  return {
    bands,
    thirdOctave,
    lowFrequencySpreadDb: { before: before.lowFrequency.spreadDb, after: after.lowFrequency.spreadDb },
    reflectionsInWindow: { before: before.reflections.filter((r) => r.inWindow).length, after: after.reflections.filter((r) => r.inWindow).length },
    directSoundShiftMs: round(after.directSoundMs - before.directSoundMs, 4),
  }
}
