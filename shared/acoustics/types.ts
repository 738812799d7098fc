/** Shared geometry types of the room engine (frame as in ENGINE.md). */

export type Surface = 'front' | 'back' | 'left' | 'right' | 'floor' | 'ceiling'

/** Metres. length: front wall → back wall (x), width: left → right wall (y), height: floor → ceiling (z). */
export interface RoomBox {
  length: number
  width: number
  height: number
}

/**
 * Metres. x from the front wall (behind the speakers) towards the back wall, y from the left wall
 * (left as seen from the seat, facing the speakers), z from the floor.
 */
export interface Point {
  x: number
  y: number
  z: number
}

/**
 * An opening in a wall. from/to: span along the wall, as x on the left and right walls and as y on
 * the front and back walls; bottom/top: height above the floor; metres.
 */
export interface Opening {
  wall: Surface
  kind: string
  from: number
  to: number
  bottom: number
  top: number
}

export const SURFACES: readonly Surface[] = ['front', 'back', 'left', 'right', 'floor', 'ceiling']

/** Octave-band centres (nominal, Hz) used by the materials table and reverberation. */
export const OCTAVE_BANDS_HZ = [63, 125, 250, 500, 1000, 2000, 4000, 8000] as const
export type OctaveBandHz = (typeof OCTAVE_BANDS_HZ)[number]

/** The axis (0 = x, 1 = y, 2 = z) normal to a surface and whether the surface sits at the far end. */
export function surfaceAxis(surface: Surface): { axis: 0 | 1 | 2; far: boolean } {
  switch (surface) {
    case 'front': return { axis: 0, far: false }
    case 'back': return { axis: 0, far: true }
    case 'left': return { axis: 1, far: false }
    case 'right': return { axis: 1, far: true }
    case 'floor': return { axis: 2, far: false }
    case 'ceiling': return { axis: 2, far: true }
  }
}

export function roomDims(room: RoomBox): [number, number, number] {
  return [room.length, room.width, room.height]
}

export function pointCoords(p: Point): [number, number, number] {
  return [p.x, p.y, p.z]
}

export function coordsPoint(c: readonly number[]): Point {
  return { x: c[0], y: c[1], z: c[2] }
}

export function roomVolume(room: RoomBox): number {
  return room.length * room.width * room.height
}

export function roomSurfaceArea(room: RoomBox): number {
  const { length: l, width: w, height: h } = room
  return 2 * (l * w + l * h + w * h)
}

/** Area of one surface of the box, m². */
export function surfaceArea(room: RoomBox, surface: Surface): number {
  const { length: l, width: w, height: h } = room
  switch (surface) {
    case 'front': case 'back': return w * h
    case 'left': case 'right': return l * h
    case 'floor': case 'ceiling': return l * w
  }
}

/** Distance from a point to a surface of the box, metres. */
export function distanceToSurface(room: RoomBox, p: Point, surface: Surface): number {
  const { axis, far } = surfaceAxis(surface)
  const v = pointCoords(p)[axis]
  return far ? roomDims(room)[axis] - v : v
}

export function distance(a: Point, b: Point): number {
  return Math.hypot(a.x - b.x, a.y - b.y, a.z - b.z)
}

/**
 * A treatment on a surface. Its centre (x, y, z: the two coordinates in the surface's plane are used)
 * and its size: widthM along the first in-plane axis (front/back walls: y; left/right walls: x;
 * floor/ceiling: x), heightM along the second (walls: z; floor/ceiling: y). Absorption from
 * `materialId`, else from a porous layer (`thickness`, `flowResistivity`, `airGap`, metres and Pa·s/m²).
 */
export interface Treatment {
  /** e.g. 'panel', 'bass-trap', 'cloud', 'diffuser' */
  type: string
  materialId?: string
  thickness?: number
  flowResistivity?: number
  airGap?: number
  /** the surface it is mounted on (`wall` and `surface` are synonyms) */
  wall?: Surface
  surface?: Surface
  x?: number
  y?: number
  z?: number
  /** metres (`width` is a synonym) */
  widthM?: number
  heightM?: number
  width?: number
  height?: number
  /** e.g. 'wall', 'corner', 'stand' (informational) */
  mounting?: string
  label?: string
}

/** Loose furnishings: a material row applied to an area (upholstery: the floor area it occupies), m². */
export interface Furnishing {
  materialId: string
  /** m² (`area` is a synonym) */
  areaM2?: number
  area?: number
}

/** A furnishing's area, m². */
export function furnishingArea(f: Furnishing): number {
  return (f.areaM2 ?? f.area) as number
}

/** A treatment's size on its surface, metres. */
export function treatmentSize(t: Treatment): { widthM: number; heightM: number } {
  return { widthM: (t.widthM ?? t.width) as number, heightM: (t.heightM ?? t.height) as number }
}

/** The surface a treatment sits on. */
export function treatmentSurface(t: Treatment): Surface | undefined {
  return t.surface ?? t.wall
}

/** The in-plane axes of a surface: walls horizontal then vertical, floor/ceiling x then y. */
export function inPlaneAxes(surface: Surface): [0 | 1 | 2, 0 | 1 | 2] {
  switch (surfaceAxis(surface).axis) {
    case 0: return [1, 2]
    case 1: return [0, 2]
    default: return [0, 1]
  }
}
