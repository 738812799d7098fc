import { describe, expect, it } from 'vitest'
import {
  analyzeMeasurement,
  analyzeMeasurementBytes,
  compareBeforeAfter,
  compareLeftRight,
  LEFT_RIGHT_THRESHOLDS,
  MeasurementFileError,
  type ImpulseResponseFileAnalysis,
} from '../../../shared/signal/index'
import { addPulse, amplitudeEnvelope, exponentialDecay, rng, writeWav } from './synthetic'

const fs = 48000

/** A room-like response: direct pulse, two reflections, a diffuse decay, two decaying room modes (40 Hz, T = 0.8 s; 62 Hz, T = 0.4 s). */
function roomResponse(rt = 0.4, seed = 4): Float64Array {
  const start = Math.round(0.004 * fs)
  const x = exponentialDecay({ rt, sampleRate: fs, seconds: 2, seed, startIndex: start, noiseMeanSquare: 1e-13 })
  for (let i = 0; i < x.length; i++) x[i] *= 0.03
  addPulse(x, fs, 4, 0.9)
  addPulse(x, fs, 7, 0.35)
  addPulse(x, fs, 15, 0.2)
  const r = rng(seed)
  for (const [hz, t, amp] of [[40, 0.8, 0.02], [62, 0.4, 0.02]]) {
    const ph = 2 * Math.PI * r()
    for (let i = start; i < x.length; i++) x[i] += amp * Math.sin((2 * Math.PI * hz * (i - start)) / fs + ph) * amplitudeEnvelope((i - start) / fs, t)
  }
  return x
}

describe('analyzeMeasurement', () => {
  const x = roomResponse()
  const a = analyzeMeasurement(x, fs)

  it('is JSON-serialisable without loss and of modest size', () => {
    const json = JSON.stringify(a)
    expect(JSON.parse(json)).toEqual(a)
    expect(json).not.toMatch(/NaN|Infinity/)
    expect(json.length).toBeLessThan(150_000)
    expect(a.etc.timesMs.length).toBeLessThanOrEqual(400)
    expect(a.bands.every((b) => b.curve.timesMs.length <= 151)).toBe(true)
  })

  it('carries per band the dynamic range, curvature, C50/C80/D50 and the filter-limit flag', () => {
    expect(a.bands).toHaveLength(8)
    for (const b of a.bands) {
      expect(b.dynamicRangeDb).toBeGreaterThan(45)
      expect(b.curvaturePct).not.toBeNull()
      expect(b.d50).toBeGreaterThan(0)
      expect(b.d50).toBeLessThan(1)
      expect(b.c50).toBeCloseTo(10 * Math.log10(b.d50! / (1 - b.d50!)), 6)
      expect(typeof b.filterLimited).toBe('boolean')
    }
  })

  it('plots an energy-time curve from −5 ms (here −4 ms: the file starts 4 ms before the direct sound) to 100 ms, direct at 0 dB', () => {
    expect(a.etc.timesMs[0]).toBeGreaterThanOrEqual(-4.01)
    expect(a.etc.timesMs[0]).toBeLessThan(-3.5)
    expect(a.etc.timesMs[a.etc.timesMs.length - 1]).toBeGreaterThan(99)
    expect(Math.max(...a.etc.levelsDb)).toBeCloseTo(0, 1)
    expect(a.reflections.slice(0, 2).map((r) => Math.round(r.delayMs))).toEqual([3, 11])
  })

  it('gives a flat 0 dB frequency response for a single impulse, in every smoothing', () => {
    const dirac = new Float64Array(fs)
    dirac[100] = 1
    const d = analyzeMeasurement(dirac, fs)
    for (const c of d.frequencyResponse.curves) for (const v of c.levelsDb) expect(Math.abs(v)).toBeLessThan(0.05)
    expect(d.frequencyResponse.freqsHz[0]).toBe(15)
    expect(d.frequencyResponse.freqsHz.length).toBeLessThan(300)
    // one-third-octave band power of a unit impulse: the band's share of the FFT bins, 10·lg(N_bins)
    expect(d.thirdOctaveLevels.find((b) => b.centerHz === 1000)!.levelDb).toBeGreaterThan(0)
  })

  it('shows the 40 Hz mode decaying 60·t/T dB in the low-frequency spectra (T = 0.8 s: 22.5 dB at 300 ms)', () => {
    const lf = a.lowFrequency.decay
    expect(lf.timesMs).toEqual([0, 20, 40, 60, 80, 100, 120, 140, 160, 180, 200, 220, 240, 260, 280, 300])
    expect(lf.freqsHz[0]).toBe(15)
    expect(lf.freqsHz[lf.freqsHz.length - 1]).toBeLessThanOrEqual(300)
    const i40 = lf.freqsHz.reduce((best, f, i) => (Math.abs(f - 40) < Math.abs(lf.freqsHz[best] - 40) ? i : best), 0)
    const drop = lf.levelsDb[0][i40] - lf.levelsDb[15][i40]
    expect(drop).toBeGreaterThan(22.5 - 2)
    expect(drop).toBeLessThan(22.5 + 2)
  })

  it('times the fall of 30 dB per one-third-octave band: about T/2 for the modes (400 ms at 40 Hz, 200 ms at 63 Hz)', () => {
    const by = (hz: number) => a.lowFrequency.decay.bandFall30.find((b) => b.centerHz === hz)!
    expect(a.lowFrequency.decay.bandFall30.map((b) => b.centerHz)).toEqual([20, 25, 31.5, 40, 50, 63, 80, 100, 125, 160, 200, 250])
    expect(Math.abs(by(40).fall30Ms! / 400 - 1)).toBeLessThan(0.15)
    expect(Math.abs(by(63).fall30Ms! / 200 - 1)).toBeLessThan(0.2)
  })

  it('finds the modes among the low-frequency peaks', () => {
    const hz = a.lowFrequency.peaks.map((p) => p.hz)
    expect(hz.some((f) => Math.abs(Math.log2(f / 40)) < 1 / 12)).toBe(true)
    expect(a.lowFrequency.spreadDb).toBeGreaterThan(0)
  })
})

describe('comparisons', () => {
  it('left vs right: −4 dB on the right is flagged above 300 Hz (3 dB) and not below (6 dB)', () => {
    const left = roomResponse(0.4, 4)
    const right = left.map((v) => v * 10 ** (-4 / 20))
    const file = analyzeMeasurementBytes(writeWav([left, right], fs, '32f'), { fileName: 'seat.wav' }) as ImpulseResponseFileAnalysis
    expect(file.channels.map((c) => c.label)).toEqual(['left', 'right'])
    const lr = file.leftRight!
    expect(lr.thresholds).toEqual(LEFT_RIGHT_THRESHOLDS)
    for (const b of lr.bands) {
      expect(b.differenceDb).toBeCloseTo(4, 1)
      expect(b.flagged).toBe(b.centerHz >= 300)
    }
    expect(lr.medianDifferenceDb).toBeCloseTo(4, 1)
  })

  it('left vs right: identical channels differ by 0 dB and flag nothing', () => {
    const a = analyzeMeasurement(roomResponse(), fs)
    const c = compareLeftRight(a, a)
    expect(c.flaggedCount).toBe(0)
    expect(c.bands.every((b) => b.differenceDb === 0)).toBe(true)
  })

  it('before/after: a shorter decay after treatment shows as negative changes of T30', () => {
    const before = analyzeMeasurement(roomResponse(0.6, 4), fs)
    const after = analyzeMeasurement(roomResponse(0.3, 4), fs)
    const c = compareBeforeAfter(before, after)
    expect(c.bands).toHaveLength(8)
    for (const b of c.bands.filter((b) => b.centerHz >= 250)) {
      expect(b.change.t30!).toBeLessThan(-0.15)
      expect(b.change.t30!).toBeCloseTo(b.after.t30! - b.before.t30!, 3)
    }
    expect(Math.abs(c.directSoundShiftMs)).toBeLessThan(0.01)
    expect(c.thirdOctave.length).toBeGreaterThan(20)
  })
})

describe('analyzeMeasurementBytes', () => {
  it('tells the kind by the stated kind, the file name or the RIFF bytes', () => {
    const wav = writeWav([roomResponse()], fs, '16')
    expect(analyzeMeasurementBytes(wav, { fileName: 'upload.bin' }).kind).toBe('impulse-response')
    const text = new TextEncoder().encode('frequency_hz spl_db\n' + Array.from({ length: 20 }, (_, i) => `${20 + i * 10} 70`).join('\n'))
    expect(analyzeMeasurementBytes(text, { fileName: 'seat.txt' }).kind).toBe('frequency-response')
    expect(analyzeMeasurementBytes(text, { fileName: 'noname', kind: 'frequency-response' }).kind).toBe('frequency-response')
    expect(() => analyzeMeasurementBytes(text, { fileName: 'noname' })).toThrow(MeasurementFileError)
    expect(() => analyzeMeasurementBytes(text, { fileName: 'seat.wav' })).toThrow(/not a WAV file/)
  })
})
