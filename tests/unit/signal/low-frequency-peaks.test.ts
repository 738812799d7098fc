import { describe, expect, it } from 'vitest'
import { explainLowFrequencyPeaks, describeLowFrequencyFeature } from '../../../shared/signal'

import { C20, modalIr, rayleigh } from './modal-synthetic'

const room = { length: 5.0, width: 3.8, height: 2.6 }
// the seat at half the height (odd height modes vanish there, as at most ear heights in a 2.6 m room)
const source = { x: 0.35, y: 0.4, z: 0.35 }
const seat = { x: 3.9, y: 1.2, z: 1.3 }

describe('explainLowFrequencyPeaks', () => {
  it('names the modes of a response built from known modes, at their Rayleigh frequencies', () => {
    const ir = modalIr(room, source, seat, { rt: 0.8 })
    const d = explainLowFrequencyPeaks({ samples: ir, sampleRate: 8000 }, room, source, seat)
    const byIndices = (n: number[]) => d.peaks.find((p) => p.cause.kind === 'mode' && p.cause.indices.join() === n.join())
    for (const n of [[1, 0, 0], [0, 1, 0], [1, 1, 0], [3, 0, 0], [0, 0, 2]]) {
      const p = byIndices(n)
      expect(p, `a peak explained as mode ${n.join('-')}`).toBeDefined()
      // closed form (Rayleigh): the predicted frequency and the measured peak
      if (p!.cause.kind !== 'mode') throw new Error('not a mode')
      expect(p!.cause.predictedHz).toBeCloseTo(rayleigh(room, n), 1)
      expect(Math.abs(p!.hz - rayleigh(room, n))).toBeLessThan(0.02 * rayleigh(room, n))
    }
    expect(d.peaks.every((p, i) => i === 0 || p.prominenceDb <= d.peaks[i - 1].prominenceDb)).toBe(true)
    expect(d.peaks.every((p) => p.prominenceDb >= 3 && p.hz >= 20 && p.hz <= 200)).toBe(true)
    expect(d.explainedShare).toBeGreaterThan(0.5)
    // stated = true room: the fitted box stays within 10 cm of it
    expect(d.dimensionEstimate).not.toBeNull()
    expect(Math.abs(d.dimensionEstimate!.length - room.length)).toBeLessThan(0.1)
  })

  it('a response made for a room 0.3 m longer than stated gives a length estimate within 10 cm of the true one', () => {
    const truth = { ...room, length: room.length + 0.3 }
    const ir = modalIr(truth, source, seat, { rt: 0.8 })
    const d = explainLowFrequencyPeaks({ samples: ir, sampleRate: 8000 }, room, source, seat)
    expect(d.dimensionEstimate).not.toBeNull()
    expect(d.dimensionEstimate!.matchedAxialModes).toBeGreaterThanOrEqual(3)
    expect(Math.abs(d.dimensionEstimate!.length - truth.length)).toBeLessThan(0.1)
    expect(Math.abs(d.dimensionEstimate!.width - truth.width)).toBeLessThan(0.1)
  })

  it('reports a strong peak that no mode explains as unexplained (a resonance below the lowest mode)', () => {
    const ir = modalIr(room, source, seat, { rt: 0.8, extra: [{ hz: 24, amp: 6, rt: 1.0 }] })
    const d = explainLowFrequencyPeaks({ samples: ir, sampleRate: 8000 }, room, source, seat)
    const p = d.peaks.find((q) => Math.abs(q.hz - 24) < 1)
    expect(p).toBeDefined()
    expect(p!.cause).toEqual({ kind: 'unexplained' })
    expect(d.explainedShare).toBeLessThan(1)
    expect(describeLowFrequencyFeature(p!)).toMatch(/^24 Hz: unexplained, \d+ dB/)
  })

  it('does not explain a peak by a mode the seat sits on a null of: a lone resonance at the first width mode heard at half the width is unexplained', () => {
    // (0,1,0) at c/(2·3.8) ≈ 45.2 Hz (Rayleigh) has its nodal plane at y = W/2; the seat there cannot hear it
    const mid = { ...seat, y: room.width / 2 }
    const fs = 8000
    const x = new Float64Array(3 * fs)
    const f = rayleigh(room, [0, 1, 0])
    for (let i = 40; i < x.length; i++) x[i] = Math.exp((-3 * Math.LN10 * (i - 40)) / fs / 0.8) * Math.sin((2 * Math.PI * f * (i - 40)) / fs)
    const onNull = explainLowFrequencyPeaks({ samples: x, sampleRate: fs }, room, source, mid)
    expect(onNull.peaks.find((q) => Math.abs(q.hz - f) < 1)?.cause).toEqual({ kind: 'unexplained' })
    // the same response, the seat off the null: the width mode explains it
    const off = explainLowFrequencyPeaks({ samples: x, sampleRate: fs }, room, source, seat)
    expect(off.peaks.find((q) => Math.abs(q.hz - f) < 1)?.cause).toMatchObject({ kind: 'mode', indices: [0, 1, 0] })
  })

  it("a single mode's peak falls 30 dB in half its reverberation time (exponential decay: 60 dB in T, closed form)", () => {
    const T = 0.6
    const fs = 8000
    const x = new Float64Array(3 * fs)
    const w = 2 * Math.PI * 42.9
    for (let i = 40; i < x.length; i++) x[i] = Math.exp((-3 * Math.LN10 * (i - 40)) / fs / T) * Math.sin((w * (i - 40)) / fs)
    const d = explainLowFrequencyPeaks({ samples: x, sampleRate: fs }, room, source, seat)
    const p = d.peaks.find((q) => Math.abs(q.hz - 42.9) < 1)
    expect(p?.fall30Ms).not.toBeNull()
    expect(p!.fall30Ms!).toBeGreaterThan(0.9 * (T / 2) * 1000)
    expect(p!.fall30Ms!).toBeLessThan(1.1 * (T / 2) * 1000)
  })

  it('names a dip at c/(4d) the boundary dip of that surface (Allison, AES preprint 951, 1974); a frequency response has no fall times', () => {
    // direct sound plus the floor's image: |1 + e^(−j·2kd)|², zero at kd = π/2, i.e. f = c/(4d); d = 0.9 m → 95.3 Hz
    const src = { x: 0.5, y: 1.2, z: 0.9 }
    const freqsHz: number[] = []
    const splDb: number[] = []
    for (let f = 15; f <= 250; f *= 2 ** (1 / 48)) {
      const k = (2 * Math.PI * f) / C20
      const re = 1 + Math.cos(2 * k * 0.9)
      const im = Math.sin(2 * k * 0.9)
      freqsHz.push(f)
      splDb.push(Math.max(-40, 10 * Math.log10(re * re + im * im)))
    }
    const d = explainLowFrequencyPeaks({ freqsHz, splDb }, room, src, seat)
    const dip = d.dips.find((q) => Math.abs(q.hz - C20 / 3.6) < 3)
    expect(dip).toBeDefined()
    expect(dip!.cause).toEqual({ kind: 'boundary', surface: 'floor', predictedHz: Math.round((C20 / 3.6) * 100) / 100 })
    expect(d.peaks.every((p) => p.fall30Ms === null)).toBe(true)
  })

  it('throws a RangeError for impossible input', () => {
    expect(() => explainLowFrequencyPeaks({ samples: new Float64Array(8000), sampleRate: 4000 }, room, source, seat)).toThrow(RangeError)
    expect(() => explainLowFrequencyPeaks({ freqsHz: [20, 30, 40], splDb: [0, 1, 2] }, room, source, { x: 9, y: 1, z: 1 })).toThrow('seat lies outside the room')
    expect(() => explainLowFrequencyPeaks({ freqsHz: [20, 30], splDb: [0, 1] }, room, source, seat)).toThrow(RangeError)
  })
})
