import { describe, expect, it } from 'vitest'
import { modalResponse, roomModes, searchSubwoofers, subwooferCandidates, subwooferLayoutResponse, speedOfSound } from '../../../shared/acoustics'
import { deepFreeze } from './helpers'

const room = { length: 6.0, width: 4.5, height: 2.7 }
// a row of three seats across the room (a sofa), ear height 1.1 m
const seats = [1.65, 2.25, 2.85].map((y) => ({ x: 3.6, y, z: 1.1 }))
const z = 0.3

/**
 * An independent evaluation of the modal model the search claims to use (Kuttruff, Room Acoustics,
 * ch. 3): p(f) = Σ_m g_m·ψ_m(source)·ψ_m(seat)·(2^(non-zero indices)/V) / (ω² − ω_m² − 2jδω_m), δ = 3·ln10/T,
 * every mode up to modalMaxHz (the engine's default, 3 × the band's top), g_m the raised-cosine taper over
 * its top octave that ModalResponseOptions documents, summed directly (the engine sums the far modes
 * through a power series, exact to about 1e-5); then Welti & Devantier's (JAES 54(5), 2006) seat-to-seat variation: the
 * standard deviation across seats of the level in dB at each frequency, averaged over the band.
 */
const cache = new Map<number, { modes: ReturnType<typeof roomModes>; hRe: Float64Array[]; hIm: Float64Array[]; F: number }>()
function terms(rt60: number) {
  let t = cache.get(rt60)
  if (t) return t
  const modalMaxHz = 3 * 120
  const modes = roomModes(room, { maxHz: modalMaxHz })
  const taper = (hz: number) => (hz <= modalMaxHz / 2 ? 1 : 0.5 * (1 + Math.cos((Math.PI * (hz - modalMaxHz / 2)) / (modalMaxHz / 2))))
  const V = room.length * room.width * room.height
  const F = Math.round(Math.log2(120 / 20) * 48) + 1
  const freqs = Array.from({ length: F }, (_, i) => 20 * 6 ** (i / (F - 1)))
  const hRe: Float64Array[] = []
  const hIm: Float64Array[] = []
  for (const m of modes) {
    const nz = m.n.filter((v) => v > 0).length
    const wm = 2 * Math.PI * m.hz
    const b = 2 * ((3 * Math.LN10) / rt60) * wm
    const re = new Float64Array(F)
    const im = new Float64Array(F)
    freqs.forEach((f, i) => {
      const w = 2 * Math.PI * f
      const a = w * w - wm * wm
      const k = (taper(m.hz) * 2 ** nz) / V / (a * a + b * b)
      re[i] = a * k
      im[i] = b * k
    })
    hRe.push(re)
    hIm.push(im)
  }
  t = { modes, hRe, hIm, F }
  cache.set(rt60, t)
  return t
}

function independentSeatToSeat(positions: { x: number; y: number; z: number }[], gainsDb: number[], o: { rt60: number }) {
  const { modes, hRe, hIm, F } = terms(o.rt60)
  const shape = (n: number[], p: { x: number; y: number; z: number }) =>
    Math.cos((n[0] * Math.PI * p.x) / room.length) * Math.cos((n[1] * Math.PI * p.y) / room.width) * Math.cos((n[2] * Math.PI * p.z) / room.height)
  const levels = seats.map((s) => {
    const re = new Float64Array(F)
    const im = new Float64Array(F)
    modes.forEach((m, k) => {
      const src = positions.reduce((acc, p, i) => acc + 10 ** (gainsDb[i] / 20) * shape(m.n, p), 0)
      const w = src * shape(m.n, s)
      for (let f = 0; f < F; f++) { re[f] += w * hRe[k][f]; im[f] += w * hIm[k][f] }
    })
    return Array.from(re, (r, f) => r * r + im[f] * im[f])
  })
  const mean = levels.flat().reduce((a, b) => a + b, 0) / (F * seats.length)
  const db = levels.map((row) => row.map((p) => 10 * Math.log10(Math.max(p, mean * 1e-6))))
  let sum = 0
  for (let f = 0; f < F; f++) {
    const col = db.map((row) => row[f])
    const m = col.reduce((a, b) => a + b, 0) / col.length
    sum += Math.sqrt(col.reduce((a, v) => a + (v - m) ** 2, 0) / col.length)
  }
  return sum / F
}

describe('subwooferCandidates', () => {
  it('lies along the walls at 0.3 m, with every corner and every wall midpoint, each once', () => {
    const c = subwooferCandidates(room)
    const has = (x: number, y: number) => c.some((p) => Math.abs(p.x - x) < 1e-9 && Math.abs(p.y - y) < 1e-9)
    for (const [x, y] of [[0, 0], [6, 0], [0, 4.5], [6, 4.5], [0, 2.25], [6, 2.25], [3, 0], [3, 4.5]]) expect(has(x, y), `${x}, ${y}`).toBe(true)
    expect(c.every((p) => p.z === 0.3 && (p.x === 0 || p.x === 6 || p.y === 0 || p.y === 4.5))).toBe(true)
    expect(new Set(c.map((p) => `${p.x},${p.y}`)).size).toBe(c.length)
  })
  it('keeps the far corners inside a room whose width does not divide evenly in binary (3.7 m: 3.7·6/6 rounds past 3.7)', () => {
    const r = { length: 5.2, width: 3.7, height: 2.4 }
    const c = subwooferCandidates(r)
    expect(c.every((p) => p.x <= r.length && p.y <= r.width)).toBe(true)
    expect(() => searchSubwoofers(r, [{ x: 3.1, y: 1.85, z: 1.1 }], { counts: [1] })).not.toThrow()
  })
})

describe('searchSubwoofers', () => {
  const corner = [{ x: 0, y: 0, z }]
  const opposite = [{ x: 0, y: 2.25, z }, { x: 6, y: 2.25, z }]

  it('two subwoofers at the midpoints of opposite walls cut seat-to-seat variation well below one corner subwoofer for a row across the room (Welti & Devantier, JAES 54(5), 2006)', () => {
    const one = subwooferLayoutResponse(room, seats, { positions: corner })
    const two = subwooferLayoutResponse(room, seats, { positions: opposite })
    expect(two.seatToSeatDb).toBeLessThan(0.5 * one.seatToSeatDb)
    // the search, whose candidates hold both layouts, does at least as well with the same count
    const r = searchSubwoofers(room, seats, { counts: [1, 2] })
    expect(r.best.map((b) => b.count)).toEqual([1, 2])
    expect(r.best[1].layout.seatToSeatDb).toBeLessThanOrEqual(two.seatToSeatDb + 1e-9)
    expect(r.best[1].layout.seatToSeatDb).toBeLessThan(0.5 * one.seatToSeatDb)
    expect(r.best[0].layout.seatToSeatDb).toBeLessThanOrEqual(one.seatToSeatDb + 1e-9)
  })

  it('four subwoofers at the four wall midpoints cut it well below one corner subwoofer too, over 20–80 Hz (Welti & Devantier, JAES 54(5), 2006; the band of their comparison from memory)', () => {
    const four = [...opposite, { x: 3, y: 0, z }, { x: 3, y: 4.5, z }]
    const o = { toHz: 80 }
    const one = subwooferLayoutResponse(room, seats, { positions: corner }, o)
    expect(subwooferLayoutResponse(room, seats, { positions: four }, o).seatToSeatDb).toBeLessThan(0.5 * one.seatToSeatDb)
    expect(subwooferLayoutResponse(room, seats, { positions: opposite }, o).seatToSeatDb).toBeLessThan(0.5 * one.seatToSeatDb)
    // the search over the same band finds a four-subwoofer layout at least as even
    const r = searchSubwoofers(room, seats, { ...o, counts: [4] })
    expect(r.best[0].layout.seatToSeatDb).toBeLessThanOrEqual(subwooferLayoutResponse(room, seats, { positions: four }, o).seatToSeatDb + 1e-9)
  })

  it('the figures a layout promises equal the modal model: the spread of modalResponse at each seat, and an independent modal sum for the seat-to-seat variation with unequal levels', () => {
    const o = { rt60: 0.45 }
    const r = searchSubwoofers(room, seats, { ...o, counts: [2, 4], gainStepsDb: [0, -4, -8] })
    for (const { layout } of r.best) {
      expect(layout.seatToSeatDb).toBeCloseTo(independentSeatToSeat(layout.positions, layout.gainsDb, o), 3)
      expect(Math.max(...layout.gainsDb)).toBe(0)
    }
    // equal levels: the mean spread is the mean of modalResponse's spread over the seats, exactly
    const eq = subwooferLayoutResponse(room, seats, { positions: opposite }, o)
    const spreads = seats.map((s) => modalResponse(room, opposite, s, { ...o, fromHz: 20, toHz: 120 }).spreadDb)
    expect(eq.meanSpreadDb).toBeCloseTo(spreads.reduce((a, b) => a + b, 0) / spreads.length, 9)
    eq.seats.forEach((s, i) => expect(s.spreadDb).toBeCloseTo(spreads[i], 9))
    expect(eq.seatToSeatDb).toBeCloseTo(independentSeatToSeat(opposite, [0, 0], o), 3)
  })

  it('finds what a brute-force search over the same candidates and levels finds, on a small grid', () => {
    const o = { rt60: 0.4 }
    const candidates = [{ x: 0, y: 0, z }, { x: 0, y: 2.25, z }, { x: 3, y: 0, z }, { x: 6, y: 4.5, z }, { x: 6, y: 2.25, z }, { x: 3, y: 4.5, z }]
    const steps = [0, -4, -8]
    const r = searchSubwoofers(room, seats, { ...o, counts: [1, 2, 3], candidates, gainStepsDb: steps })
    for (const k of [1, 2, 3]) {
      let best = { s: Infinity, positions: [] as typeof candidates, gains: [] as number[] }
      const pick = (start: number, chosen: number[]) => {
        if (chosen.length === k) {
          const gainSets = (n: number): number[][] => (n === 0 ? [[]] : gainSets(n - 1).flatMap((g) => steps.map((s) => [...g, s])))
          for (const g of gainSets(k).filter((g) => g.includes(0))) {
            const pos = chosen.map((i) => candidates[i])
            const s = independentSeatToSeat(pos, g, o)
            if (s < best.s - 1e-9) best = { s, positions: pos, gains: g }
          }
          return
        }
        for (let i = start; i < candidates.length; i++) pick(i + 1, [...chosen, i])
      }
      pick(0, [])
      const got = r.best.find((b) => b.count === k)!.layout
      expect(got.seatToSeatDb).toBeCloseTo(best.s, 3)
    }
  })

  it('beyond the exhaustive limit, refines levels from the best equal-level position sets: never worse than equal levels, never better than trying everything', () => {
    const o = { rt60: 0.4 }
    const candidates = subwooferCandidates(room, { spacing: 1.5 })
    const steps = [0, -3, -6]
    const full = searchSubwoofers(room, seats, { ...o, counts: [2], candidates, gainStepsDb: steps })
    const quick = searchSubwoofers(room, seats, { ...o, counts: [2], candidates, gainStepsDb: steps, exhaustiveLimit: 0 })
    const equal = searchSubwoofers(room, seats, { ...o, counts: [2], candidates, gainStepsDb: [0] })
    expect(quick.best[0].layout.seatToSeatDb).toBeLessThanOrEqual(equal.best[0].layout.seatToSeatDb + 1e-9)
    expect(quick.best[0].layout.seatToSeatDb).toBeGreaterThanOrEqual(full.best[0].layout.seatToSeatDb - 1e-9)
  })

  it("ranks by seat-to-seat variation, then by mean spread (one seat: spread alone), and reports the room's own subwoofers as current", () => {
    const one = [seats[1]]
    const r = searchSubwoofers(room, one, { counts: [1], current: corner })
    expect(r.best[0].layout.seatToSeatDb).toBe(0)
    const all = subwooferCandidates(room).map((p) => subwooferLayoutResponse(room, one, { positions: [p] }).meanSpreadDb)
    expect(r.best[0].layout.meanSpreadDb).toBeCloseTo(Math.min(...all), 9)
    expect(r.current).not.toBeNull()
    expect(r.current!.meanSpreadDb).toBeCloseTo(subwooferLayoutResponse(room, one, { positions: corner }).meanSpreadDb, 9)
    expect(searchSubwoofers(room, one, { counts: [1] }).current).toBeNull()
  })

  it('does not mutate its inputs; throws a RangeError for impossible input', () => {
    expect(() => searchSubwoofers(deepFreeze({ ...room }), deepFreeze(seats.map((s) => ({ ...s }))), { counts: [1] })).not.toThrow()
    expect(() => searchSubwoofers(room, [])).toThrow(RangeError)
    expect(() => searchSubwoofers(room, [{ x: 7, y: 1, z: 1 }])).toThrow('seat 1 lies outside the room')
    expect(() => searchSubwoofers(room, seats, { counts: [0] })).toThrow(RangeError)
    expect(() => searchSubwoofers(room, seats, { fromHz: 120, toHz: 20 })).toThrow(RangeError)
    expect(speedOfSound()).toBeCloseTo(343.21, 2) // the model's c (REFERENCES.md: 343.21 m/s at 20 °C)
  })
})
