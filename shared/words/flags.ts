// type only: the words must not pull the engine into every page that names a flag
import type { SETUP_FLAG_IDS } from '../acoustics/setup-flags'

export type FlagId = (typeof SETUP_FLAG_IDS)[number]

/**
 * Plain names for the engine's setup-flag ids: the one source the queue filter and chips, the triage,
 * the case workspace, the composer, the supervisor dashboard and e-mails read.
 */
export const flagLabels: Record<FlagId, string> = {
  'seat-in-front-of-speakers': 'Seat in front of the speakers',
  'seat-at-room-centre': 'Seat at the room centre',
  'near-square-plan': 'Near-square floor plan',
  'dimension-multiples': 'Room dimensions in simple ratios',
  'coincident-low-modes': 'Low room modes bunched together',
  'speakers-asymmetric': 'Speakers placed unevenly',
  'seat-off-centreline': 'Seat off the centre line',
  'seat-near-wall': 'Seat close to a wall',
  'speaker-spacing-vs-listening-distance': 'Speaker spacing vs. listening distance',
  'speaker-too-close-to-boundary': 'Speaker close to a wall',
  'rear-port-near-wall': 'Rear port close to a wall',
  'opening-in-reflection-zone': 'Opening at a reflection point',
  'opening-asymmetry': 'Openings on one side only',
  'one-sided-corner-treatment': 'Corner treatment on one side only',
  'untreated-first-reflections': 'Untreated first reflections',
  'seat-at-mode-null': 'Seat in a bass null',
  'speaker-height-vs-ear': 'Tweeter height vs. ear height',
  'facing-long-wall': 'Speakers on the long wall',
}

/** A flag's name; an id this version does not know (stored by an older engine) reads as its words. */
export function flagLabel(id: string): string {
  if (id in flagLabels) return flagLabels[id as FlagId]
  const words = id.replace(/-/g, ' ')
  return words.charAt(0).toUpperCase() + words.slice(1)
}

/** The same name inside a sentence: "It clears: seat close to a wall." */
export function flagInSentence(id: string): string {
  const label = flagLabel(id)
  return label.charAt(0).toLowerCase() + label.slice(1)
}

export type Severity = 'info' | 'warning' | 'problem'

/** How serious a flag is, in words (shown beside its icon and colour, never by colour alone). */
export const severityLabels: Record<Severity, string> = {
  problem: 'Problem',
  warning: 'Worth a look',
  info: 'Note',
}

export function severityOf(value: string): Severity {
  return value === 'problem' || value === 'warning' ? value : 'info'
}

/** "Worth a look: Seat close to a wall". */
export const flagTitle = (flag: { id: string; severity: string }): string => `${severityLabels[severityOf(flag.severity)]}: ${flagLabel(flag.id)}`
