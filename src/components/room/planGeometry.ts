import type { Surface } from '../../../shared/acoustics'
import { surfaceWords } from '../../../shared/plan/names'

/** Drawing units per view: the longer side of the drawn rectangle gets this many. */
export const PLAN_SPAN = 360
export const ELEVATION_SPAN = 300

/** Snaps a position to whole centimetres and keeps it inside [margin, size − margin]. */
export function snapInside(metres: number, size: number, margin = 0.01): number {
  const snapped = Math.round(metres * 100) / 100
  return Math.min(Math.max(snapped, margin), Math.max(margin, Math.round((size - margin) * 100) / 100))
}

/** The surfaces' names: the plan's own words, so the room editor and the plan say the same. */
export const surfaceNames: Record<Surface, string> = surfaceWords

export const openingNames: Record<string, string> = {
  door: 'door',
  window: 'window',
  fireplace: 'fireplace',
  'open-shelving': 'open shelving',
  alcove: 'alcove or bay',
  'open-doorway': 'open doorway',
}

export const treatmentNames: Record<string, string> = {
  panel: 'absorbing panel',
  'bass-trap': 'bass trap',
  'corner-trap': 'corner trap',
  cloud: 'ceiling cloud',
  diffuser: 'diffuser',
  rug: 'rug',
  curtain: 'curtain',
}

export const speakerKindNames: Record<string, string> = {
  sealed: 'Sealed box',
  'ported-front': 'Port at the front',
  'ported-rear': 'Port at the back',
  'open-baffle': 'Open baffle (no box)',
  other: 'Other or not sure',
}
