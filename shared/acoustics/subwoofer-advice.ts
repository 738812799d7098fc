/**
 * The subwoofer advice for a whole room description: the search over every seat with the room's own
 * reverberation (as the triage's modal response), and each layout's predicted response per seat.
 */
import { bandReverberation } from './reverberation'
import type { SubwooferLayout, SubwooferLayoutResponse, SubwooferSearchOptions } from './subwoofers'
import { searchSubwoofers, subwooferCandidates, subwooferLayoutResponse } from './subwoofers'
import type { LabelledPoint, RoomDescription } from './triage'
import type { Point, RoomBox } from './types'

export interface SubwooferAdviceLayout extends SubwooferLayout {
  /** the predicted level at each seat (1/6-octave smoothed), dB re the layout's mean over every seat */
  response: { seats: { label: string; smoothedDb: number[]; spreadDb: number }[] }
}

export interface SubwooferAdvice {
  bandHz: [number, number]
  freqsHz: number[]
  seats: LabelledPoint[]
  current: SubwooferAdviceLayout | null
  best: { count: number; layout: SubwooferAdviceLayout }[]
  /** how many candidate positions were searched */
  candidateCount: number
}

const r2 = (v: number) => Math.round(v * 100) / 100
const pt = (p: Point): Point => ({ x: p.x, y: p.y, z: p.z })

/**
 * Search 1, 2 and 4 subwoofers (or `counts`) for every seat of the room, with the modes damped by the
 * room's Eyring reverberation per band (as the triage's modal response), the room's own subwoofers as `current`.
 */
export function subwooferAdvice(desc: RoomDescription, opts: Pick<SubwooferSearchOptions, 'counts' | 'candidates'> = {}): SubwooferAdvice {
  const room: RoomBox = { length: desc.length, width: desc.width, height: desc.height }
  const celsius = desc.celsius ?? 20
  const reverberation = bandReverberation({ room, surfaces: desc.surfaces, openings: desc.openings, furnishings: desc.furnishings, treatments: desc.treatments, celsius })
  const rt60 = reverberation.bands.map((b) => ({ hz: b.hz, seconds: b.eyring }))
  const seats = desc.seats.map(pt)
  const base: SubwooferSearchOptions = { rt60, celsius }
  const subs = (desc.subwoofers ?? []).map(pt)
  const search = searchSubwoofers(room, seats, { ...base, counts: opts.counts, candidates: opts.candidates, current: subs.length ? subs : undefined })
  let freqsHz: number[] = []
  const withResponse = (l: SubwooferLayout): SubwooferAdviceLayout => {
    const r: SubwooferLayoutResponse = subwooferLayoutResponse(room, seats, l, base)
    freqsHz = r.freqsHz.map(r2)
    return {
      ...l,
      positions: l.positions.map((p) => ({ x: r2(p.x), y: r2(p.y), z: r2(p.z) })),
      seatToSeatDb: r2(l.seatToSeatDb),
      meanSpreadDb: r2(l.meanSpreadDb),
      response: { seats: r.seats.map((s, i) => ({ label: desc.seats[i].label, smoothedDb: s.smoothedDb.map(r2), spreadDb: r2(s.spreadDb) })) },
    }
  }
  const best = search.best.map((b) => ({ count: b.count, layout: withResponse(b.layout) }))
  return {
    bandHz: [20, 120],
    freqsHz,
    seats: desc.seats.map((s) => ({ label: s.label, ...pt(s) })),
    current: search.current ? withResponse(search.current) : null,
    best,
    candidateCount: opts.candidates?.length ?? subwooferCandidates(room).length,
  }
}
