import type { Surface } from '../../../shared/acoustics'
import type { PlanReflectionPair } from '../../composables/useRoomPreview'
import { openingNames, surfaceNames, treatmentNames } from './planGeometry'

/**
 * What the room plan drawing (RoomPlan.vue and its views) draws, as plain geometry: the room's items
 * projected onto a view by its own `along`/`up` projection, in pixels. The views only place these.
 */

export interface PlanPoint {
  label: string
  x: number
  y: number
  z: number
}

export interface RoomPlanRoom {
  length: number
  width: number
  height: number
  speakers: PlanPoint[]
  subwoofers?: PlanPoint[]
  seats: PlanPoint[]
  openings?: { wall: 'front' | 'back' | 'left' | 'right'; kind: string; from: number; to: number; bottom: number; top: number }[]
  treatments?: { type: string; surface: Surface; thickness: number; width: number; height: number; x: number; y: number; z: number }[]
}

export type PlanItemKind = 'speaker' | 'subwoofer' | 'seat'

export const planKindNames: Record<PlanItemKind, string> = { speaker: 'Speaker', subwoofer: 'Subwoofer', seat: 'Seat' }

/** Room coordinates (metres) → pixels in one view. */
export interface Projection {
  /** the view's horizontal pixel for a point */
  h: (p: { x: number; y: number; z: number }) => number
  /** the view's vertical pixel for a point */
  v: (p: { x: number; y: number; z: number }) => number
}

/** Top view: the front wall at the top, the left wall on the left (as seen from the seat facing the speakers). */
export const TOP_PAD = { top: 44, right: 30, bottom: 30, left: 44 }
/** Elevations share one scale so heights compare between them. */
export const ELEVATION_PAD = { top: 18, right: 14, bottom: 30, left: 40 }

/**
 * The svg of a drawing `across` × `down` metres at `scale` px per metre inside `pad`: its size in px, and
 * the attributes (`viewBox`, `width`, `height`) that set it.
 */
export function drawingBox(across: number, down: number, scale: number, pad: typeof TOP_PAD) {
  const w = across * scale + pad.left + pad.right
  const h = down * scale + pad.top + pad.bottom
  return { w, h, size: { viewBox: `0 0 ${w} ${h}`, width: w, height: h } }
}

export function topScale(room: { length: number; width: number }, width: number, maxHeight: number): number {
  const P = TOP_PAD
  return Math.max(10, Math.min((width - P.left - P.right) / room.width, (maxHeight - P.top - P.bottom) / room.length))
}

export function elevationScale(room: { length: number; width: number; height: number }, width: number, maxHeight: number): number {
  const P = ELEVATION_PAD
  return Math.max(6, Math.min((width - P.left - P.right) / Math.max(room.length, room.width), (maxHeight - P.top - P.bottom) / room.height))
}

/** The 38 % guide lines for the seat (common practice, no source). */
export const lines38 = (length: number) => [
  { x: 0.38 * length, label: '38 %', title: '38 % of the length from the front wall' },
  { x: 0.62 * length, label: '38 % from back', title: '38 % of the length from the back wall' },
]

export interface DrawnReflection {
  key: string
  surface: Surface
  speaker: string
  inWindow: boolean | null
  cx: number
  cy: number
  title: string
}

function reflectionTitle(pair: PlanReflectionPair, surface: Surface, p: { x: number; y: number; z: number }, inWindow: boolean | null, fmt: (m: number) => string) {
  const where =
    surface === 'front' || surface === 'back'
      ? `${fmt(p.y)} from the left wall, ${fmt(p.z)} up`
      : surface === 'left' || surface === 'right'
        ? `${fmt(p.x)} from the front wall, ${fmt(p.z)} up`
        : `${fmt(p.x)} from the front wall, ${fmt(p.y)} from the left wall`
  const window = inWindow === null ? '' : inWindow ? ' — strong and early' : ' — weak or late enough'
  return `Reflection of speaker ${pair.speaker} off the ${surfaceNames[surface]} towards ${pair.seat}: ${where}${window}`
}

/** The reflection points a view shows (`surfaces`; every one when null), projected. */
export function drawReflections(pairs: PlanReflectionPair[], surfaces: readonly Surface[] | null, at: Projection, fmt: (m: number) => string): DrawnReflection[] {
  return pairs.flatMap((pair) =>
    pair.points
      .filter((p) => !surfaces || surfaces.includes(p.surface))
      .map(({ surface, point, inWindow }) => ({
        key: `${pair.speaker}-${pair.seat}-${surface}`,
        surface,
        speaker: pair.speaker,
        inWindow,
        cx: at.h(point),
        cy: at.v(point),
        title: reflectionTitle(pair, surface, point, inWindow, fmt),
      })),
  )
}

export const reflectionClass = (r: DrawnReflection) => [
  'room-plan__reflection',
  r.inWindow === true ? 'room-plan__reflection--strong' : r.inWindow === false ? 'room-plan__reflection--weak' : '',
]

/** Openings and treatments on the two opposite walls an elevation shows (the second one "far", dashed). */
export function elevationItems(room: RoomPlanRoom, walls: readonly [Surface, Surface], scale: number, at: { u: (along: number) => number; z: (z: number) => number }) {
  const openings = (room.openings ?? [])
    .map((o, index) => ({ o, index }))
    .filter(({ o }) => walls.includes(o.wall))
    .map(({ o, index }) => ({
      index,
      name: openingNames[o.kind] ?? o.kind,
      far: o.wall === walls[1],
      x: at.u(o.from),
      y: at.z(o.top),
      w: (o.to - o.from) * scale,
      h: (o.top - o.bottom) * scale,
    }))
  const treatments = (room.treatments ?? [])
    .map((t, index) => ({ t, index }))
    .filter(({ t }) => walls.includes(t.surface))
    .map(({ t, index }) => {
      const along = walls[0] === 'front' ? t.y : t.x
      return {
        index,
        name: treatmentNames[t.type] ?? t.type,
        far: t.surface === walls[1],
        x: at.u(along - t.width / 2),
        y: at.z(t.z + t.height / 2),
        w: t.width * scale,
        h: t.height * scale,
      }
    })
  return { openings, treatments }
}

/** An opening as a segment on its wall in the top view, with the label just inside the room. */
export function topOpenings(room: RoomPlanRoom, tx: (y: number) => number, ty: (x: number) => number) {
  const { length: L, width: W } = room
  return (room.openings ?? []).map((o, index) => {
    const name = openingNames[o.kind] ?? o.kind
    const mid = (o.from + o.to) / 2
    switch (o.wall) {
      case 'front':
        return { index, name, x1: tx(o.from), y1: ty(0), x2: tx(o.to), y2: ty(0), lx: tx(mid), ly: ty(0) + 13, anchor: 'middle' }
      case 'back':
        return { index, name, x1: tx(o.from), y1: ty(L), x2: tx(o.to), y2: ty(L), lx: tx(mid), ly: ty(L) - 6, anchor: 'middle' }
      case 'left':
        return { index, name, x1: tx(0), y1: ty(o.from), x2: tx(0), y2: ty(o.to), lx: tx(0) + 6, ly: ty(mid) + 4, anchor: 'start' }
      default:
        return { index, name, x1: tx(W), y1: ty(o.from), x2: tx(W), y2: ty(o.to), lx: tx(W) - 6, ly: ty(mid) + 4, anchor: 'end' }
    }
  })
}

/** Treatments in the top view: a bar against its wall, or a dashed outline for floor and ceiling. */
export function topTreatments(room: RoomPlanRoom, scale: number, tx: (y: number) => number, ty: (x: number) => number) {
  const { length: L, width: W } = room
  return (room.treatments ?? []).map((t, index) => {
    const name = treatmentNames[t.type] ?? t.type
    const depth = Math.max(t.thickness * scale, 4)
    const half = (t.width * scale) / 2
    switch (t.surface) {
      case 'front':
        return { index, name, kind: 'wall', x: tx(t.y) - half, y: ty(0), w: half * 2, h: depth }
      case 'back':
        return { index, name, kind: 'wall', x: tx(t.y) - half, y: ty(L) - depth, w: half * 2, h: depth }
      case 'left':
        return { index, name, kind: 'wall', x: tx(0), y: ty(t.x) - half, w: depth, h: half * 2 }
      case 'right':
        return { index, name, kind: 'wall', x: tx(W) - depth, y: ty(t.x) - half, w: depth, h: half * 2 }
      default: {
        // floor and ceiling: width along x (length), height along y (width)
        const hw = (t.height * scale) / 2
        return { index, name, kind: t.surface, x: tx(t.y) - hw, y: ty(t.x) - half, w: hw * 2, h: half * 2 }
      }
    }
  })
}

/** Paths speaker → side-wall point → seat for the reflections inside the window. */
export function topRays(room: RoomPlanRoom, pairs: PlanReflectionPair[], tx: (y: number) => number, ty: (x: number) => number) {
  return pairs.flatMap((pair) => {
    const speaker = room.speakers.find((s) => s.label === pair.speaker)
    const seat = room.seats.find((s) => s.label === pair.seat)
    if (!speaker || !seat) return []
    return pair.points
      .filter((p) => (p.surface === 'left' || p.surface === 'right') && p.inWindow !== false)
      .map((p) => ({
        key: `${pair.speaker}-${pair.seat}-${p.surface}`,
        d: `M ${tx(speaker.y)} ${ty(speaker.x)} L ${tx(p.point.y)} ${ty(p.point.x)} L ${tx(seat.y)} ${ty(seat.x)}`,
      }))
  })
}
