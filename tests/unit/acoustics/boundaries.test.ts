import { describe, expect, it } from 'vitest'
import { boundaryNotches, boundaryResponse, speedOfSound } from '../../../shared/acoustics'
import { celsiusFor, deepFreeze } from './helpers'

describe('boundaryNotches', () => {
  const room = { length: 6, width: 4, height: 2.6 }
  it('gives Allison\'s quarter-wave values, AES preprint 951 (1974): 0.5 m → 171.5 Hz, 1.0 m → 85.75 Hz at 343 m/s', () => {
    const n = boundaryNotches(room, { x: 0.5, y: 1, z: 1.3 }, { celsius: celsiusFor(343) })
    expect(n.find((x) => x.surface === 'front')!.notchHz).toBeCloseTo(171.5, 9)
    expect(n.find((x) => x.surface === 'left')!.notchHz).toBeCloseTo(85.75, 9)
  })
  it('returns one notch per surface; opposite distances add up to the room dimension', () => {
    const n = boundaryNotches(room, { x: 1.2, y: 0.9, z: 1.0 })
    expect(n.map((x) => x.surface)).toEqual(['front', 'back', 'left', 'right', 'floor', 'ceiling'])
    expect(n[0].distance + n[1].distance).toBeCloseTo(6, 12)
    expect(n[2].distance + n[3].distance).toBeCloseTo(4, 12)
    expect(n[4].distance + n[5].distance).toBeCloseTo(2.6, 12)
    for (const x of n) expect(x.notchHz).toBeCloseTo(speedOfSound(20) / (4 * x.distance), 9)
  })
  it('rejects a speaker outside the room', () => {
    expect(() => boundaryNotches(room, { x: 1, y: 1, z: -0.1 })).toThrow('source lies outside the room: z = -0.1 m < 0')
  })
})

describe('boundaryResponse', () => {
  const room = { length: 6, width: 4, height: 2.6 }
  it('near a single wall: +3 dB at low frequencies and the first dip of 1 + sin(2kd)/(2kd) at 2kd ≈ 4.493 (Allison 1974; Waterhouse 1958)', () => {
    const d = 0.5
    const r = boundaryResponse(room, { x: d, y: 2, z: 1.3 }, { surfaces: ['front'], fromHz: 10, toHz: 1000, pointsPerOctave: 96 })
    expect(r.levelDb[0]).toBeGreaterThan(2.9)
    const expectedHz = (4.4934 * speedOfSound(20)) / (4 * Math.PI * d)
    expect(Math.abs(Math.log2(r.deepestNotch.hz / expectedHz))).toBeLessThan(1 / 96)
    expect(r.deepestNotch.levelDb).toBeCloseTo(10 * Math.log10(1 + Math.sin(4.4934) / 4.4934), 2)
  })
  it('in a corner the low-frequency gain approaches 10·lg 8 ≈ 9 dB', () => {
    const r = boundaryResponse(room, { x: 0.05, y: 0.05, z: 0.05 })
    expect(r.surfaces.sort()).toEqual(['floor', 'front', 'left'])
    expect(r.levelDb[0]).toBeCloseTo(10 * Math.log10(8), 1)
    expect(r.freqsHz[0]).toBeCloseTo(20, 9)
    expect(r.freqsHz[r.freqsHz.length - 1]).toBeCloseTo(500, 9)
  })
  it('uses the nearest three surfaces and does not mutate its inputs', () => {
    const src = deepFreeze({ x: 0.4, y: 3.5, z: 2.3 })
    const r = boundaryResponse(deepFreeze({ ...room }), src)
    expect(r.surfaces).toEqual(['ceiling', 'front', 'right'])
  })
})
