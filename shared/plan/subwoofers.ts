/**
 * A plan's subwoofer item: the seat-to-seat variation and spread at every seat with today's bass
 * sources and with the plan's subwoofers, by the same modal evaluation as the subwoofer search.
 */
import { bandReverberation, subwooferLayoutResponse } from '../acoustics'
import type { PlanSubwoofers } from '../schemas/plan'
import type { PlanRoom } from './apply'

export interface SubwooferFigures {
  seatToSeatDb: number
  meanSpreadDb: number
}

export interface SubwooferItemPrediction {
  /** what plays the bass today: the room's subwoofers, else its speakers (in phase, equal level) */
  beforeSources: 'subwoofers' | 'speakers'
  before: SubwooferFigures
  after: SubwooferFigures
  bandHz: [number, number]
  freqsHz: number[]
  /** per seat, smoothed level dB (re each layout's own mean over every seat) and spread */
  seats: { label: string; beforeDb: number[]; afterDb: number[]; spreadBeforeDb: number; spreadAfterDb: number }[]
}

const r2 = (v: number) => Math.round(v * 100) / 100

/** Today's room's reverberation (the plan's treatments aside) damps the modes in both states. */
export function predictSubwooferItem(room: PlanRoom, item: PlanSubwoofers): SubwooferItemPrediction {
  const box = { length: room.length, width: room.width, height: room.height }
  const celsius = room.celsius ?? 20
  const rt = bandReverberation({ room: box, surfaces: room.surfaces, openings: room.openings, furnishings: room.furnishings, treatments: room.treatments, celsius })
  const opts = { rt60: rt.bands.map((b) => ({ hz: b.hz, seconds: b.eyring })), celsius }
  const seats = room.seats.map((s) => ({ x: s.x, y: s.y, z: s.z }))
  const subs = room.subwoofers ?? []
  const beforeSources = subs.length ? 'subwoofers' : 'speakers'
  const today = (subs.length ? subs : room.speakers).map((s) => ({ x: s.x, y: s.y, z: s.z }))
  const b = subwooferLayoutResponse(box, seats, { positions: today }, opts)
  const a = subwooferLayoutResponse(box, seats, { positions: item.positions.map((p) => ({ x: p.x, y: p.y, z: p.z })), gainsDb: item.gainsDb }, opts)
  return {
    beforeSources,
    before: { seatToSeatDb: r2(b.seatToSeatDb), meanSpreadDb: r2(b.meanSpreadDb) },
    after: { seatToSeatDb: r2(a.seatToSeatDb), meanSpreadDb: r2(a.meanSpreadDb) },
    bandHz: a.bandHz,
    freqsHz: a.freqsHz.map(r2),
    seats: room.seats.map((s, i) => ({
      label: s.label,
      beforeDb: b.seats[i].smoothedDb.map(r2),
      afterDb: a.seats[i].smoothedDb.map(r2),
      spreadBeforeDb: r2(b.seats[i].spreadDb),
      spreadAfterDb: r2(a.seats[i].spreadDb),
    })),
  }
}
