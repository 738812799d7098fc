import type { Point, Surface } from '../acoustics'

type Box = { length: number; width: number; height: number }

/** The in-plane axes of a surface as point keys: walls horizontal then vertical; floor/ceiling x then y. */
export function surfaceAxes(surface: Surface): ['x' | 'y', 'y' | 'z'] {
  if (surface === 'front' || surface === 'back') return ['y', 'z']
  if (surface === 'left' || surface === 'right') return ['x', 'z']
  return ['x', 'y']
}

/** The coordinate fixed on a surface, and its value. */
export function surfaceNormal(surface: Surface, room: Box): { key: 'x' | 'y' | 'z'; value: number } {
  switch (surface) {
    case 'front': return { key: 'x', value: 0 }
    case 'back': return { key: 'x', value: room.length }
    case 'left': return { key: 'y', value: 0 }
    case 'right': return { key: 'y', value: room.width }
    case 'floor': return { key: 'z', value: 0 }
    case 'ceiling': return { key: 'z', value: room.height }
  }
}

/** Extent of a room coordinate, metres. */
export const extentOf = (room: Box, key: 'x' | 'y' | 'z') => (key === 'x' ? room.length : key === 'y' ? room.width : room.height)

/** The surface's size along its two in-plane axes, metres. */
export function surfaceSize(surface: Surface, room: Box): [number, number] {
  const [u, v] = surfaceAxes(surface)
  return [extentOf(room, u), extentOf(room, v)]
}

/**
 * A rectangle of `w` × `h` on the surface centred as near `centre` as fits: shrunk to the surface
 * when larger, then moved inside; the normal coordinate put exactly on the surface.
 */
export function fitOnSurface(room: Box, surface: Surface, centre: Point, w: number, h: number): { centre: Point; width: number; height: number } {
  const [u, v] = surfaceAxes(surface)
  const [su, sv] = surfaceSize(surface, room)
  const width = Math.min(w, su)
  const height = Math.min(h, sv)
  const clamp = (c: number, half: number, size: number) => Math.min(size - half, Math.max(half, c))
  const out: Point = { ...centre }
  out[u] = clamp(centre[u], width / 2, su)
  out[v] = clamp(centre[v], height / 2, sv)
  const n = surfaceNormal(surface, room)
  out[n.key] = n.value
  return { centre: out, width, height }
}

/** Whether a point on the surface lies inside a treatment's rectangle (the engine's own test). */
export function insideRect(surface: Surface, p: Point, t: { x: number; y: number; z: number; width: number; height: number }): boolean {
  const [u, v] = surfaceAxes(surface)
  return Math.abs(p[u] - t[u]) <= t.width / 2 + 1e-12 && Math.abs(p[v] - t[v]) <= t.height / 2 + 1e-12
}

/** Rounds a length up to whole 5 cm (a buyable size). */
export const roundUp5cm = (v: number) => Math.ceil(v * 20 - 1e-9) / 20
export const round2 = (v: number) => Math.round(v * 100) / 100
