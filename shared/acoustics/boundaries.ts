import type { Point, RoomBox, Surface } from './types'
import { SURFACES, distanceToSurface, pointCoords, roomDims, surfaceAxis } from './types'
import { speedOfSound } from './units'
import { assertBand, assertPointInRoom, assertPositive, assertRoom, assertSurface } from './validate'

export interface BoundaryNotch {
  surface: Surface
  /** the source's distance to the surface, metres */
  distance: number
  /** first quarter-wave cancellation c/(4·distance), Hz (Infinity for a source on the surface) */
  notchHz: number
}

/**
 * Quarter-wave cancellation from each surface, one per surface in the order front, back, left, right, floor, ceiling.
 * @see Allison, "The influence of room boundaries on loudspeaker power output", AES preprint 951, 1974
 */
export function boundaryNotches(room: RoomBox, source: Point, opts: { celsius?: number } = {}): BoundaryNotch[] {
  assertRoom(room)
  assertPointInRoom(room, source, 'source')
  const c = speedOfSound(opts.celsius ?? 20)
  return SURFACES.map((surface) => {
    const d = distanceToSurface(room, source, surface)
    return { surface, distance: d, notchHz: d > 0 ? c / (4 * d) : Infinity }
  })
}

export interface BoundaryResponse {
  /** the surfaces taken into account (by default the nearest three) */
  surfaces: Surface[]
  freqsHz: number[]
  /** radiated power relative to the same source in free space, dB */
  levelDb: number[]
  /** lowest point of the curve */
  deepestNotch: { hz: number; levelDb: number }
}

const sinc = (u: number) => (u === 0 ? 1 : Math.sin(u) / u)

/**
 * Combined boundary response of a point source near the nearest three surfaces, 20–500 Hz: the power
 * it radiates relative to free space, W/W₀ = 1 + Σ sin(k·dᵢ)/(k·dᵢ) over its rigid images (dᵢ the
 * source–image distance; images in each surface and, for perpendicular surfaces, in their edges and
 * corner). Low frequencies gain up to +3 dB per surface; the dips are the boundary cancellations.
 * @see Allison, AES preprint 951, 1974; Waterhouse, JASA 30, 1958 (power output near reflecting planes)
 */
export function boundaryResponse(
  room: RoomBox, source: Point,
  opts: { celsius?: number; fromHz?: number; toHz?: number; pointsPerOctave?: number; surfaces?: Surface[] } = {},
): BoundaryResponse {
  assertRoom(room)
  assertPointInRoom(room, source, 'source')
  const c = speedOfSound(opts.celsius ?? 20)
  const [fromHz, toHz] = assertBand(opts.fromHz ?? 20, opts.toHz ?? 500)
  const ppo = opts.pointsPerOctave ?? 24
  assertPositive(ppo, 'pointsPerOctave')
  let surfaces: Surface[]
  if (opts.surfaces) {
    opts.surfaces.forEach((s) => assertSurface(s))
    surfaces = [...opts.surfaces]
  } else {
    surfaces = [...SURFACES]
      .map((s) => ({ s, d: distanceToSurface(room, source, s) }))
      .sort((a, b) => a.d - b.d)
      .slice(0, 3)
      .map((e) => e.s)
  }
  // image offsets: a single reflection in surface s moves the source by 2·d along its axis; images in
  // two or three surfaces on different axes combine those offsets (for two parallel surfaces only the single images)
  const dims = roomDims(room)
  const p = pointCoords(source)
  const offsets = surfaces.map((s) => {
    const { axis, far } = surfaceAxis(s)
    const o = [0, 0, 0]
    o[axis] = far ? 2 * (dims[axis] - p[axis]) : -2 * p[axis]
    return { axis, o }
  })
  const distances: number[] = []
  const n = offsets.length
  for (let mask = 1; mask < 1 << n; mask++) {
    const used = offsets.filter((_, i) => (mask >> i) & 1)
    const axes = new Set(used.map((u) => u.axis))
    if (axes.size !== used.length) continue
    const v = [0, 0, 0]
    for (const u of used) for (let a = 0; a < 3; a++) v[a] += u.o[a]
    distances.push(Math.hypot(v[0], v[1], v[2]))
  }
  const nPoints = Math.max(2, Math.round(Math.log2(toHz / fromHz) * ppo) + 1)
  const freqsHz: number[] = []
  const levelDb: number[] = []
  let deepest = { hz: fromHz, levelDb: Infinity }
  for (let i = 0; i < nPoints; i++) {
    const f = fromHz * (toHz / fromHz) ** (i / (nPoints - 1))
    const k = (2 * Math.PI * f) / c
    let ratio = 1
    for (const d of distances) ratio += sinc(k * d)
    const db = 10 * Math.log10(Math.max(ratio, 1e-6))
    freqsHz.push(f)
    levelDb.push(db)
    if (db < deepest.levelDb) deepest = { hz: f, levelDb: db }
  }
  return { surfaces, freqsHz, levelDb, deepestNotch: deepest }
}
