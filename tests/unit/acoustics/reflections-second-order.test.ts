import { describe, expect, it } from 'vitest'
import type { Point, Surface } from '../../../shared/acoustics'
import { secondOrderReflections } from '../../../shared/acoustics'
import { celsiusFor } from './helpers'

/*
 * Outside check: the image-source method's closed form (Allen & Berkley, "Image method for efficiently
 * simulating small-room acoustics", JASA 65(4), 1979; formulas as quoted in REFERENCES.md). The images are
 * built here independently of the engine's cell lattice: the source is mirrored in the first plane, that
 * image in the second plane. level = 20·lg(r_direct/r_image) + Σ 10·lg(1 − αᵢ), delay = (r_image − r_direct)/c.
 */
type Room = { length: number; width: number; height: number }
const PLANES: Record<Surface, { axis: 'x' | 'y' | 'z'; at: (r: Room) => number }> = {
  front: { axis: 'x', at: () => 0 }, back: { axis: 'x', at: (r) => r.length },
  left: { axis: 'y', at: () => 0 }, right: { axis: 'y', at: (r) => r.width },
  floor: { axis: 'z', at: () => 0 }, ceiling: { axis: 'z', at: (r) => r.height },
}
const ALL: Surface[] = ['front', 'back', 'left', 'right', 'floor', 'ceiling']
const mirror = (room: Room, p: Point, s: Surface): Point => {
  const { axis, at } = PLANES[s]
  return { ...p, [axis]: 2 * at(room) - p[axis] }
}
const dist = (a: Point, b: Point) => Math.hypot(a.x - b.x, a.y - b.y, a.z - b.z)

/** Every distinct second-order image: ordered pairs of different surfaces; mirrors on different axes commute, so those pairs collapse. */
function independentImages(room: Room, src: Point) {
  const out = new Map<string, { surfaces: Surface[]; image: Point }>()
  for (const s1 of ALL) for (const s2 of ALL) {
    if (s1 === s2) continue
    const sameAxis = PLANES[s1].axis === PLANES[s2].axis
    const key = sameAxis ? `${s1}>${s2}` : [s1, s2].sort().join('+')
    if (!out.has(key)) out.set(key, { surfaces: [s1, s2], image: mirror(room, mirror(room, src, s1), s2) })
  }
  return out
}
const keyOf = (surfaces: readonly Surface[]) =>
  PLANES[surfaces[0]].axis === PLANES[surfaces[1]].axis ? `${surfaces[0]}>${surfaces[1]}` : [...surfaces].sort().join('+')

const CASES: { name: string; room: Room; src: Point; rec: Point }[] = [
  { name: 'REFERENCES.md check room 10 × 8 × 4 m', room: { length: 10, width: 8, height: 4 }, src: { x: 3, y: 4, z: 2 }, rec: { x: 6, y: 4, z: 2 } },
  { name: 'a listening room 5.2 × 3.9 × 2.6 m, speaker to seat', room: { length: 5.2, width: 3.9, height: 2.6 }, src: { x: 0.9, y: 1.1, z: 1.05 }, rec: { x: 3.3, y: 1.95, z: 1.15 } },
  { name: 'an asymmetric case 7 × 5 × 3 m', room: { length: 7, width: 5, height: 3 }, src: { x: 1.3, y: 0.7, z: 2.1 }, rec: { x: 5.1, y: 3.6, z: 0.9 } },
]
const ALPHA: Record<Surface, number> = { front: 0.1, back: 0.25, left: 0.3, right: 0.45, floor: 0.05, ceiling: 0.6 }
const C = 343

describe('secondOrderReflections against the image-source closed form (Allen & Berkley, JASA 65(4), 1979)', () => {
  for (const { name, room, src, rec } of CASES) {
    it(`${name}: every second-order path has the mirrored-twice image's length, level and delay`, () => {
      const engine = secondOrderReflections(room, src, rec, { celsius: celsiusFor(C), alpha: ALPHA })
      const images = independentImages(room, src)
      expect(images.size).toBe(18)
      expect(engine).toHaveLength(18)
      const direct = dist(src, rec)
      const seen = new Set<string>()
      for (const e of engine) {
        const key = keyOf(e.surfaces)
        const ref = images.get(key)
        expect(ref, `engine path ${key} has an independent image`).toBeDefined()
        expect(seen.has(key), `path ${key} listed once`).toBe(false)
        seen.add(key)
        const rImage = dist(ref!.image, rec)
        const level = 20 * Math.log10(direct / rImage) + e.surfaces.reduce((s, x) => s + 10 * Math.log10(1 - ALPHA[x]), 0)
        expect(e.pathLength).toBeCloseTo(rImage, 9)
        expect(e.levelDb).toBeCloseTo(level, 9)
        expect(e.delayMs).toBeCloseTo(((rImage - direct) / C) * 1000, 6)
        // the engine names the surfaces in the order met: for two walls on one axis the order is physical
        if (PLANES[e.surfaces[0]].axis === PLANES[e.surfaces[1]].axis) expect(e.surfaces).toEqual(ref!.surfaces)
      }
      expect(seen.size).toBe(18)
    })
  }
  it('check room, hand-worked: front then back has its image at x = 2·10 + 3 = 23 m, path √(17² + 0²) = 17 m, delay 14/343 s = 40.82 ms, −15.07 dB by spreading', () => {
    const e = secondOrderReflections({ length: 10, width: 8, height: 4 }, { x: 3, y: 4, z: 2 }, { x: 6, y: 4, z: 2 }, { celsius: celsiusFor(C) })
    const fb = e.find((x) => x.surfaces[0] === 'front' && x.surfaces[1] === 'back')!
    expect(fb.pathLength).toBeCloseTo(17, 9)
    expect(fb.delayMs).toBeCloseTo(40.82, 2)
    expect(fb.levelDb).toBeCloseTo(-15.07, 2)
    // back then front: image at x = −10 − (10 − 3)… i.e. x = −2·10 + 3 = −17 m, path 23 m
    const bf = e.find((x) => x.surfaces[0] === 'back' && x.surfaces[1] === 'front')!
    expect(bf.pathLength).toBeCloseTo(23, 9)
  })
})
