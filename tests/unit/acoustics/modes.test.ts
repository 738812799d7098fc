import fc from 'fast-check'
import { describe, expect, it } from 'vitest'
import { analyzeModes, compareRatios, modalDensity, modalResponse, modeCountEstimate, modePressure, roomModes, speedOfSound, MODAL_CONVERGENCE_DB } from '../../../shared/acoustics'
import { readFileSync } from 'node:fs'
import { celsiusFor, deepFreeze } from './helpers'

const FT = 0.3048

describe('roomModes', () => {
  it('reproduces the axial-mode table of the Handbook for Sound Engineers (Ballou), "Small Room Acoustics": 16 × 12 × 8 ft at 1130 ft/s', () => {
    const room = { length: 16 * FT, width: 12 * FT, height: 8 * FT }
    const modes = roomModes(room, { maxHz: 150, celsius: celsiusFor(1130 * FT) })
    const axial = (axis: number) => modes.filter((m) => m.kind === 'axial' && m.n[axis] > 0).map((m) => m.hz)
    expect(axial(0).slice(0, 3).map((f) => +f.toFixed(2))).toEqual([35.31, 70.63, 105.94])
    expect(axial(1).slice(0, 3).map((f) => +f.toFixed(2))).toEqual([47.08, 94.17, 141.25])
    expect(axial(2).slice(0, 2).map((f) => +f.toFixed(2))).toEqual([70.63, 141.25])
  })

  it('reproduces Long, Architectural Acoustics 2e, Table 8.1: 7 × 5 × 3 m, first six modes (printed values fit c ≈ 344.7 m/s)', () => {
    const modes = roomModes({ length: 7, width: 5, height: 3 }, { maxHz: 61, celsius: celsiusFor(344.7) })
    const expected = [24.6, 34.5, 42.4, 49.2, 57.4, 60.1]
    expect(modes).toHaveLength(6)
    modes.forEach((m, i) => expect(Math.abs(m.hz - expected[i])).toBeLessThan(0.06))
    expect(modes.map((m) => m.n)).toEqual([[1, 0, 0], [0, 1, 0], [1, 1, 0], [2, 0, 0], [0, 0, 1], [2, 1, 0]])
  })

  it('invariant: every axial mode is n·c/(2L), and kinds follow the count of non-zero indices', () => {
    fc.assert(fc.property(
      fc.double({ min: 2, max: 12, noNaN: true }), fc.double({ min: 2, max: 12, noNaN: true }), fc.double({ min: 2, max: 5, noNaN: true }),
      (l, w, h) => {
        const room = { length: l, width: w, height: h }
        const c = speedOfSound(20)
        const modes = roomModes(room, { maxHz: 200 })
        for (const m of modes) {
          const nz = m.n.filter((v) => v > 0).length
          expect(m.kind).toBe(nz === 1 ? 'axial' : nz === 2 ? 'tangential' : 'oblique')
          if (m.kind === 'axial') {
            const axis = m.n.findIndex((v) => v > 0)
            expect(m.hz).toBeCloseTo((m.n[axis] * c) / (2 * [l, w, h][axis]), 9)
          }
        }
        for (let i = 1; i < modes.length; i++) expect(modes[i].hz).toBeGreaterThanOrEqual(modes[i - 1].hz)
        expect(modes.every((m) => m.hz > 0 && m.hz <= 200)).toBe(true)
        // completeness: every axial mode up to 200 Hz is listed
        const axialCount = modes.filter((m) => m.kind === 'axial').length
        const expected = [l, w, h].reduce((s, d) => s + Math.floor((2 * d * 200) / c + 1e-9), 0)
        expect(axialCount).toBe(expected)
      },
    ), { numRuns: 40 })
  })

  it('counts modes in line with the asymptotic formula N ≈ 4πVf³/(3c³) + πSf²/(4c²) + Lf/(8c) (Kuttruff, Room Acoustics) within 5 % at 500 Hz', () => {
    const room = { length: 7, width: 5, height: 3 }
    const counted = roomModes(room, { maxHz: 500 }).length
    const predicted = modeCountEstimate(room, 500)
    expect(Math.abs(counted - predicted) / predicted).toBeLessThan(0.05)
  })

  it('gives ≈ 34 modes per Hz at 1 kHz for the 7 × 5 × 3 m room (Long, Architectural Acoustics 2e, eq. 8.46, c = 344)', () => {
    expect(modalDensity({ length: 7, width: 5, height: 3 }, 1000, celsiusFor(344))).toBeCloseTo(34.3, 1)
  })

  it('rejects impossible input with a RangeError naming the value', () => {
    expect(() => roomModes({ length: -3, width: 4, height: 2.5 }, { maxHz: 100 })).toThrow(/room length must be greater than zero: got -3 m/)
    expect(() => roomModes({ length: 3, width: Number.NaN, height: 2.5 }, { maxHz: 100 })).toThrow(/room width must be a finite number: got NaN/)
    expect(() => roomModes({ length: 3, width: 4, height: 2.5 }, { maxHz: 0 })).toThrow(/maxHz must be greater than zero/)
  })
})

describe('modePressure', () => {
  const room = { length: 6, width: 4, height: 2.5 }
  it('is ±1 in every corner and 0 on nodal planes (cosine mode shapes)', () => {
    for (const n of [[1, 0, 0], [2, 3, 1], [0, 1, 2]] as [number, number, number][]) {
      expect(Math.abs(modePressure(room, n, { x: 0, y: 0, z: 0 }))).toBeCloseTo(1, 12)
      expect(Math.abs(modePressure(room, n, { x: 6, y: 4, z: 2.5 }))).toBeCloseTo(1, 12)
    }
    expect(modePressure(room, [1, 0, 0], { x: 3, y: 1, z: 1 })).toBeCloseTo(0, 12)
    expect(modePressure(room, [2, 0, 0], { x: 1.5, y: 1, z: 1 })).toBeCloseTo(0, 12)
    expect(modePressure(room, [2, 0, 0], { x: 3, y: 1, z: 1 })).toBeCloseTo(-1, 12)
  })
  it('rejects a point outside the room', () => {
    expect(() => modePressure(room, [1, 0, 0], { x: 7.2, y: 1, z: 1 })).toThrow('point lies outside the room: x = 7.2 m > length 6 m')
  })
})

describe('analyzeModes', () => {
  it('finds the 70.63 Hz coincidence of the Ballou 16 × 12 × 8 ft room (length n = 2, height n = 1) and its < 5 Hz axial gap', () => {
    const room = { length: 16 * FT, width: 12 * FT, height: 8 * FT }
    const a = analyzeModes(room, { celsius: celsiusFor(1130 * FT) })
    const g = a.coincidences.find((c) => Math.abs(c.hz - 70.63) < 0.5)
    expect(g).toBeDefined()
    expect(g!.axialCount).toBe(2)
    expect(a.axialGaps.gaps.some((x) => x.verdict === 'close' && Math.abs(x.lowHz - 70.63) < 0.01)).toBe(true)
    expect(a.axialGaps.meetsGuidance).toBe(false)
    expect(a.coincidenceTolerance.percent).toBeCloseTo((2 ** (1 / 24) - 1) * 100, 9)
  })
  it('fails Bonello for a cube (triple coincidences in sparse bands) and flags Walker failures', () => {
    const a = analyzeModes({ length: 3, width: 3, height: 3 })
    expect(a.bonello.passes).toBe(false)
    expect(a.bonello.coincidentAtHz.length).toBeGreaterThan(0)
    expect(a.ratios.walker.passes).toBe(false)
  })
  it('counts modes per one-third octave exactly as listed by roomModes', () => {
    const room = { length: 5.8, width: 4.1, height: 2.5 }
    const a = analyzeModes(room)
    const modes = roomModes(room, { maxHz: 250 })
    for (const b of a.thirdOctaveBands) expect(b.count).toBe(modes.filter((m) => m.hz >= b.lowHz && m.hz < b.highHz).length)
    const nonDecreasing = a.thirdOctaveBands.every((b, i, arr) => i === 0 || arr[i - 1].count === 0 && b.count >= 0 || b.count >= arr[i - 1].count)
    expect(a.bonello.decreasingAtHz.length === 0).toBe(nonDecreasing)
  })
  it('recognises a room built to the cube-root-of-two ratio 1 : 2^(1/3) : 2^(2/3) = 1 : 1.26 : 1.59 (closed form), labelled by what it is', () => {
    const r = compareRatios({ length: 2.4 * 1.59, width: 2.4 * 1.26, height: 2.4 })
    expect(r.nearest.name).toMatch(/^Cube-root-of-two ratio/)
    expect(r.nearest.name).not.toMatch(/Bolt/)
    expect(r.nearest.ratio[1]).toBeCloseTo(2 ** (1 / 3), 2)
    expect(r.nearest.ratio[2]).toBeCloseTo(2 ** (2 / 3), 2)
    expect(r.nearest.distance).toBeCloseTo(0, 9)
    expect(r.normalised[1]).toBeCloseTo(1.26, 9)
  })
  it('applies Walker\'s criterion (BBC RD 1993/8, from memory): a 2 : 1 plan fails on the integer ratio', () => {
    const r = compareRatios({ length: 6, width: 3, height: 2.4 })
    expect(r.walker.failures.some((f) => f.startsWith('l/w = 2.00'))).toBe(true)
  })
})

describe('modalResponse', () => {
  const room = { length: 5.8, width: 4.1, height: 2.5 }
  const spk = { x: 0.7, y: 1.1, z: 0.9 }
  const seat = { x: 3.6, y: 2.3, z: 1.1 }
  it('covers 15–300 Hz on a log grid and reports a non-negative spread', () => {
    const r = modalResponse(room, spk, seat)
    expect(r.freqsHz[0]).toBeCloseTo(15, 9)
    expect(r.freqsHz[r.freqsHz.length - 1]).toBeCloseTo(300, 9)
    expect(r.spreadDb).toBeGreaterThan(0)
    expect(r.rawSpreadDb).toBeGreaterThanOrEqual(r.spreadDb)
    expect(r.levelDb).toHaveLength(r.freqsHz.length)
  })
  it('invariant: reciprocity — swapping speaker and seat gives the same response', () => {
    const a = modalResponse(room, spk, seat)
    const b = modalResponse(room, seat, spk)
    a.levelDb.forEach((v, i) => expect(v).toBeCloseTo(b.levelDb[i], 9))
  })
  it('more damping (shorter RT) flattens the response', () => {
    const dry = modalResponse(room, spk, seat, { rt60: 0.15 })
    const live = modalResponse(room, spk, seat, { rt60: 1.0 })
    expect(dry.spreadDb).toBeLessThan(live.spreadDb)
  })
  it('a speaker on the nodal plane of the first length mode does not excite it', () => {
    // 15–30 Hz holds only the first length mode (21.4 Hz); the modes up to 200 Hz form the background
    const opts = { fromHz: 15, toHz: 30, modalMaxHz: 200, rt60: 2 }
    const c = speedOfSound(20)
    const f1 = c / (2 * 8)
    const long = { length: 8, width: 3.1, height: 2.3 }
    const atNode = modalResponse(long, { x: 4, y: 1.2, z: 0.9 }, { x: 0.2, y: 1.4, z: 1.1 }, opts)
    const atWall = modalResponse(long, { x: 0.2, y: 1.2, z: 0.9 }, { x: 0.2, y: 1.4, z: 1.1 }, opts)
    const i = atWall.freqsHz.findIndex((f) => f >= f1)
    expect(atWall.levelDb[i] - atWall.levelDb[0]).toBeGreaterThan(atNode.levelDb[i] - atNode.levelDb[0] + 10)
  })
  it('does not mutate its inputs', () => {
    const args = deepFreeze({ room: { ...room }, spk: [{ ...spk }], seat: { ...seat } })
    expect(() => modalResponse(args.room, args.spk, args.seat, { rt60: [{ hz: 125, seconds: 0.5 }, { hz: 250, seconds: 0.4 }] })).not.toThrow()
  })
  it('rejects a seat outside the room and an empty source list', () => {
    expect(() => modalResponse(room, spk, { x: 1, y: 5, z: 1 })).toThrow('receiver lies outside the room: y = 5 m > width 4.1 m')
    expect(() => modalResponse(room, [], seat)).toThrow(RangeError)
  })
})

describe('modalResponse — outside checks', () => {
  it('a thin tube (only axial length modes in range) matches the analytic 1-D standing-wave solution −cos(kx<)·cos(k(L−x>))/(k·sin kL) (Kinsler et al., Fundamentals of Acoustics, rigid-ended pipe; Morse & Ingard, Theoretical Acoustics §9.2)', () => {
    // cross-section 0.05 m: the first cross mode lies at c/(2·0.05) ≈ 3.4 kHz, far above the summed modes
    const L = 4.3
    const tube = { length: L, width: 0.05, height: 0.05 }
    const xs = 0.7, xr = 3.1
    const src = { x: xs, y: 0.025, z: 0.025 }
    const rec = { x: xr, y: 0.025, z: 0.025 }
    const c = speedOfSound(20)
    const r = modalResponse(tube, src, rec, { fromHz: 20, toHz: 200, rt60: 1000, smoothingOctaves: 0 })
    // u'' + k²u = −δ(x − xs) with u' = 0 at both ends: u = −cos(k·xs)·cos(k(L − xr))/(k·sin kL) (xs < xr), whose
    // modal form is Σ_{n≥0} ε_n cos(nπxs/L) cos(nπxr/L) / (L(k_n² − k²)); the engine leaves out the (0,0,0) mode,
    // whose term is −1/(Lk²), so the engine's sum is u + 1/(Lk²)
    const G = (k: number) => -(Math.cos(k * xs) * Math.cos(k * (L - xr))) / (k * Math.sin(k * L)) + 1 / (L * k * k)
    const analytic = r.freqsHz.map((f) => 20 * Math.log10(Math.abs(G((2 * Math.PI * f) / c))))
    // compare level differences against a reference point between resonances (the engine normalises to its mean)
    const modesHz = [1, 2, 3, 4, 5].map((n) => (n * c) / (2 * L))
    const clear = r.freqsHz.map((f, i) => modesHz.every((m) => Math.abs(f - m) / m > 0.06) && Math.abs(analytic[i]) < 1e6)
    const ref = r.freqsHz.findIndex((f, i) => clear[i] && f > 60)
    let checked = 0
    r.freqsHz.forEach((f, i) => {
      if (!clear[i]) return
      const diffEngine = r.levelDb[i] - r.levelDb[ref]
      const diffAnalytic = analytic[i] - analytic[ref]
      if (diffAnalytic < -30) return // skip the deep nulls, where a 0.1 % error is many dB
      expect(Math.abs(diffEngine - diffAnalytic), `${f.toFixed(1)} Hz`).toBeLessThan(0.1)
      checked++
    })
    expect(checked).toBeGreaterThan(50)
  })

  it(`has converged: doubling the modal cut-off moves the spread by less than the documented ${MODAL_CONVERGENCE_DB} dB (the fixture rooms and a speaker close to the seat)`, () => {
    for (const name of ['den', 'basement', 'loft']) {
      const d = JSON.parse(readFileSync(`tests/fixtures/engine/${name}.input.json`, 'utf8'))
      const bass = d.subwoofers?.length ? d.subwoofers : d.speakers
      const a = modalResponse(d, bass, d.seats[0], { rt60: 0.45 })
      const b = modalResponse(d, bass, d.seats[0], { rt60: 0.45, modalMaxHz: 2 * 3 * 300 })
      expect(Math.abs(a.spreadDb - b.spreadDb), name).toBeLessThan(MODAL_CONVERGENCE_DB)
      a.smoothedDb.forEach((v, i) => expect(Math.abs(v - b.smoothedDb[i])).toBeLessThan(0.3))
    }
    const near = modalResponse({ length: 6, width: 4.5, height: 2.6 }, { x: 1, y: 1.5, z: 1 }, { x: 2.2, y: 1.9, z: 1.1 }, { rt60: 0.3 })
    const near2 = modalResponse({ length: 6, width: 4.5, height: 2.6 }, { x: 1, y: 1.5, z: 1 }, { x: 2.2, y: 1.9, z: 1.1 }, { rt60: 0.3, modalMaxHz: 1800 })
    expect(Math.abs(near.spreadDb - near2.spreadDb)).toBeLessThan(MODAL_CONVERGENCE_DB)
  })

  it('smoothing is a power average over linear frequency between the 1/6-octave band edges f·2^(∓1/12), checked against a dense direct evaluation', () => {
    const room = { length: 5.8, width: 4.1, height: 2.5 }
    const spk = { x: 0.7, y: 1.1, z: 0.9 }
    const seat = { x: 3.6, y: 2.3, z: 1.1 }
    const r = modalResponse(room, spk, seat, { rt60: 0.4 })
    const raw = modalResponse(room, spk, seat, { rt60: 0.4, smoothingOctaves: 0 })
    // mean power of the whole curve, from the unsmoothed levels (both curves share it)
    for (const f0 of [40, 63, 97, 150, 230]) {
      const i = r.freqsHz.findIndex((f) => f >= f0)
      const fc = r.freqsHz[i]
      const lo = fc * 2 ** (-1 / 12), hi = fc * 2 ** (1 / 12)
      // independent: 2000 linearly spaced frequencies across the band, each from its own modal sum
      const dense = modalResponse(room, spk, seat, { rt60: 0.4, fromHz: lo, toHz: hi, pointsPerOctave: 2000 * 6, smoothingOctaves: 0, modalMaxHz: 900 })
      // the dense grid is log-spaced: weight each point by its share of linear frequency
      let num = 0, den = 0
      for (let k = 1; k < dense.freqsHz.length; k++) {
        const w = dense.freqsHz[k] - dense.freqsHz[k - 1]
        num += 0.5 * (10 ** (dense.levelDb[k] / 10) + 10 ** (dense.levelDb[k - 1] / 10)) * w
        den += w
      }
      // dense levels are relative to the dense curve's own mean: put both on an absolute footing via a shared point
      const j = dense.freqsHz.findIndex((f) => f >= fc)
      const offset = raw.levelDb[i] - dense.levelDb[j] // same frequency (to 1e-6), so the same absolute power
      const expected = 10 * Math.log10(num / den) + offset
      expect(Math.abs(r.smoothedDb[i] - expected), `${f0} Hz`).toBeLessThan(0.15)
    }
  })
})
