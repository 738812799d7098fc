import { countOf } from './counts'

/** The listener's home page, below the cases: each case page keeps the live account of its measurements. */
export const measurementHomeHint = 'Measurements help your advisor a lot. Each case page says what it has received and what is still worth sending.'

/** What the listener's case page knows of one measurement file: its name and, once analysed, what it held. */
export interface MeasurementSeen {
  name: string
  status: 'queued' | 'running' | 'done' | 'failed' | null
  /** from the analysis once done */
  kind?: 'impulse-response' | 'frequency-response'
  /** the channel labels of an analysed impulse response ('left', 'right', 'mono') */
  channels?: readonly string[]
}

/**
 * The measurement hint of the listener's case page: `received` says what the case holds (null when
 * nothing yet), `next` what is still worth sending. `state` names the situation for the page's look.
 */
export interface MeasurementHint {
  state: 'none' | 'waiting' | 'partial' | 'enough' | 'unreadable'
  received: string | null
  next: string
}

/** A side named in the file name, as the measuring guide suggests (`…_left.wav`, `…-right.txt`, `…_both.wav`). */
const named = (name: string, word: string) => new RegExp(`(^|[^a-z])${word}([^a-z]|$)`, 'i').test(name)

function kindOf(file: MeasurementSeen): 'impulse-response' | 'frequency-response' | null {
  if (file.kind) return file.kind
  if (/\.(wav|wave)$/i.test(file.name)) return 'impulse-response'
  if (/\.(txt|csv|tsv)$/i.test(file.name)) return 'frequency-response'
  return null
}

/**
 * What to tell the listener about their measurements, from the case's measurement files. Read by the
 * listener, so second person. The advice follows the measuring guide: an impulse response (WAV) of
 * each speaker alone from the same spot is what helps most; a frequency response lacks the timing.
 */
export function measurementHint(files: readonly MeasurementSeen[]): MeasurementHint {
  if (files.length === 0) {
    return { state: 'none', received: null, next: 'A measurement from your seat helps your advisor most: an impulse response of each speaker, saved as WAV.' }
  }
  const analysed = files.filter((f) => f.status === 'done').length
  const pending = files.filter((f) => f.status === 'queued' || f.status === 'running').length
  const failed = files.filter((f) => f.status === 'failed').length
  const parts = [analysed && `${analysed} analysed`, pending && `${pending} being analysed`, failed && `${failed} could not be read`].filter(Boolean)
  const received = `Received: ${countOf(files.length, 'measurement')}${parts.length ? ` (${parts.join(', ')})` : ''}.`

  const readable = files.filter((f) => f.status !== 'failed')
  if (readable.length === 0) {
    return { state: 'unreadable', received, next: 'None of your measurements could be read: the reason is under each file below. Export each file again as the measuring guide describes and send it once more.' }
  }
  const impulses = readable.filter((f) => kindOf(f) === 'impulse-response')
  if (impulses.length === 0) {
    return {
      state: 'partial',
      received,
      next: 'Still worth sending: an impulse response as WAV, if your program can save one. It also shows how long the room rings and where reflections come from, which a frequency response cannot.',
    }
  }
  const covers = (side: 'left' | 'right') => impulses.some((f) => f.channels?.includes(side) || named(f.name, side))
  const missing = (['left', 'right'] as const).filter((side) => !covers(side))
  if (missing.length === 0) {
    return { state: 'enough', received, next: 'That is what your advisor needs for now. After you change something in the room, measure again from the same spot so the two can be compared.' }
  }
  // a WAV still being analysed may be stereo (left and right in one file): wait for it before asking for more
  if (impulses.some((f) => f.status !== 'done' && !f.channels)) {
    return { state: 'waiting', received, next: 'The plots appear below once the analysis is done, usually within a minute; this note then says whether anything else is worth sending.' }
  }
  if (missing.length === 2) {
    return { state: 'partial', received, next: 'Still worth sending: each speaker alone, left and then right, from the same microphone spot, with the side in the file name.' }
  }
  return { state: 'partial', received, next: `Still worth sending: the ${missing[0]} speaker alone, from the same microphone spot, so your advisor can compare the two sides.` }
}
