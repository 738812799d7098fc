import type { BoundaryNotch, BoundaryResponse } from './boundaries'
import { boundaryNotches, boundaryResponse } from './boundaries'
import { getMaterial, materialForOpening } from './materials'
import type { ModalResponse, ModeAnalysis, RoomMode } from './modes'
import { analyzeModes, buildModalSystem, modalPower, modalResponseFromPower, modePositionClass, modePressure, roomModes } from './modes'
import type { PositionSearch } from './position-search'
import { searchPositionsWithSystem } from './position-search'
import type { Reflection, ReflectionPanel, ReflectionWindow, SecondOrderReflection } from './reflections'
import { DEFAULT_REFLECTION_WINDOW, firstReflections, inReflectionWindow, reflectionPanel, secondOrderReflections } from './reflections'
import type { ReverberationAnalysis } from './reverberation'
import { bandReverberation, midBandAlpha, treatmentAlpha } from './reverberation'
import type { SetupFlag } from './setup-flags'
import { setupFlags } from './setup-flags'
import type { Furnishing, Opening, Point, RoomBox, Surface, Treatment } from './types'
import { distance, inPlaneAxes, pointCoords, roomSurfaceArea, roomVolume, treatmentSize, treatmentSurface } from './types'
import { speedOfSound } from './units'
import { assertCelsius, assertPointInRoom, assertRoom } from './validate'

/** Version of the engine's formulas and output shape; stored beside every snapshot. */
export const ENGINE_VERSION = '1.2.1'

export interface LabelledPoint extends Point {
  label: string
}

/** A whole room description, metres in the room frame of ENGINE.md. */
export interface RoomDescription {
  length: number
  width: number
  height: number
  /** air temperature, °C (default 20) */
  celsius?: number
  speakers: (LabelledPoint & { kind?: string })[]
  /** optional subwoofers; when present they are the bass sources of the modal response and the search */
  subwoofers?: (LabelledPoint & { kind?: string })[]
  /** the first seat is the main seat */
  seats: LabelledPoint[]
  openings?: Opening[]
  /** material id per surface */
  surfaces: Record<Surface, string>
  furnishings?: Furnishing[]
  treatments?: Treatment[]
}

export interface AnalysisOptions {
  /** the reflection window (default 20 ms, −20 dB) */
  reflectionWindow?: Partial<ReflectionWindow>
  /** seat positions in the search (default 200) */
  seatPositions?: number
  /** also search across the room with this many positions per row (default 0) */
  acrossPositions?: number
  /** the listener's units for lengths in the setup-flag messages (default 'metric') */
  units?: 'metric' | 'imperial'
}

/** Where a reflection meets its surface and what it meets there. */
export interface ReflectionSurfaceHit {
  /** 'surface': the surface's own material; 'treatment' or 'opening' when the point falls on one */
  via: 'surface' | 'treatment' | 'opening'
  materialId: string | null
  /** mid-band (500 Hz–2 kHz) absorption coefficient used for the level, capped at 0.99 */
  alpha: number
}

export interface FirstReflectionEntry extends Reflection {
  inWindow: boolean
  hit: ReflectionSurfaceHit
  /** where a panel would catch this reflection for the seat and its head movement */
  panel: ReflectionPanel
}

export interface SecondReflectionEntry extends SecondOrderReflection {
  inWindow: boolean
  alphas: [number, number]
}

export interface PairReflections {
  speaker: string
  seat: string
  /** metres */
  directLength: number
  /** ms, direct sound travel time */
  directMs: number
  first: FirstReflectionEntry[]
  /** sorted by delay */
  second: SecondReflectionEntry[]
  /** reflections of both orders inside the window */
  inWindowCount: number
}

export interface SpeakerBoundaries {
  speaker: string
  point: Point
  notches: BoundaryNotch[]
  /** combined response of the nearest three surfaces, 20–500 Hz */
  response: BoundaryResponse
}

export interface SeatAnalysis {
  label: string
  point: Point
  /** labels of the sources used for the low-frequency figures */
  bassSources: string[]
  /** what those sources are: the subwoofers when the room has any, else the main speakers; the position search moves these */
  bassSourceKind: 'speakers' | 'subwoofers'
  /** modes below 150 Hz with the seat's relative pressure on each (−1…1) */
  lowModes: (RoomMode & { pressure: number; position: 'null' | 'peak' | 'between' })[]
  modalResponse: ModalResponse
  positionSearch: PositionSearch
}

export interface RoomAnalysis {
  engineVersion: string
  room: { length: number; width: number; height: number; volumeM3: number; surfaceAreaM2: number; celsius: number; speedOfSound: number }
  /** modes listed up to max(300 Hz, 2 × Schroeder frequency) */
  modesMaxHz: number
  modes: RoomMode[]
  modeAnalysis: ModeAnalysis
  reflectionWindow: ReflectionWindow
  /** one entry per speaker–seat pair */
  reflections: PairReflections[]
  /** one entry per speaker (subwoofers after the speakers) */
  notches: SpeakerBoundaries[]
  reverberation: ReverberationAnalysis
  flags: SetupFlag[]
  seat: SeatAnalysis
}

function inside(surface: Surface, p: Point, centre: readonly (number | undefined)[], w: number, h: number): boolean {
  const [ua, va] = inPlaneAxes(surface)
  if (centre[ua] === undefined || centre[va] === undefined) return false
  const pc = pointCoords(p)
  return Math.abs(pc[ua] - (centre[ua] as number)) <= w / 2 + 1e-12 && Math.abs(pc[va] - (centre[va] as number)) <= h / 2 + 1e-12
}

/** What a reflection meets at a point: a treatment, an opening, or the surface's own material. */
function surfaceHit(desc: RoomDescription, surface: Surface, p: Point, alphaOf: (t: Treatment) => (number | null)[]): ReflectionSurfaceHit {
  for (const t of desc.treatments ?? []) {
    if (treatmentSurface(t) !== surface) continue
    const { widthM, heightM } = treatmentSize(t)
    if (!inside(surface, p, [t.x, t.y, t.z], widthM, heightM)) continue
    const alpha = alphaOf(t)
    if (alpha.every((a) => a === null)) continue
    return { via: 'treatment', materialId: t.materialId ?? null, alpha: Math.min(0.99, midBandAlpha(alpha)) }
  }
  for (const o of desc.openings ?? []) {
    if (o.wall !== surface) continue
    const along = surface === 'front' || surface === 'back' ? p.y : p.x
    if (along < o.from || along > o.to || p.z < o.bottom || p.z > o.top) continue
    const id = materialForOpening(o.kind)
    if (!id) continue
    return { via: 'opening', materialId: id, alpha: Math.min(0.99, midBandAlpha(getMaterial(id).alpha)) }
  }
  const id = desc.surfaces[surface]
  return { via: 'surface', materialId: id, alpha: Math.min(0.99, midBandAlpha(getMaterial(id).alpha)) }
}

function validateDescription(desc: RoomDescription): void {
  if (desc === null || typeof desc !== 'object') throw new RangeError('room description must be an object')
  assertRoom(desc)
  if (desc.celsius !== undefined) assertCelsius(desc.celsius)
  if (!Array.isArray(desc.speakers) || desc.speakers.length === 0) throw new RangeError('the room needs at least one speaker')
  if (!Array.isArray(desc.seats) || desc.seats.length === 0) throw new RangeError('the room needs at least one seat')
  desc.speakers.forEach((s, i) => assertPointInRoom(desc, s, `speaker '${s.label ?? i + 1}'`))
  ;(desc.subwoofers ?? []).forEach((s, i) => assertPointInRoom(desc, s, `subwoofer '${s.label ?? i + 1}'`))
  desc.seats.forEach((s, i) => assertPointInRoom(desc, s, `seat '${s.label ?? i + 1}'`))
  ;(desc.treatments ?? []).forEach((t, i) => {
    if (t.x !== undefined && t.y !== undefined && t.z !== undefined) assertPointInRoom(desc, { x: t.x, y: t.y, z: t.z }, `treatment ${i + 1} centre`)
  })
}

const pt = (p: Point): Point => ({ x: p.x, y: p.y, z: p.z })

/**
 * The complete engine output for a room: modes, their analysis, reflections of first and second order
 * per speaker–seat pair, boundary notches per speaker, reverberation per band with targets, setup
 * flags, and the main seat's modal response and position search. Pure and deterministic.
 */
export function computeRoomAnalysis(desc: RoomDescription, opts: AnalysisOptions = {}): RoomAnalysis {
  validateDescription(desc)
  const room: RoomBox = { length: desc.length, width: desc.width, height: desc.height }
  const celsius = desc.celsius ?? 20
  const c = speedOfSound(celsius)
  const window: ReflectionWindow = { ...DEFAULT_REFLECTION_WINDOW, ...opts.reflectionWindow }

  const reverberation = bandReverberation({
    room, surfaces: desc.surfaces, openings: desc.openings, furnishings: desc.furnishings, treatments: desc.treatments, celsius,
  })
  const modesMaxHz = Math.max(300, 2 * reverberation.schroederHz)
  const modes = roomModes(room, { maxHz: modesMaxHz, celsius })
  const modeAnalysis = analyzeModes(room, { celsius })

  const alphaCache = new Map<Treatment, (number | null)[]>()
  const alphaOf = (t: Treatment) => {
    let a = alphaCache.get(t)
    if (!a) { a = treatmentAlpha(t, celsius); alphaCache.set(t, a) }
    return a
  }
  const reflections: PairReflections[] = []
  for (const s of desc.speakers) {
    for (const r of desc.seats) {
      const directLength = distance(s, r)
      if (directLength === 0) throw new RangeError(`speaker '${s.label}' and seat '${r.label}' are at the same point`)
      const first = firstReflections(room, s, r, { celsius }).map((ref) => {
        const hit = surfaceHit(desc, ref.surface, ref.point, alphaOf)
        const levelDb = ref.levelDb + 10 * Math.log10(1 - hit.alpha)
        const e = { ...ref, levelDb }
        return { ...e, inWindow: inReflectionWindow(e, window), hit, panel: reflectionPanel(room, s, r, ref.surface) }
      })
      const second = secondOrderReflections(room, s, r, { celsius }).map((ref) => {
        const alphas = ref.surfaces.map((sf, k) => surfaceHit(desc, sf, ref.points[k], alphaOf).alpha) as [number, number]
        const levelDb = ref.levelDb + alphas.reduce((acc, a) => acc + 10 * Math.log10(1 - a), 0)
        const e = { ...ref, levelDb }
        return { ...e, inWindow: inReflectionWindow(e, window), alphas }
      })
      reflections.push({
        speaker: s.label, seat: r.label, directLength, directMs: (directLength / c) * 1000, first, second,
        inWindowCount: first.filter((f) => f.inWindow).length + second.filter((f) => f.inWindow).length,
      })
    }
  }

  const sources = [...desc.speakers, ...(desc.subwoofers ?? [])]
  const notches: SpeakerBoundaries[] = sources.map((s) => ({
    speaker: s.label,
    point: pt(s),
    notches: boundaryNotches(room, s, { celsius }),
    response: boundaryResponse(room, s, { celsius }),
  }))

  const flags = setupFlags({
    room,
    speakers: desc.speakers.map(pt),
    seats: desc.seats.map(pt),
    openings: desc.openings,
    treatments: desc.treatments,
    subwoofers: (desc.subwoofers ?? []).map(pt),
    speakerKinds: desc.speakers.map((s) => s.kind),
    speakerLabels: desc.speakers.map((s) => s.label),
    celsius,
    units: opts.units,
  })

  const main = desc.seats[0]
  const bass = desc.subwoofers && desc.subwoofers.length ? desc.subwoofers : desc.speakers
  const rt60 = reverberation.bands.map((b) => ({ hz: b.hz, seconds: b.eyring }))
  const sys = buildModalSystem(room, { rt60, celsius })
  const power = modalPower(sys, bass.map(pt), pt(main))
  const modalResponse = modalResponseFromPower(sys, power)
  const positionSearch = searchPositionsWithSystem(sys, room, bass.map(pt), pt(main), {
    seatPositions: opts.seatPositions, acrossPositions: opts.acrossPositions,
  }, power)
  const lowModes = modes.filter((m) => m.hz < 150).map((m) => {
    const pressure = modePressure(room, m, main)
    return { ...m, pressure, position: modePositionClass(pressure) }
  })

  return {
    engineVersion: ENGINE_VERSION,
    room: { ...room, volumeM3: roomVolume(room), surfaceAreaM2: roomSurfaceArea(room), celsius, speedOfSound: c },
    modesMaxHz,
    modes,
    modeAnalysis,
    reflectionWindow: window,
    reflections,
    notches,
    reverberation,
    flags,
    seat: { label: main.label, point: pt(main), bassSources: bass.map((b) => b.label), bassSourceKind: desc.subwoofers && desc.subwoofers.length ? 'subwoofers' : 'speakers', lowModes, modalResponse, positionSearch },
  }
}


