/**
 * The low-frequency waterfall (`lowFrequencyDecay`, the "Bass decay" chart) checked against closed forms.
 *
 * A room mode rings as an exponentially damped sinusoid A·e^(−δt)·sin(2πf₀t + φ), δ = 3·ln10/T60
 * (Kuttruff, Room Acoustics, ch. 3, with the mode's half-power bandwidth δ/π ≈ 2.2/T60 Hz; T60 the time
 * to fall 60 dB, ISO 3382-1 §3.5; chapter and clause numbers from memory).
 * The engine analyses a copy low-passed (zero-phase 8th-order Butterworth at 400 Hz, power gain
 * |G|⁴ = 1/(1 + (f/400)^16)² for the two passes) and decimated to fs/24 = 2 kHz
 * (`decimateForLowFrequencies`), so the reference is the discrete-time Fourier transform of the mode
 * sampled at 2 kHz, A·rⁿ·sin(θn + φ), r = e^(−δT), θ = ω₀T, times |G|⁴. Over a window of N samples that
 * is a finite sum of geometric series, Σ_{n=a}^{b−1} zⁿ = (zᵃ − zᵇ)/(1 − z) (Oppenheim & Schafer,
 * Discrete-Time Signal Processing, the z-transform of rⁿ·sin(θn)·u[n]), as the sine is two complex
 * exponentials and the documented window (500 ms rectangular, then a half-Hann fade over its last
 * quarter, ½ + ¼e^(jπk/(F+1)) + ¼e^(−jπk/(F+1))) three more on the fade. A slice t₀ later is the same
 * with A·r^(n₀) and φ + θn₀. No FFT, no filter and no sampled signal enter the reference.
 * Known limit, inside the 0.2 dB tolerance: the zero-phase low-pass rings for a few milliseconds either
 * side of the onset and the first window starts at the onset, so the 0 ms slice loses the ringing
 * before it; with modes that start from zero (sin φ = 0, as a mode excited by an impulse does) the
 * whole comparison stays within about 0.12 dB.
 * Smoothing: the mean power over [f·2^(−1/48), f·2^(1/48)] (1/24 octave; Hatziantoniou & Mourjopoulos,
 * JAES 48(4), 2000), over the frequencies the engine's zero-padded FFT samples.
 */
import { describe, expect, it } from 'vitest'
import { lowFrequencyDecay } from '../../../shared/signal/index'

const fs = 48000
const onsetIndex = 480 // 10 ms, a multiple of the decimation factor 24

interface Mode { hz: number; t60: number; amp: number; phase: number }

function modalSignal(modes: Mode[], seconds = 3): Float64Array {
  const x = new Float64Array(Math.round(seconds * fs))
  for (const m of modes) {
    const delta = (3 * Math.LN10) / m.t60
    for (let i = onsetIndex; i < x.length; i++) {
      const t = (i - onsetIndex) / fs
      x[i] += m.amp * Math.exp(-delta * t) * Math.sin(2 * Math.PI * m.hz * t + m.phase)
    }
  }
  // a deterministic floor 120 dB down, so the band decays have a measurable noise level
  let s = 12345
  for (let i = 0; i < x.length; i++) {
    s = (s * 1103515245 + 12345) % 2147483648
    x[i] += 1e-6 * (s / 2147483648 - 0.5)
  }
  return x
}

type C = [number, number]
const cmul = (x: C, y: C): C => [x[0] * y[0] - x[1] * y[1], x[0] * y[1] + x[1] * y[0]]
const cdiv = (x: C, y: C): C => { const d = y[0] * y[0] + y[1] * y[1]; return [(x[0] * y[0] + x[1] * y[1]) / d, (x[1] * y[0] - x[0] * y[1]) / d] }
const cexp = (x: C): C => [Math.exp(x[0]) * Math.cos(x[1]), Math.exp(x[0]) * Math.sin(x[1])]
/** Σ_{n=a}^{b−1} coef·zⁿ */
function geometric(coef: C, z: C, a: number, b: number): C {
  const lnAbs = Math.log(Math.hypot(z[0], z[1]))
  const arg = Math.atan2(z[1], z[0])
  const za = cexp([lnAbs * a, arg * a])
  const zb = cexp([lnAbs * b, arg * b])
  return cmul(coef, cdiv([za[0] - zb[0], za[1] - zb[1]], [1 - z[0], -z[1]]))
}

const FS_DECIMATED = 2000
const WINDOW = 1000 // 500 ms at 2 kHz
const FADE = 250

/** |X(f)|²·|G(f)|⁴ of the modes (closed form above) over the window starting t0 seconds after the onset. */
function referencePower(modes: Mode[], t0: number, hz: number): number {
  const T = 1 / FS_DECIMATED
  const w = 2 * Math.PI * hz * T
  const n0 = Math.round(t0 * FS_DECIMATED)
  const u1 = WINDOW - FADE
  let sum: C = [0, 0]
  const add = (z: C) => { sum = [sum[0] + z[0], sum[1] + z[1]] }
  for (const m of modes) {
    const r = Math.exp(-(3 * Math.LN10) / m.t60 * T)
    const th = 2 * Math.PI * m.hz * T
    const a = m.amp * r ** n0
    const ph = m.phase + th * n0
    // a·rⁿ·sin(θn + φ) = Σ± (±a/2j)·e^(±jφ)·(r·e^(±jθ))ⁿ; times e^(−jωn)
    for (const sign of [1, -1]) {
      const coef = cmul([0, (-a / 2) * sign], cexp([0, sign * ph]))
      const z = cmul([r, 0], cexp([0, sign * th - w]))
      add(geometric(coef, z, 0, u1))
      add(geometric(cmul(coef, [0.5, 0]), z, u1, WINDOW))
      // fade sample k = n − u1: ¼·e^(±jπ(k+1)/(F+1)) = ¼·e^(±jπ(1 − u1)/(F+1))·e^(±jπn/(F+1))
      for (const s of [1, -1]) {
        const c2 = cmul(coef, cmul([0.25, 0], cexp([0, (s * Math.PI * (1 - u1)) / (FADE + 1)])))
        add(geometric(c2, cmul(z, cexp([0, (s * Math.PI) / (FADE + 1)])), u1, WINDOW))
      }
    }
  }
  const g2 = 1 / (1 + (hz / 400) ** 16)
  return (sum[0] * sum[0] + sum[1] * sum[1]) * g2 * g2
}

/**
 * 1/24-octave mean of the reference power around hz, over the frequencies a zero-padded 4096-point
 * transform samples (k·2000/4096 Hz: the engine pads each 1000-sample window to 4096), or the power
 * interpolated between the two nearest of them where the band holds none.
 */
function referenceSmoothedDb(modes: Mode[], t0: number, hz: number): number {
  const bin = FS_DECIMATED / 4096
  const lo = Math.ceil((hz * 2 ** (-1 / 48)) / bin)
  const hi = Math.floor((hz * 2 ** (1 / 48)) / bin)
  let p: number
  if (hi >= lo) {
    p = 0
    for (let k = lo; k <= hi; k++) p += referencePower(modes, t0, k * bin)
    p /= hi - lo + 1
  } else {
    const k = Math.floor(hz / bin)
    const t = hz / bin - k
    p = referencePower(modes, t0, k * bin) * (1 - t) + referencePower(modes, t0, (k + 1) * bin) * t
  }
  return 10 * Math.log10(p)
}

const gridHz = (d: { freqsHz: number[] }) => d.freqsHz.map((_, i) => 15 * 2 ** (i / 48))

describe('low-frequency waterfall against the closed form of decaying modes', () => {
  const modes: Mode[] = [
    { hz: 43, t60: 1.2, amp: 1, phase: 0 },
    { hz: 71, t60: 0.3, amp: -0.7, phase: 0 },
  ]
  const d = lowFrequencyDecay(modalSignal(modes), fs, onsetIndex)
  const freqs = gridHz(d)
  const ref = d.timesMs.map((t) => freqs.map((f) => referenceSmoothedDb(modes, t / 1000, f)))
  const ref0 = Math.max(...ref[0])

  it('every slice, 0–300 ms, matches the transform of the two damped sinusoids within 0.2 dB wherever it is within 50 dB of the peak', () => {
    let checked = 0
    let worst = 0
    d.timesMs.forEach((_, ti) => {
      freqs.forEach((f, fi) => {
        const want = ref[ti][fi] - ref0
        if (f < 20 || f > 250 || want < -50) return
        worst = Math.max(worst, Math.abs(d.levelsDb[ti][fi] - want))
        checked++
      })
    })
    expect(checked).toBeGreaterThan(800)
    expect(worst).toBeLessThan(0.2)
  })

  it('at a lone mode the level falls 60 dB per T60 (Kuttruff ch. 3; ISO 3382-1): 45 dB by 300 ms at T60 = 0.4 s', () => {
    const m: Mode = { hz: 60, t60: 0.4, amp: 1, phase: 0 }
    const one = lowFrequencyDecay(modalSignal([m]), fs, onsetIndex)
    const f = gridHz(one)
    const i = f.reduce((b, x, k) => (Math.abs(x - m.hz) < Math.abs(f[b] - m.hz) ? k : b), 0)
    const drops = one.timesMs.map((t, ti) => one.levelsDb[0][i] - one.levelsDb[ti][i] - (60 * t) / 1000 / m.t60)
    expect(Math.max(...drops.map(Math.abs))).toBeLessThan(0.3)
  })

  it('slice 0 shows each mode with its half-power bandwidth 2.2/T60 Hz (δ/π; Kuttruff ch. 3)', () => {
    // single mode, so no neighbour widens the skirt; 1/24-octave smoothing widens it by well under 0.2 Hz here
    const m: Mode = { hz: 60, t60: 0.4, amp: 1, phase: 0 }
    const one = lowFrequencyDecay(modalSignal([m]), fs, onsetIndex)
    const f = gridHz(one)
    const row = one.levelsDb[0]
    const peak = row.indexOf(Math.max(...row))
    const cross = (dir: 1 | -1): number => {
      let k = peak
      while (row[k + dir] > -3) k += dir
      const t = (-3 - row[k]) / (row[k + dir] - row[k])
      return f[k] + t * (f[k + dir] - f[k])
    }
    const width = cross(1) - cross(-1)
    expect(Math.abs(f[peak] - m.hz)).toBeLessThan(1)
    expect(Math.abs(width - (3 * Math.LN10) / Math.PI / m.t60)).toBeLessThan(0.25)
  })

  it('the band decay falls 30 dB in T60/2 (a pure exponential: Schroeder, JASA 37, 1965; ISO 3382-1): 300 ms at 50 Hz, 150 ms at 100 Hz', () => {
    const single: Mode[] = [
      { hz: 50, t60: 0.6, amp: 1, phase: 0.3 },
      { hz: 100, t60: 0.3, amp: 1, phase: 2 },
    ]
    const one = lowFrequencyDecay(modalSignal(single), fs, onsetIndex)
    for (const m of single) {
      const band = one.bandFall30.find((b) => b.centerHz === m.hz)!
      expect(band.dynamicRangeDb).toBeGreaterThan(45)
      expect(Math.abs(band.fall30Ms! - (m.t60 * 1000) / 2)).toBeLessThan(0.02 * (m.t60 * 1000) / 2)
    }
  })
})
