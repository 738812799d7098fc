import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import type { Point, Surface } from '../../../shared/acoustics'
import { SURFACES, distanceToSurface, firstReflections, imageSource, inReflectionWindow, reflectionPanel, secondOrderReflections } from '../../../shared/acoustics'
import { celsiusFor, deepFreeze } from './helpers'

const dist = (a: Point, b: Point) => Math.hypot(a.x - b.x, a.y - b.y, a.z - b.z)
const onSurface = (room: { length: number; width: number; height: number }, p: Point, s: Surface) => Math.abs(distanceToSurface(room, p, s)) < 1e-9

describe('firstReflections — Allen & Berkley, JASA 65(4), 1979 check room (REFERENCES.md)', () => {
  const room = { length: 10, width: 8, height: 4 }
  const src = { x: 3, y: 4, z: 2 }
  const rec = { x: 6, y: 4, z: 2 }
  const refl = firstReflections(room, src, rec, { celsius: celsiusFor(343) })
  const by = (s: Surface) => refl.find((r) => r.surface === s)!

  it('returns one reflection per surface in the order front, back, left, right, floor, ceiling', () => {
    expect(refl.map((r) => r.surface)).toEqual(SURFACES)
  })
  it('floor and ceiling: image path 5 m against a 3 m direct path, −4.44 dB, 5.83 ms at 343 m/s, mirror points (4.5, 4, 0) and (4.5, 4, 4)', () => {
    for (const s of ['floor', 'ceiling'] as const) {
      expect(by(s).pathLength).toBeCloseTo(5, 12)
      expect(by(s).levelDb).toBeCloseTo(20 * Math.log10(3 / 5), 12)
      expect(by(s).levelDb).toBeCloseTo(-4.44, 2)
      expect(by(s).delayMs).toBeCloseTo(5.83, 2)
    }
    expect(by('floor').point).toEqual({ x: 4.5, y: 4, z: 0 })
    expect(by('ceiling').point).toEqual({ x: 4.5, y: 4, z: 4 })
  })
  it('front, back and side walls follow from the same geometry', () => {
    expect(by('front').pathLength).toBeCloseTo(9, 12)
    expect(by('front').point).toEqual({ x: 0, y: 4, z: 2 })
    expect(by('back').pathLength).toBeCloseTo(11, 12)
    expect(by('left').pathLength).toBeCloseTo(Math.hypot(3, 8), 12)
    expect(by('left').point.x).toBeCloseTo(4.5, 12)
  })
  it('adds 10·log10(1 − α) for the surface absorption', () => {
    const a = firstReflections(room, src, rec, { alpha: { floor: 0.5 } })
    const f = a.find((r) => r.surface === 'floor')!
    expect(f.levelDb).toBeCloseTo(20 * Math.log10(3 / 5) + 10 * Math.log10(0.5), 12)
    expect(a.find((r) => r.surface === 'ceiling')!.levelDb).toBeCloseTo(20 * Math.log10(3 / 5), 12)
  })
  it('rejects absorption outside 0…1, coincident points and points outside', () => {
    expect(() => firstReflections(room, src, rec, { alpha: { left: 1.2 } })).toThrow(/absorption coefficient of the left must lie between 0 and 1: got 1.2/)
    expect(() => firstReflections(room, src, src)).toThrow(/coincide/)
    expect(() => firstReflections(room, { x: 11, y: 1, z: 1 }, rec)).toThrow('source lies outside the room: x = 11 m > length 10 m')
  })
})

const arbRoomAndPoints = fc
  .record({ l: fc.double({ min: 2, max: 12, noNaN: true }), w: fc.double({ min: 2, max: 10, noNaN: true }), h: fc.double({ min: 2, max: 5, noNaN: true }) })
  .chain(({ l, w, h }) => {
    const p = fc.record({ x: fc.double({ min: 0.05 * l, max: 0.95 * l, noNaN: true }), y: fc.double({ min: 0.05 * w, max: 0.95 * w, noNaN: true }), z: fc.double({ min: 0.05 * h, max: 0.95 * h, noNaN: true }) })
    return fc.tuple(fc.constant({ length: l, width: w, height: h }), p, p)
  })
  .filter(([, a, b]) => dist(a, b) > 0.05)

describe('image-source invariants', () => {
  it('an image lies as far behind its wall as the source is in front of it', () => {
    fc.assert(fc.property(arbRoomAndPoints, ([room, s]) => {
      for (const surface of SURFACES) {
        const img = imageSource(room, s, surface)
        const d = distanceToSurface(room, s, surface)
        // signed distance of the image to the surface plane is −d (behind it), and it differs from the source on that axis only
        const axisKey = surface === 'front' || surface === 'back' ? 'x' : surface === 'left' || surface === 'right' ? 'y' : 'z'
        const plane = surface === 'front' || surface === 'left' || surface === 'floor' ? 0 : { x: room.length, y: room.width, z: room.height }[axisKey]
        expect(Math.abs(img[axisKey] - plane)).toBeCloseTo(d, 9)
        expect(Math.sign(img[axisKey] - plane) * Math.sign(s[axisKey] - plane)).toBeLessThanOrEqual(0)
        for (const k of ['x', 'y', 'z'] as const) if (k !== axisKey) expect(img[k]).toBe(s[k])
      }
    }), { numRuns: 50 })
  })
  it('each path source → mirror point(s) → receiver has exactly the reported length, and its points lie on the named surfaces', () => {
    fc.assert(fc.property(arbRoomAndPoints, ([room, s, r]) => {
      for (const f of firstReflections(room, s, r)) {
        expect(onSurface(room, f.point, f.surface)).toBe(true)
        expect(dist(s, f.point) + dist(f.point, r)).toBeCloseTo(f.pathLength, 8)
      }
      const second = secondOrderReflections(room, s, r)
      expect(second).toHaveLength(18)
      for (const f of second) {
        expect(onSurface(room, f.points[0], f.surfaces[0])).toBe(true)
        expect(onSurface(room, f.points[1], f.surfaces[1])).toBe(true)
        expect(f.surfaces[0]).not.toBe(f.surfaces[1])
        expect(dist(s, f.points[0]) + dist(f.points[0], f.points[1]) + dist(f.points[1], r)).toBeCloseTo(f.pathLength, 8)
        expect(f.levelDb).toBeCloseTo(20 * Math.log10(dist(s, r) / f.pathLength), 9)
      }
    }), { numRuns: 50 })
  })
  it('reciprocity: swapping source and receiver leaves the delays unchanged (first and second order)', () => {
    fc.assert(fc.property(arbRoomAndPoints, ([room, s, r]) => {
      const a = firstReflections(room, s, r)
      const b = firstReflections(room, r, s)
      a.forEach((x, i) => expect(x.delayMs).toBeCloseTo(b[i].delayMs, 9))
      const a2 = secondOrderReflections(room, s, r).map((x) => x.delayMs)
      const b2 = secondOrderReflections(room, r, s).map((x) => x.delayMs)
      a2.forEach((d, i) => expect(d).toBeCloseTo(b2[i], 9))
    }), { numRuns: 30 })
  })
  it('energy: with α the level drops by exactly Σ 10·lg(1 − αᵢ) over the surfaces met', () => {
    const room = { length: 6, width: 4, height: 2.6 }
    const s = { x: 0.8, y: 1.2, z: 1 }
    const r = { x: 3.5, y: 2, z: 1.1 }
    const alpha = { front: 0.1, back: 0.2, left: 0.3, right: 0.4, floor: 0.5, ceiling: 0.6 }
    const bare = secondOrderReflections(room, s, r)
    const damped = secondOrderReflections(room, s, r, { alpha })
    damped.forEach((d, i) => {
      const loss = d.surfaces.reduce((acc, x) => acc + 10 * Math.log10(1 - alpha[x]), 0)
      expect(d.levelDb).toBeCloseTo(bare[i].levelDb + loss, 9)
      expect(d.levelDb).toBeLessThan(bare[i].levelDb)
    })
  })
  it('second order: floor then ceiling in the check room has its image at z = 2·4 + 2 = 10 m', () => {
    const room = { length: 10, width: 8, height: 4 }
    const fcl = secondOrderReflections(room, { x: 3, y: 4, z: 2 }, { x: 6, y: 4, z: 2 }).filter((x) => x.surfaces.includes('floor') && x.surfaces.includes('ceiling'))
    expect(fcl).toHaveLength(2)
    for (const x of fcl) expect(x.pathLength).toBeCloseTo(Math.hypot(3, 8), 12)
  })
  it('does not mutate its inputs', () => {
    const room = deepFreeze({ length: 6, width: 4, height: 2.6 })
    const s = deepFreeze({ x: 1, y: 1, z: 1 })
    const r = deepFreeze({ x: 4, y: 2, z: 1.2 })
    expect(() => { firstReflections(room, s, r, deepFreeze({ alpha: { left: 0.2 } })); secondOrderReflections(room, s, r); reflectionPanel(room, s, r, 'left') }).not.toThrow()
  })
})

describe('reflection window and panels', () => {
  it('defaults to 20 ms and −20 dB, both settable (common practice, no source)', () => {
    expect(inReflectionWindow({ delayMs: 5, levelDb: -6 })).toBe(true)
    expect(inReflectionWindow({ delayMs: 21, levelDb: -6 })).toBe(false)
    expect(inReflectionWindow({ delayMs: 5, levelDb: -21 })).toBe(false)
    expect(inReflectionWindow({ delayMs: 21, levelDb: -6 }, { windowMs: 25 })).toBe(true)
    expect(inReflectionWindow({ delayMs: 5, levelDb: -12 }, { thresholdDb: -10 })).toBe(false)
  })
  it('a panel is centred on the mirror point and grows with head movement; with none and no margin it shrinks to the point', () => {
    const room = { length: 6, width: 4, height: 2.6 }
    const s = { x: 0.8, y: 1, z: 1 }
    const r = { x: 3.5, y: 2, z: 1.1 }
    const mirror = firstReflections(room, s, r).find((x) => x.surface === 'left')!.point
    const none = reflectionPanel(room, s, r, 'left', { head: { x: 0, y: 0, z: 0 }, marginM: 0 })
    expect(none.widthM).toBeCloseTo(0, 9)
    expect(none.centre.x).toBeCloseTo(mirror.x, 12)
    const p = reflectionPanel(room, s, r, 'left')
    expect(p.min.y).toBe(0)
    expect(p.max.y).toBe(0)
    expect(p.min.x).toBeLessThan(mirror.x)
    expect(p.max.x).toBeGreaterThan(mirror.x)
    expect(p.areaM2).toBeCloseTo(p.widthM * p.heightM, 12)
    const wider = reflectionPanel(room, s, r, 'left', { head: { y: 0.5 } })
    expect(wider.widthM).toBeGreaterThan(p.widthM)
  })
})
