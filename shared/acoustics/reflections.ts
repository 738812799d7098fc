import type { Point, RoomBox, Surface } from './types'
import { SURFACES, coordsPoint, distance, pointCoords, roomDims, surfaceAxis } from './types'
import { speedOfSound } from './units'
import { assertAlpha, assertFinite, assertPointInRoom, assertRoom } from './validate'

export interface Reflection {
  surface: Surface
  /** where the path meets the surface, metres */
  point: Point
  /** image source → receiver, metres */
  pathLength: number
  /** arrival after the direct sound, ms */
  delayMs: number
  /** relative to the direct sound, dB */
  levelDb: number
}

export interface SecondOrderReflection {
  /** surfaces in the order the sound meets them */
  surfaces: [Surface, Surface]
  points: [Point, Point]
  pathLength: number
  delayMs: number
  levelDb: number
}

export interface ReflectionOptions {
  celsius?: number
  /** absorption coefficient per surface, 0…1 (0 where not given) */
  alpha?: Partial<Record<Surface, number>>
}

const AXIS_SURFACES: [Surface, Surface][] = [['front', 'back'], ['left', 'right'], ['floor', 'ceiling']]

/** Checks the common input and returns c, the direct distance and the room and points as coordinate triples. */
function checkCommon(room: RoomBox, source: Point, receiver: Point, opts: ReflectionOptions) {
  assertRoom(room)
  assertPointInRoom(room, source, 'source')
  assertPointInRoom(room, receiver, 'receiver')
  if (opts.alpha) for (const [s, a] of Object.entries(opts.alpha)) if (a !== undefined) assertAlpha(a, `absorption coefficient of the ${s}`)
  const direct = distance(source, receiver)
  if (direct === 0) throw new RangeError('source and receiver coincide: the level relative to the direct sound is undefined')
  return { c: speedOfSound(opts.celsius ?? 20), direct, dims: roomDims(room), s: pointCoords(source), r: pointCoords(receiver) }
}

/** Fold an unfolded coordinate back into 0…L (mirror lattice of the image-source method). */
function fold(u: number, l: number): number {
  const m = ((u % (2 * l)) + 2 * l) % (2 * l)
  return m <= l ? m : 2 * l - m
}

/**
 * Trace an image source of any order: the straight line from the image (cell indices q per axis:
 * unfolded coordinate q·L + (q even ? s : L − s)) to the receiver crosses the cell planes; each
 * crossing, folded back into the room, is a reflection point, met in order from the image's side.
 * @see Allen & Berkley, JASA 65(4), 1979
 */
function traceImage(dims: readonly number[], src: readonly number[], rec: readonly number[], cells: readonly number[]) {
  const img = [0, 1, 2].map((a) => {
    const q = cells[a]
    const l = dims[a]
    return q * l + (q % 2 === 0 ? src[a] : l - src[a])
  })
  const hits: { t: number; surface: Surface }[] = []
  for (let a = 0; a < 3; a++) {
    const q = cells[a]
    if (q === 0) continue
    const l = dims[a]
    // planes between the image's cell and cell 0: for q > 0 at L…qL, for q < 0 at 0…(q+1)L
    const planes: number[] = []
    if (q > 0) for (let k = 1; k <= q; k++) planes.push(k * l)
    else for (let k = 0; k >= q + 1; k--) planes.push(k * l)
    for (const plane of planes) {
      const dv = rec[a] - img[a]
      const t = dv === 0 ? 0.5 : (plane - img[a]) / dv
      const k = Math.round(plane / l)
      hits.push({ t, surface: AXIS_SURFACES[a][Math.abs(k) % 2 === 0 ? 0 : 1] })
    }
  }
  hits.sort((h1, h2) => h1.t - h2.t)
  const points = hits.map((h) =>
    coordsPoint([0, 1, 2].map((a) => {
      const u = img[a] + h.t * (rec[a] - img[a])
      const v = fold(u, dims[a])
      // snap the coordinate normal to the reflecting surface exactly onto it
      const { axis, far } = surfaceAxis(h.surface)
      return a === axis ? (far ? dims[a] : 0) : v
    })),
  )
  const pathLength = Math.hypot(img[0] - rec[0], img[1] - rec[1], img[2] - rec[2])
  return { image: img, surfaces: hits.map((h) => h.surface), points, pathLength }
}

function levelOf(direct: number, pathLength: number, surfaces: readonly Surface[], alpha: Partial<Record<Surface, number>> | undefined): number {
  let db = 20 * Math.log10(direct / pathLength)
  for (const s of surfaces) db += 10 * Math.log10(1 - (alpha?.[s] ?? 0))
  return db
}

const FIRST_ORDER_CELLS: Record<Surface, [number, number, number]> = {
  front: [-1, 0, 0], back: [1, 0, 0], left: [0, -1, 0], right: [0, 1, 0], floor: [0, 0, -1], ceiling: [0, 0, 1],
}

/**
 * First-order reflections, one per surface in the order front, back, left, right, floor, ceiling.
 * levelDb = 20·log10(direct/path) + 10·log10(1 − α); delayMs = (path − direct)/c.
 * @see Allen & Berkley, "Image method for efficiently simulating small-room acoustics", JASA 65(4), 1979
 */
export function firstReflections(room: RoomBox, source: Point, receiver: Point, opts: ReflectionOptions = {}): Reflection[] {
  const { c, direct, dims, s, r } = checkCommon(room, source, receiver, opts)
  return SURFACES.map((surface) => {
    const tr = traceImage(dims, s, r, FIRST_ORDER_CELLS[surface])
    return {
      surface,
      point: tr.points[0],
      pathLength: tr.pathLength,
      delayMs: ((tr.pathLength - direct) / c) * 1000,
      levelDb: levelOf(direct, tr.pathLength, [surface], opts.alpha),
    }
  })
}

/** First-order image source position behind a surface, metres. */
export function imageSource(room: RoomBox, source: Point, surface: Surface): Point {
  assertRoom(room)
  assertPointInRoom(room, source, 'source')
  const dims = roomDims(room)
  const cells = FIRST_ORDER_CELLS[surface]
  const s = pointCoords(source)
  return coordsPoint([0, 1, 2].map((a) => {
    const q = cells[a]
    return q * dims[a] + (q % 2 === 0 ? s[a] : dims[a] - s[a])
  }))
}

/** The 18 second-order image cells of a box: two reflections on one axis (6) or one on each of two axes (12). */
const SECOND_ORDER_CELLS: [number, number, number][] = (() => {
  const out: [number, number, number][] = []
  for (let a = 0; a < 3; a++) for (const q of [-2, 2]) { const c: [number, number, number] = [0, 0, 0]; c[a] = q; out.push(c) }
  for (let a = 0; a < 3; a++) for (let b = a + 1; b < 3; b++) for (const qa of [-1, 1]) for (const qb of [-1, 1]) {
    const c: [number, number, number] = [0, 0, 0]; c[a] = qa; c[b] = qb; out.push(c)
  }
  return out
})()

/**
 * Second-order reflections: every path with two reflections (18 in a box; all are valid in a
 * rectangular room), sorted by delay.
 * @see Allen & Berkley, JASA 65(4), 1979; level = 20·lg(r_direct/r_image) + Σ 10·lg(1 − αᵢ)
 */
export function secondOrderReflections(room: RoomBox, source: Point, receiver: Point, opts: ReflectionOptions = {}): SecondOrderReflection[] {
  const { c, direct, dims, s, r } = checkCommon(room, source, receiver, opts)
  return SECOND_ORDER_CELLS.map((cells) => {
    const tr = traceImage(dims, s, r, cells)
    return {
      surfaces: [tr.surfaces[0], tr.surfaces[1]] as [Surface, Surface],
      points: [tr.points[0], tr.points[1]] as [Point, Point],
      pathLength: tr.pathLength,
      delayMs: ((tr.pathLength - direct) / c) * 1000,
      levelDb: levelOf(direct, tr.pathLength, tr.surfaces, opts.alpha),
    }
  }).sort((a, b) => a.delayMs - b.delayMs)
}

export interface ReflectionWindow {
  /** ms after the direct sound (default 20) */
  windowMs: number
  /** dB relative to the direct sound (default −20) */
  thresholdDb: number
}

export const DEFAULT_REFLECTION_WINDOW: ReflectionWindow = { windowMs: 20, thresholdDb: -20 }

/**
 * A reflection falls inside the window when it arrives within `windowMs` of the direct sound and is
 * louder than `thresholdDb` relative to it (common practice, no source: within about 20 ms at least 15–20 dB down).
 */
export function inReflectionWindow(r: { delayMs: number; levelDb: number }, window: Partial<ReflectionWindow> = {}): boolean {
  const w = { ...DEFAULT_REFLECTION_WINDOW, ...window }
  assertFinite(w.windowMs, 'reflection window (ms)')
  assertFinite(w.thresholdDb, 'reflection window threshold (dB)')
  return r.delayMs <= w.windowMs && r.levelDb > w.thresholdDb
}

export interface HeadMovement {
  /** half-ranges of head movement about the seat, metres: fore-aft (x), side to side (y), up-down (z) */
  x: number
  y: number
  z: number
}

/** Our choice: a listener's head moves about ±0.15 m fore-aft, ±0.3 m side to side and ±0.1 m up and down. */
export const DEFAULT_HEAD_MOVEMENT: HeadMovement = { x: 0.15, y: 0.3, z: 0.1 }

export interface ReflectionPanel {
  surface: Surface
  /** the mirror point for the seat itself */
  centre: Point
  /** opposite corners of the rectangle on the surface (the surface's own coordinate is constant) */
  min: Point
  max: Point
  /** extents along the surface's two in-plane axes, metres (walls: horizontal then vertical) */
  widthM: number
  heightM: number
  areaM2: number
}

/**
 * Where to put a first-reflection panel: the rectangle on the surface swept by the mirror point while
 * the listener's head moves over a box about the seat (its eight corners, kept inside the room), plus
 * a margin on every side (default 0.1 m), kept on the surface. The mirror point is a central projection
 * of the receiver from the image source onto the plane, so the corners' mirror points bound the whole
 * swept area.
 */
export function reflectionPanel(
  room: RoomBox, source: Point, seat: Point, surface: Surface,
  opts: { head?: Partial<HeadMovement>; marginM?: number } = {},
): ReflectionPanel {
  assertRoom(room)
  assertPointInRoom(room, source, 'source')
  assertPointInRoom(room, seat, 'seat')
  const head = { ...DEFAULT_HEAD_MOVEMENT, ...opts.head }
  const margin = opts.marginM ?? 0.1
  for (const [k, v] of Object.entries(head)) assertFinite(v, `head movement ${k}`)
  assertFinite(margin, 'panel margin')
  const dims = roomDims(room)
  const s = pointCoords(source)
  const seatC = pointCoords(seat)
  const cells = FIRST_ORDER_CELLS[surface]
  const { axis } = surfaceAxis(surface)
  const centre = traceImage(dims, s, seatC, cells).points[0]
  const lo = [Infinity, Infinity, Infinity]
  const hi = [-Infinity, -Infinity, -Infinity]
  const halves = [head.x, head.y, head.z]
  for (let corner = 0; corner < 8; corner++) {
    const r = [0, 1, 2].map((a) => {
      const v = seatC[a] + ((corner >> a) & 1 ? halves[a] : -halves[a])
      return Math.min(dims[a], Math.max(0, v))
    })
    if (r.every((v, a) => v === s[a])) continue
    const p = pointCoords(traceImage(dims, s, r, cells).points[0])
    for (let a = 0; a < 3; a++) { lo[a] = Math.min(lo[a], p[a]); hi[a] = Math.max(hi[a], p[a]) }
  }
  for (let a = 0; a < 3; a++) {
    if (a === axis) continue
    lo[a] = Math.max(0, lo[a] - margin)
    hi[a] = Math.min(dims[a], hi[a] + margin)
  }
  const inPlane = [0, 1, 2].filter((a) => a !== axis)
  // walls: horizontal axis first, then height; floor and ceiling: x then y
  const widthM = hi[inPlane[0]] - lo[inPlane[0]]
  const heightM = hi[inPlane[1]] - lo[inPlane[1]]
  return { surface, centre, min: coordsPoint(lo), max: coordsPoint(hi), widthM, heightM, areaM2: widthM * heightM }
}
