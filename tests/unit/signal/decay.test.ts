import { describe, expect, it } from 'vitest'
import { analyzeDecay, analyzeImpulseResponse, fitReverberationTime, lundebyTruncation, MIN_DYNAMIC_RANGE_DB, schroederCurveDb } from '../../../shared/signal/index'
import { exponentialDecay, multibandToneDecay } from './synthetic'

const fs = 48000

describe('closed forms for a pure exponential decay (REFERENCES.md, ISO 3382-1 definitions)', () => {
  // squared samples are exactly e^(−6·ln10·t/T), so the figures have closed forms
  it('EDT = T20 = T30 = T for T = 1.0 s and 0.5 s', () => {
    for (const rt of [1.0, 0.5]) {
      const d = analyzeDecay(exponentialDecay({ rt, sampleRate: fs, seconds: 3 * rt }), fs, 0)
      expect(d.edt).toBeCloseTo(rt, 4)
      expect(d.t20).toBeCloseTo(rt, 4)
      expect(d.t30).toBeCloseTo(rt, 4)
      expect(Math.abs(d.curvaturePct!)).toBeLessThan(0.01)
    }
  })

  it('C80 = 10·lg(e^(0.08A/T) − 1): 3.053 dB at T = 1.0 s, 9.096 dB at T = 0.5 s; D50 = 0.7488 at T = 0.5 s', () => {
    const one = analyzeDecay(exponentialDecay({ rt: 1.0, sampleRate: fs, seconds: 3 }), fs, 0)
    const half = analyzeDecay(exponentialDecay({ rt: 0.5, sampleRate: fs, seconds: 2 }), fs, 0)
    expect(one.c80).toBeCloseTo(3.053, 2)
    expect(half.c80).toBeCloseTo(9.096, 2)
    expect(half.d50).toBeCloseTo(0.7488, 3)
    // C50 and D50 describe the same split: C50 = 10·lg(D50 / (1 − D50))
    expect(half.c50).toBeCloseTo(10 * Math.log10(half.d50! / (1 - half.d50!)), 6)
  })
})

describe('noise floor: truncation, compensation and the dynamic-range rule (ISO 3382-2: range + 15 dB)', () => {
  it('keeps T30 within 2 % with the noise 60 dB down, truncating near where the decay meets it', () => {
    const rt = 0.5
    const d = analyzeDecay(exponentialDecay({ rt, sampleRate: fs, seconds: 2, noiseMeanSquare: 1e-6, seed: 3 }), fs, 0)
    expect(d.dynamicRangeDb).toBeCloseTo(60, 0)
    expect(Math.abs(d.t30! / rt - 1)).toBeLessThan(0.02)
    // the decay reaches −60 dB at T = 500 ms
    expect(d.truncationMs).toBeGreaterThan(400)
    expect(d.truncationMs).toBeLessThan(600)
  })

  it('gives null where the dynamic range is too small: 40 dB keeps EDT and T20, 30 dB keeps EDT only, 20 dB nothing', () => {
    const at = (rangeDb: number) => analyzeDecay(exponentialDecay({ rt: 0.5, sampleRate: fs, seconds: 2, noiseMeanSquare: 10 ** (-rangeDb / 10), seed: 5 }), fs, 0)
    const d40 = at(40)
    expect(d40.dynamicRangeDb).toBeGreaterThan(MIN_DYNAMIC_RANGE_DB.t20)
    expect(d40.dynamicRangeDb).toBeLessThan(MIN_DYNAMIC_RANGE_DB.t30)
    expect(d40.edt).not.toBeNull()
    expect(d40.t20).not.toBeNull()
    expect(d40.t30).toBeNull()
    expect(d40.curvaturePct).toBeNull()
    const d30 = at(30)
    expect(d30.edt).not.toBeNull()
    expect(d30.t20).toBeNull()
    expect(d30.t30).toBeNull()
    const d20 = at(20)
    expect([d20.edt, d20.t20, d20.t30]).toEqual([null, null, null])
  })

  it('without compensation the truncated Schroeder curve bends down; with it T30 is right (Lundeby et al. 1995)', () => {
    const rt = 0.5
    const x = exponentialDecay({ rt, sampleRate: fs, seconds: 2, noiseMeanSquare: 10 ** -5.5, seed: 9 })
    const e = x.map((v) => v * v)
    const tr = lundebyTruncation(e, fs)
    expect(tr.lateSlopeDbPerS!).toBeCloseTo(-60 / rt, -1)
    const plain = fitReverberationTime(schroederCurveDb(e, tr.crossIndex, 0), fs, -5, -35)!
    const compensated = fitReverberationTime(schroederCurveDb(e, tr.crossIndex, tr.compensation), fs, -5, -35)!
    expect(Math.abs(compensated / rt - 1)).toBeLessThan(0.03)
    expect(plain).toBeLessThan(compensated)
  })
})

describe('octave bands with known reverberation times', () => {
  // One tone per band at its exact mid-band frequency, each decaying with its own T, so each
  // band's energy decays smoothly at a known rate. Tolerances (documented): T20 and T30 within
  // 1.5 %, EDT within 5 % (the band filter's rise time, about 1/B, shortens the first 10 dB at
  // 63 Hz, where B·T is smallest).
  const rts: Record<number, number> = { 63: 0.9, 125: 0.8, 250: 0.7, 500: 0.6, 1000: 0.55, 2000: 0.5, 4000: 0.45, 8000: 0.4 }
  const x = multibandToneDecay(rts, fs, 2.5)
  const result = analyzeImpulseResponse(x, fs)

  it('finds EDT = T20 = T30 = T per band within the documented tolerances', () => {
    expect(result.bands.map((b) => b.centerHz)).toEqual([63, 125, 250, 500, 1000, 2000, 4000, 8000])
    for (const b of result.bands) {
      const rt = rts[b.centerHz]
      expect(Math.abs(b.t30! / rt - 1), `T30 ${b.centerHz} Hz`).toBeLessThan(0.015)
      expect(Math.abs(b.t20! / rt - 1), `T20 ${b.centerHz} Hz`).toBeLessThan(0.015)
      expect(Math.abs(b.edt! / rt - 1), `EDT ${b.centerHz} Hz`).toBeLessThan(0.05)
    }
  })

  it('finds T30 of a white noise decay (T = 0.6 s) from 1 kHz up within 6 % each and 3 % on average over four seeds', () => {
    // A noise decay fluctuates, so single estimates scatter (more in narrow, low bands:
    // statistical spread of decay fits, Davy, Dunn & Dubout, Acustica 1979, from memory).
    const ratios: number[] = []
    for (const seed of [1, 2, 3, 4]) {
      const r = analyzeImpulseResponse(exponentialDecay({ rt: 0.6, sampleRate: fs, seconds: 3, seed }), fs)
      for (const b of r.bands.filter((b) => b.centerHz >= 1000)) {
        expect(Math.abs(b.t30! / 0.6 - 1)).toBeLessThan(0.06)
        ratios.push(b.t30! / 0.6)
      }
    }
    expect(Math.abs(ratios.reduce((a, v) => a + v, 0) / ratios.length - 1)).toBeLessThan(0.03)
  })

  it('puts the broadband figures inside the range of the band figures', () => {
    const t = result.broadband.t30!
    expect(t).toBeGreaterThan(0.4 * 0.95)
    expect(t).toBeLessThan(0.9 * 1.05)
  })

  it('is unchanged by the overall scale and does not mutate its input', () => {
    const copy = Float64Array.from(x)
    const scaled = analyzeImpulseResponse(x.map((v) => v * 0.01), fs)
    expect(x).toEqual(copy)
    scaled.bands.forEach((b, i) => expect(b.t30).toBeCloseTo(result.bands[i].t30!, 6))
  })

  it('omits bands whose upper edge reaches the Nyquist frequency', () => {
    const low = analyzeImpulseResponse(exponentialDecay({ rt: 0.4, sampleRate: 16000, seconds: 1 }), 16000)
    expect(low.bands.map((b) => b.centerHz)).toEqual([63, 125, 250, 500, 1000, 2000, 4000])
  })
})

describe('input checks (ENGINE.md: RangeError for impossible input)', () => {
  const ok = exponentialDecay({ rt: 0.3, sampleRate: fs, seconds: 0.5 })
  it('refuses a sample rate below 8000 Hz or NaN', () => {
    expect(() => analyzeImpulseResponse(ok, 4000)).toThrow(RangeError)
    expect(() => analyzeImpulseResponse(ok, Number.NaN)).toThrow(/sample rate/)
  })
  it('refuses NaN samples, an all-zero response and one shorter than 10 ms', () => {
    const bad = Float64Array.from(ok)
    bad[100] = Number.NaN
    expect(() => analyzeImpulseResponse(bad, fs)).toThrow(/non-finite sample .* index 100/)
    expect(() => analyzeImpulseResponse(new Float64Array(48000), fs)).toThrow(/all zeros/)
    expect(() => analyzeImpulseResponse(ok.slice(0, 100), fs)).toThrow(/too short/)
  })
})
