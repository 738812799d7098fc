import { describe, expect, it } from 'vitest'
import { analyzeModes } from '../../../shared/acoustics'
import { celsiusFor } from './helpers'

/*
 * Outside check of Bonello's criterion (Bonello, JAES 29(9), 1981; wording from memory, as in REFERENCES.md:
 * the number of modes per one-third-octave band must not decrease from band to band, and coincident modes
 * are tolerated only in bands holding at least 5 modes). The modes are enumerated here by brute force from
 * the Rayleigh formula f = (c/2)·√((nx/Lx)² + (ny/Ly)² + (nz/Lz)²) and binned into the IEC 61260-1:2014
 * base-10 one-third-octave bands (exact mid-band 1000·10^(k/10) Hz, edges mid·10^(∓1/20)), independently
 * of the engine. The coincidence tolerance (1/24 octave of the lowest mode of a group) is our own choice,
 * documented in analyzeModes; it is applied here the same way.
 */
type Room = { length: number; width: number; height: number }
function rayleigh(room: Room, c: number, maxHz: number): number[] {
  const out: number[] = []
  for (let nx = 0; nx <= 40; nx++) for (let ny = 0; ny <= 40; ny++) for (let nz = 0; nz <= 40; nz++) {
    if (nx + ny + nz === 0) continue
    const f = (c / 2) * Math.hypot(nx / room.length, ny / room.width, nz / room.height)
    if (f <= maxHz) out.push(f)
  }
  return out.sort((a, b) => a - b)
}
const NOMINAL = [16, 20, 25, 31.5, 40, 50, 63, 80, 100, 125, 160, 200]
const bandOf = (nominal: number) => {
  const mid = 1000 * 10 ** (Math.round(10 * Math.log10(nominal / 1000)) / 10)
  return { nominal, lo: mid * 10 ** -0.05, hi: mid * 10 ** 0.05 }
}
function bonelloByHand(room: Room, c: number) {
  const bands = NOMINAL.map(bandOf)
  const f = rayleigh(room, c, bands[bands.length - 1].hi)
  const coincident = new Set<number>()
  for (let i = 0; i < f.length;) {
    let j = i + 1
    while (j < f.length && f[j] <= f[i] * 2 ** (1 / 24)) j++
    if (j - i > 1) for (let k = i; k < j; k++) coincident.add(k)
    i = j
  }
  const rows = bands.map((b) => {
    const idx = f.map((x, i) => [x, i] as const).filter(([x]) => x >= b.lo && x < b.hi)
    return { ...b, count: idx.length, coincident: idx.filter(([, i]) => coincident.has(i)).length }
  })
  const first = rows.findIndex((r) => r.count > 0)
  const decreasing = rows.filter((r, i) => i > first && r.count < rows[i - 1].count).map((r) => r.nominal)
  const badCoincidence = rows.filter((r, i) => i >= first && r.coincident > 0 && r.count < 5).map((r) => r.nominal)
  return { rows, decreasing, badCoincidence, passes: decreasing.length === 0 && badCoincidence.length === 0, f }
}

describe("Bonello's criterion against hand-counted Rayleigh modes per IEC 61260-1 third-octave band", () => {
  const long = { length: 7, width: 5, height: 3 }
  const c = 344.7 // the printed values of Long's Table 8.1 fit c ≈ 344.7 m/s (REFERENCES.md)

  it('Long, Architectural Acoustics 2e, Table 8.1 (7 × 5 × 3 m): the first six modes are 24.6, 34.5, 42.4, 49.2, 57.4, 60.1 Hz', () => {
    const f = rayleigh(long, c, 61)
    // printed to 0.1 Hz: agree within half a digit plus the c rounding
    ;[24.6, 34.5, 42.4, 49.2, 57.4, 60.1].forEach((x, i) => expect(Math.abs(f[i] - x)).toBeLessThanOrEqual(0.06))
  })
  it('Long Table 8.1 by hand: its modes 24.6, 34.5, 42.4, 49.2 Hz fall one each into the 25, 31.5, 40 and 50 Hz bands, and 57.4, 60.1 Hz open the 63 Hz band', () => {
    const a = analyzeModes(long, { celsius: celsiusFor(c) })
    const count = (hz: number) => a.thirdOctaveBands.find((b) => b.centerHz === hz)!.count
    expect([16, 20, 25, 31.5, 40, 50].map(count)).toEqual([0, 0, 1, 1, 1, 1])
    expect(count(63)).toBeGreaterThanOrEqual(2)
  })
  for (const [name, room, cc] of [
    ['Long Table 8.1 room 7 × 5 × 3 m', long, c],
    ['a cube 4 × 4 × 4 m (three coincident axial modes in the 40 Hz band)', { length: 4, width: 4, height: 4 }, 343],
    ['a room at Bolt’s ratio 1 : 1.26 : 1.59, height 2.5 m', { length: 2.5 * 1.59, width: 2.5 * 1.26, height: 2.5 }, 343],
    ['a listening room 5.2 × 3.9 × 2.6 m', { length: 5.2, width: 3.9, height: 2.6 }, 343],
    ['a corridor 8 × 2 × 2.4 m (empty bands between its first axial modes)', { length: 8, width: 2, height: 2.4 }, 343],
    ['a room 6 × 6 × 3 m (square plan)', { length: 6, width: 6, height: 3 }, 343],
  ] as [string, Room, number][]) {
    it(`${name}: the engine's band counts, decreasing bands, coincidence bands and verdict equal the hand count`, () => {
      const hand = bonelloByHand(room, cc)
      const a = analyzeModes(room, { celsius: celsiusFor(cc), analysisMaxHz: 200 })
      expect(a.thirdOctaveBands.map((b) => b.centerHz)).toEqual(NOMINAL)
      a.thirdOctaveBands.forEach((b, i) => {
        expect(b.lowHz).toBeCloseTo(hand.rows[i].lo, 9)
        expect(b.highHz).toBeCloseTo(hand.rows[i].hi, 9)
        expect(b.count, `modes in the ${b.centerHz} Hz band`).toBe(hand.rows[i].count)
        expect(b.coincidentModes, `coincident modes in the ${b.centerHz} Hz band`).toBe(hand.rows[i].coincident)
      })
      expect(a.bonello.decreasingAtHz).toEqual(hand.decreasing)
      expect(a.bonello.coincidentAtHz).toEqual(hand.badCoincidence)
      expect(a.bonello.passes).toBe(hand.passes)
    })
  }
  it('a corridor 8 × 2 × 2.4 m fails on decrease, by hand: its first modes are the length axials 343/16 = 21.4 Hz (20 Hz band) and 42.9 Hz (40 Hz band), the next being 71.5 Hz (height), so the 25 and 50 Hz bands are empty after a filled band', () => {
    const a = analyzeModes({ length: 8, width: 2, height: 2.4 }, { celsius: celsiusFor(343) })
    expect(a.bonello.decreasingAtHz).toEqual([25, 50])
    expect(a.bonello.passes).toBe(false)
  })
  it('a cube fails on coincidence: its 40 Hz band holds exactly the three axial modes at c/(2L) = 42.9 Hz (hand count)', () => {
    const a = analyzeModes({ length: 4, width: 4, height: 4 }, { celsius: celsiusFor(343) })
    const b40 = a.thirdOctaveBands.find((b) => b.centerHz === 40)!
    expect(b40.count).toBe(3)
    expect(b40.coincidentModes).toBe(3)
    expect(a.bonello.coincidentAtHz).toContain(40)
    expect(a.bonello.passes).toBe(false)
  })
})
