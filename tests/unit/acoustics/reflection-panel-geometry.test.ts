import { describe, expect, it } from 'vitest'
import type { Point, Surface } from '../../../shared/acoustics'
import { reflectionPanel } from '../../../shared/acoustics'

/*
 * Outside check: the reflection zone on a surface, built here by the geometric construction of the
 * specular reflection (angle of incidence = angle of reflection, so by similar triangles the mirror point
 * divides the source→receiver offset along the surface in the ratio d_s : d_r of their distances to the
 * plane; the same point as the first-order image of Allen & Berkley, JASA 65(4), 1979). The receiver is
 * swept over the listener's head region (a dense grid of the box, and a horizontal circle of radius r),
 * and the zone is the set of mirror points. The head box and the 0.1 m margin are our own choice.
 */
type Room = { length: number; width: number; height: number }
const AX: Record<Surface, { axis: 'x' | 'y' | 'z'; at: (r: Room) => number }> = {
  front: { axis: 'x', at: () => 0 }, back: { axis: 'x', at: (r) => r.length },
  left: { axis: 'y', at: () => 0 }, right: { axis: 'y', at: (r) => r.width },
  floor: { axis: 'z', at: () => 0 }, ceiling: { axis: 'z', at: (r) => r.height },
}
const KEYS = ['x', 'y', 'z'] as const
function mirrorPoint(room: Room, s: Point, r: Point, surface: Surface): Point {
  const { axis, at } = AX[surface]
  const p = at(room)
  const ds = Math.abs(s[axis] - p)
  const dr = Math.abs(r[axis] - p)
  const t = ds / (ds + dr)
  const out = { x: s.x + t * (r.x - s.x), y: s.y + t * (r.y - s.y), z: s.z + t * (r.z - s.z) }
  out[axis] = p
  return out
}
function zone(room: Room, s: Point, receivers: Point[], surface: Surface, margin: number) {
  const pts = receivers.map((r) => mirrorPoint(room, s, r, surface))
  const dims = { x: room.length, y: room.width, z: room.height }
  const lo = {} as Record<'x' | 'y' | 'z', number>
  const hi = {} as Record<'x' | 'y' | 'z', number>
  for (const k of KEYS) {
    lo[k] = Math.min(...pts.map((p) => p[k]))
    hi[k] = Math.max(...pts.map((p) => p[k]))
    if (k !== AX[surface].axis) { lo[k] = Math.max(0, lo[k] - margin); hi[k] = Math.min(dims[k], hi[k] + margin) }
  }
  return { lo, hi, pts }
}
function boxGrid(seat: Point, h: { x: number; y: number; z: number }, n = 8): Point[] {
  const out: Point[] = []
  for (let i = 0; i <= n; i++) for (let j = 0; j <= n; j++) for (let k = 0; k <= n; k++) {
    out.push({ x: seat.x - h.x + (2 * h.x * i) / n, y: seat.y - h.y + (2 * h.y * j) / n, z: seat.z - h.z + (2 * h.z * k) / n })
  }
  return out
}

const CASES: { name: string; room: Room; src: Point; seat: Point }[] = [
  { name: 'REFERENCES.md check room 10 × 8 × 4 m', room: { length: 10, width: 8, height: 4 }, src: { x: 3, y: 4, z: 2 }, seat: { x: 6, y: 4, z: 2 } },
  { name: 'listening room 5.2 × 3.9 × 2.6 m, left speaker', room: { length: 5.2, width: 3.9, height: 2.6 }, src: { x: 0.9, y: 1.1, z: 1.05 }, seat: { x: 3.3, y: 1.95, z: 1.15 } },
  { name: 'listening room 5.2 × 3.9 × 2.6 m, right speaker', room: { length: 5.2, width: 3.9, height: 2.6 }, src: { x: 0.9, y: 2.8, z: 1.05 }, seat: { x: 3.3, y: 1.95, z: 1.15 } },
]
const HEAD = { x: 0.15, y: 0.3, z: 0.1 }
const SURFACES: Surface[] = ['front', 'back', 'left', 'right', 'floor', 'ceiling']

describe('reflectionPanel against the geometric construction of the reflection zone (law of reflection; Allen & Berkley, JASA 65(4), 1979)', () => {
  for (const { name, room, src, seat } of CASES) {
    it(`${name}: each surface's panel is the zone swept by the mirror point over the head box, plus the margin`, () => {
      for (const surface of SURFACES) {
        const ref = zone(room, src, boxGrid(seat, HEAD), surface, 0.1)
        const p = reflectionPanel(room, src, seat, surface, { head: HEAD, marginM: 0.1 })
        for (const k of KEYS) {
          expect(p.min[k], `${surface} min ${k}`).toBeCloseTo(ref.lo[k], 9)
          expect(p.max[k], `${surface} max ${k}`).toBeCloseTo(ref.hi[k], 9)
        }
        const centre = mirrorPoint(room, src, seat, surface)
        for (const k of KEYS) expect(p.centre[k]).toBeCloseTo(centre[k], 9)
        const inPlane = KEYS.filter((k) => k !== AX[surface].axis)
        expect(p.widthM).toBeCloseTo(ref.hi[inPlane[0]] - ref.lo[inPlane[0]], 9)
        expect(p.heightM).toBeCloseTo(ref.hi[inPlane[1]] - ref.lo[inPlane[1]], 9)
      }
    })
    it(`${name}: the panel covers every mirror point while the head moves on a ±0.3 m horizontal circle`, () => {
      const r = 0.3
      const circle = Array.from({ length: 360 }, (_, i) => ({ x: seat.x + r * Math.cos((i * Math.PI) / 180), y: seat.y + r * Math.sin((i * Math.PI) / 180), z: seat.z }))
      for (const surface of SURFACES) {
        const p = reflectionPanel(room, src, seat, surface, { head: { x: r, y: r, z: 0 }, marginM: 0 })
        const { pts } = zone(room, src, circle, surface, 0)
        for (const k of KEYS) {
          expect(Math.min(...pts.map((q) => q[k])), `${surface} circle min ${k}`).toBeGreaterThanOrEqual(p.min[k] - 1e-9)
          expect(Math.max(...pts.map((q) => q[k])), `${surface} circle max ${k}`).toBeLessThanOrEqual(p.max[k] + 1e-9)
        }
      }
    })
  }
  it('check room floor, hand-worked: x = 3 + (x_r − 3)·2/(2 + z_r) spans 4.390–4.615 m (0.225 m), y = 4 ± 0.3·2/3.9 = 4 ± 0.154 m (no margin)', () => {
    const p = reflectionPanel({ length: 10, width: 8, height: 4 }, { x: 3, y: 4, z: 2 }, { x: 6, y: 4, z: 2 }, 'floor', { head: HEAD, marginM: 0 })
    expect(p.min.x).toBeCloseTo(3 + (2.85 * 2) / 4.1, 9)
    expect(p.max.x).toBeCloseTo(3 + (3.15 * 2) / 3.9, 9)
    expect(p.min.x).toBeCloseTo(4.390, 3)
    expect(p.max.x).toBeCloseTo(4.615, 3)
    expect(p.widthM).toBeCloseTo(0.2251, 4)
    expect(p.heightM).toBeCloseTo(0.3077, 4)
  })
})
