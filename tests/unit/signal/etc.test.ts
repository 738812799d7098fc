import { describe, expect, it } from 'vitest'
import { DEFAULT_REFLECTION_WINDOW as ENGINE_WINDOW } from '../../../shared/acoustics/index'
import { analyzeImpulseResponse, analyzeMeasurement, DEFAULT_REFLECTION_WINDOW, energyTimeCurve, findReflections, inReflectionWindow, matchReflections } from '../../../shared/signal/index'
import { addPulse, exponentialDecay } from './synthetic'

const fs = 48000
const directMs = 5.2371
// delays and levels (dB re direct) of discrete reflections; fractional sample positions on purpose
const planted = [
  { delayMs: 1.9, levelDb: -4 },
  { delayMs: 4.4137, levelDb: -7.5 },
  { delayMs: 9.87, levelDb: -12 },
  { delayMs: 17.3, levelDb: -18 },
  { delayMs: 38.05, levelDb: -24 },
]

function roomLike(sampleRate = fs, diffuseDb = -45): Float64Array {
  const x = exponentialDecay({ rt: 0.4, sampleRate, seconds: 1, seed: 11, startIndex: Math.round((directMs / 1000) * sampleRate) })
  const g = 10 ** (diffuseDb / 20)
  for (let i = 0; i < x.length; i++) x[i] *= g
  addPulse(x, sampleRate, directMs, 1)
  for (const r of planted) addPulse(x, sampleRate, directMs + r.delayMs, 10 ** (r.levelDb / 20))
  return x
}

describe('energy-time curve and reflections', () => {
  for (const sampleRate of [44100, 48000, 96000]) {
    it(`finds the direct sound and every planted reflection within 0.1 ms and 1 dB at ${sampleRate} Hz`, () => {
      const result = analyzeImpulseResponse(roomLike(sampleRate), sampleRate)
      expect(Math.abs(result.directSoundMs - directMs)).toBeLessThan(0.1)
      for (const p of planted) {
        const found = result.reflections.find((r) => Math.abs(r.delayMs - p.delayMs) < 0.1)
        expect(found, `reflection at ${p.delayMs} ms`).toBeDefined()
        expect(Math.abs(found!.levelDb - p.levelDb)).toBeLessThan(1)
      }
    })
  }

  it('lists reflections strongest first, all within 50 ms, none from the diffuse tail 45 dB down', () => {
    const result = analyzeImpulseResponse(roomLike(), fs)
    expect(result.reflections).toHaveLength(planted.length)
    for (let i = 1; i < result.reflections.length; i++) expect(result.reflections[i].levelDb).toBeLessThanOrEqual(result.reflections[i - 1].levelDb)
    expect(result.reflections.every((r) => r.delayMs > 0 && r.delayMs <= 50)).toBe(true)
  })

  it('shifts the direct sound, not the reflections, when the file starts later', () => {
    const x = roomLike()
    const pad = 480 // 10 ms
    const later = new Float64Array(x.length + pad)
    later.set(x, pad)
    const a = analyzeImpulseResponse(x, fs)
    const b = analyzeImpulseResponse(later, fs)
    expect(b.directSoundMs - a.directSoundMs).toBeCloseTo(10, 3)
    expect(b.reflections.map((r) => r.delayMs)).toEqual(a.reflections.map((r) => r.delayMs))
  })

  it('reads a plain Dirac impulse train too (the Hilbert ripple of a one-sample pulse is not a reflection)', () => {
    const x = new Float64Array(fs / 2)
    x[240] = 1
    x[240 + 288] = 0.5 // 6 ms, −6.02 dB
    const etc = energyTimeCurve(x, fs)
    const found = findReflections(etc)
    expect(found).toHaveLength(1)
    expect(found[0].delayMs).toBeCloseTo(6, 1)
    expect(found[0].levelDb).toBeCloseTo(-6.02, 0)
  })

  it('flags reflections inside the room engine\'s reflection window (default 20 ms, −20 dB; settable)', () => {
    expect(DEFAULT_REFLECTION_WINDOW).toBe(ENGINE_WINDOW)
    expect(inReflectionWindow({ delayMs: 9.87, levelDb: -12 })).toBe(true)
    expect(inReflectionWindow({ delayMs: 17.3, levelDb: -21 })).toBe(false)
    expect(inReflectionWindow({ delayMs: 25, levelDb: -5 })).toBe(false)
    expect(inReflectionWindow({ delayMs: 25, levelDb: -5 }, { windowMs: 30, thresholdDb: -20 })).toBe(true)
    const full = analyzeMeasurement(roomLike(), fs, { reflectionWindow: { thresholdDb: -15 } })
    const flagged = full.reflections.filter((r) => r.inWindow).map((r) => Math.round(r.delayMs))
    expect(flagged.sort((a, b) => a - b)).toEqual([2, 4, 10])
  })
})

describe('matching measured to predicted first-order reflections', () => {
  const predicted = [
    { surface: 'floor', delayMs: 1.85, levelDb: -3.5 },
    { surface: 'ceiling', delayMs: 9.6, levelDb: -9 },
    { surface: 'left', delayMs: 4.4, levelDb: -6 },
    { surface: 'right', delayMs: 4.4, levelDb: -6 },
    { surface: 'back', delayMs: 26, levelDb: -14 },
  ]

  it('names the probable surface by the nearest delay, joining surfaces that arrive together', () => {
    const m = matchReflections(planted, predicted)
    expect(m.map((x) => x?.surface ?? null)).toEqual(['floor', 'left/right', 'ceiling', null, null])
    expect(m[0]!.delayErrorMs).toBeCloseTo(0.05, 6)
    expect(m[2]!.levelErrorDb).toBeCloseTo(-3, 6)
  })

  it('uses each predicted surface once and respects the tolerance', () => {
    const twoNearFloor = [{ delayMs: 1.8, levelDb: -4 }, { delayMs: 1.95, levelDb: -5 }]
    const m = matchReflections(twoNearFloor, predicted)
    expect(m.filter((x) => x?.surface === 'floor')).toHaveLength(1)
    expect(matchReflections([{ delayMs: 24, levelDb: -14 }], predicted, { toleranceMs: 1 })[0]).toBeNull()
    expect(matchReflections([{ delayMs: 24, levelDb: -14 }], predicted, { toleranceMs: 2.5 })[0]?.surface).toBe('back')
  })

  it('is applied inside analyzeMeasurement when predictions are given', () => {
    const full = analyzeMeasurement(roomLike(), fs, { predicted })
    const floor = full.reflections.find((r) => r.match?.surface === 'floor')
    expect(floor?.delayMs).toBeCloseTo(1.9, 1)
  })
})
