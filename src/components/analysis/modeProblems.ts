import type { ModeAnalysis, RoomMode } from '../../../shared/acoustics'
import { hz, modeIndices, modeKey } from './format'

export interface ModeNote {
  problem: boolean
  notes: string[]
}

/**
 * What the engine's mode analysis says about each mode, keyed by its indices: membership of a
 * coincidence group (a problem when an axial mode is in it) and the axial gaps it borders.
 */
export function modeNotes(analysis: ModeAnalysis): Map<string, ModeNote> {
  const notes = new Map<string, ModeNote>()
  const note = (n: readonly [number, number, number]) => {
    let entry = notes.get(modeKey(n))
    if (!entry) notes.set(modeKey(n), (entry = { problem: false, notes: [] }))
    return entry
  }
  for (const group of analysis.coincidences) {
    for (const mode of group.modes) {
      const others = group.modes.filter((m) => m !== mode).map((m) => `${modeIndices(m.n)} (${hz(m.hz)})`)
      const entry = note(mode.n)
      entry.notes.push(`stacks with ${others.join(', ')}`)
      if (group.axialCount > 0) entry.problem = true
    }
  }
  for (const gap of analysis.axialGaps.gaps) {
    if (gap.verdict === 'ok') continue
    const text = gap.verdict === 'wide' ? `${hz(gap.gapHz)} gap to the next axial mode` : `only ${hz(gap.gapHz)} from the next axial mode`
    const low = note(gap.low)
    low.notes.push(text)
    low.problem = true
    const high = note(gap.high)
    high.notes.push(gap.verdict === 'wide' ? `${hz(gap.gapHz)} gap below it` : `only ${hz(gap.gapHz)} above the last axial mode`)
    high.problem = true
  }
  return notes
}

export const isProblem = (notes: Map<string, ModeNote>, mode: RoomMode) => notes.get(modeKey(mode.n))?.problem ?? false
