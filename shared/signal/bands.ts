/**
 * Octave and one-third-octave bands (IEC 61260-1:2014, base-ten system) and the
 * band-pass filters used to split an impulse response into bands.
 *
 * Filter design: each band is a digital Butterworth band-pass of order 3 per side
 * (6 poles), obtained from the analogue Butterworth low-pass prototype by the
 * low-pass → band-pass transformation and the bilinear transform with both band
 * edges pre-warped, so the response is exactly −3.01 dB at the exact band edges
 * and 0 dB at the exact mid-band frequency. It runs as three biquad sections
 * (transposed direct form II, double precision), causal (not zero-phase), which
 * keeps the −3 dB edges (forward–backward filtering would square the magnitude).
 * Top bands: near Nyquist the bilinear transform compresses the frequency axis, which
 * flattens the lower skirt of a band whose upper edge lies above a fifth of the sample
 * rate (the 8 kHz octave at 44.1 and 48 kHz gave only 40.9 / 41.3 dB two octaves below,
 * 1.15 / 0.74 dB short of class 1). Such bands (`octaveBandFilter`) use order 4 per side
 * (8 poles), which restores the margin: every octave band 63 Hz–8 kHz meets the class 1
 * mask of `CLASS1_OCTAVE_MASK` at 44.1, 48, 88.2 and 96 kHz on a dense frequency grid
 * (tests/unit/signal/bands.test.ts).
 *
 * The time response of a band filter lengthens short decays: ISO 3382-2 notes the
 * filter does not bias the decay when B·T > 16 (B the bandwidth in Hz); each band
 * reports whether it meets that.
 * @see IEC 61260-1:2014, Electroacoustics — Octave-band and fractional-octave-band filters
 */

/** Octave ratio of the base-ten system. @see IEC 61260-1:2014 §5.2 */
export const OCTAVE_RATIO = 10 ** 0.3

export interface Band {
  /** nominal mid-band frequency, Hz (the label) */
  nominalHz: number
  /** exact mid-band frequency 1000·G^(k/b), Hz */
  exactHz: number
  lowHz: number
  highHz: number
}

const NOMINAL_OCTAVES = [31.5, 63, 125, 250, 500, 1000, 2000, 4000, 8000, 16000]
const NOMINAL_THIRDS = [
  20, 25, 31.5, 40, 50, 63, 80, 100, 125, 160, 200, 250, 315, 400, 500, 630, 800, 1000, 1250, 1600, 2000, 2500,
  3150, 4000, 5000, 6300, 8000, 10000, 12500, 16000, 20000,
]

/**
 * Exact mid-band and edges of band k (k = 0 is 1000 Hz) for bandwidth 1/fraction octave.
 * @see IEC 61260-1:2014 eqs. (2)–(5): f_m = 1000·G^(k/b), edges f_m·G^(∓1/(2b))
 */
export function bandEdges(k: number, fraction: 1 | 3): { exactHz: number; lowHz: number; highHz: number } {
  const exactHz = 1000 * OCTAVE_RATIO ** (k / fraction)
  const half = OCTAVE_RATIO ** (1 / (2 * fraction))
  return { exactHz, lowHz: exactHz / half, highHz: exactHz * half }
}

/** Octave bands with nominal centres in [minHz, maxHz]. */
export function octaveBands(minHz = 63, maxHz = 8000): Band[] {
  return NOMINAL_OCTAVES.map((nominalHz, i) => ({ nominalHz, ...bandEdges(i - 5, 1) })).filter(
    (b) => b.nominalHz >= minHz && b.nominalHz <= maxHz,
  )
}

/** One-third-octave bands with nominal centres in [minHz, maxHz]. */
export function thirdOctaveBands(minHz = 20, maxHz = 20000): Band[] {
  return NOMINAL_THIRDS.map((nominalHz, i) => ({ nominalHz, ...bandEdges(i - 17, 3) })).filter(
    (b) => b.nominalHz >= minHz && b.nominalHz <= maxHz,
  )
}

/**
 * Class 1 acceptance limits on the relative attenuation of octave-band filters, IEC 61260-1:2014
 * Table 1 (values from memory, no stored copy of the standard; the same breakpoints are tabulated in
 * open-source filter checkers, e.g. J.A. de Jong's "class 1 octave band filter limits" script):
 * at G^e (e the breakpoint exponent, either side of mid-band) the attenuation lies between
 * `minDb` and `maxDb` (null: no upper limit). Between breakpoints the limits are interpolated
 * linearly against log-frequency (our reading); beyond G^±4 the G^±4 limit holds.
 */
export const CLASS1_OCTAVE_MASK: readonly { e: number; minDb: number; maxDb: number | null }[] = [
  { e: 0, minDb: -0.3, maxDb: 0.3 },
  { e: 1 / 8, minDb: -0.3, maxDb: 0.4 },
  { e: 1 / 4, minDb: -0.3, maxDb: 0.6 },
  { e: 3 / 8, minDb: -0.3, maxDb: 1.3 },
  { e: 1 / 2, minDb: 2, maxDb: 5 },
  { e: 1, minDb: 17.5, maxDb: null },
  { e: 2, minDb: 42, maxDb: null },
  { e: 3, minDb: 61, maxDb: null },
  { e: 4, minDb: 70, maxDb: null },
]

/**
 * The class 1 limits on relative attenuation (dB, positive = attenuated) at f = f_m·G^e for an
 * octave filter (see `CLASS1_OCTAVE_MASK`).
 */
export function class1OctaveLimits(e: number): { minDb: number; maxDb: number } {
  const a = Math.abs(e)
  const m = CLASS1_OCTAVE_MASK
  if (a >= m[m.length - 1].e) return { minDb: m[m.length - 1].minDb, maxDb: Infinity }
  for (let i = 1; i < m.length; i++) {
    if (a <= m[i].e) {
      const t = (a - m[i - 1].e) / (m[i].e - m[i - 1].e)
      const minDb = m[i - 1].minDb + t * (m[i].minDb - m[i - 1].minDb)
      const lo = m[i - 1].maxDb
      const hi = m[i].maxDb
      const maxDb = lo !== null && hi !== null ? lo + t * (hi - lo) : Infinity
      return { minDb, maxDb }
    }
  }
  return { minDb: m[0].minDb, maxDb: m[0].maxDb as number }
}

/**
 * The band-pass used for an octave band at a sample rate: order 3 per side, order 4 where the upper
 * edge lies above a fifth of the sample rate (see the file's notes on top bands).
 */
export function octaveBandFilter(band: { lowHz: number; highHz: number }, sampleRate: number): Biquad[] {
  return butterworthBandpass(band.lowHz, band.highHz, sampleRate, band.highHz > sampleRate / 5 ? 4 : 3)
}

/** One second-order section, a0 = 1. */
export interface Biquad {
  b0: number
  b1: number
  b2: number
  a1: number
  a2: number
}

type C = [number, number]
const cmul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]]
const cdiv = (a: C, b: C): C => {
  const d = b[0] * b[0] + b[1] * b[1]
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d]
}
const csqrt = (a: C): C => {
  const r = Math.hypot(a[0], a[1])
  const re = Math.sqrt((r + a[0]) / 2)
  const im = Math.sqrt(Math.max(0, (r - a[0]) / 2))
  return [re, a[1] < 0 ? -im : im]
}

/**
 * Digital Butterworth band-pass between lowHz and highHz (−3.01 dB there), order
 * `order` per side, as `order` biquads; unity gain at the geometric centre of the
 * pre-warped edges.
 * @see Oppenheim & Schafer, Discrete-Time Signal Processing 3e, §7.2 (bilinear transform) and §7.4 (frequency transformations)
 */
export function butterworthBandpass(lowHz: number, highHz: number, sampleRate: number, order = 3): Biquad[] {
  if (!(sampleRate > 0)) throw new RangeError(`sample rate must be positive: got ${sampleRate}`)
  if (!(lowHz > 0 && highHz > lowHz && highHz < sampleRate / 2)) {
    throw new RangeError(`band ${lowHz}–${highHz} Hz must lie between 0 Hz and the Nyquist frequency ${sampleRate / 2} Hz`)
  }
  const fs2 = 2 * sampleRate
  const wl = fs2 * Math.tan((Math.PI * lowHz) / sampleRate)
  const wh = fs2 * Math.tan((Math.PI * highHz) / sampleRate)
  const bw = wh - wl
  const w0sq = wl * wh
  const poles: C[] = []
  for (let k = 1; k <= order; k++) {
    const theta = (Math.PI * (2 * k + order - 1)) / (2 * order)
    const p: C = [Math.cos(theta), Math.sin(theta)]
    const b: C = [p[0] * bw, p[1] * bw]
    const disc = csqrt([b[0] * b[0] - b[1] * b[1] - 4 * w0sq, 2 * b[0] * b[1]])
    for (const s of [
      [(b[0] + disc[0]) / 2, (b[1] + disc[1]) / 2] as C,
      [(b[0] - disc[0]) / 2, (b[1] - disc[1]) / 2] as C,
    ]) {
      poles.push(cdiv([fs2 + s[0], s[1]], [fs2 - s[0], -s[1]]))
    }
  }
  const upper = poles.filter((z) => z[1] > 0)
  if (upper.length !== order) throw new RangeError(`band ${lowHz}–${highHz} Hz is too wide for this band-pass design`)
  const sections: Biquad[] = upper.map((z) => ({ b0: 1, b1: 0, b2: -1, a1: -2 * z[0], a2: z[0] * z[0] + z[1] * z[1] }))
  const centreHz = (sampleRate / Math.PI) * Math.atan(Math.sqrt(w0sq) / fs2)
  const g = 1 / sosMagnitude(sections, centreHz, sampleRate)
  const perSection = g ** (1 / order)
  for (const s of sections) {
    s.b0 *= perSection
    s.b2 *= perSection
  }
  return sections
}

/** |H(e^{jω})| of a biquad cascade at frequency hz. */
export function sosMagnitude(sections: Biquad[], hz: number, sampleRate: number): number {
  const w = (2 * Math.PI * hz) / sampleRate
  const e1: C = [Math.cos(w), -Math.sin(w)]
  const e2: C = [Math.cos(2 * w), -Math.sin(2 * w)]
  let h: C = [1, 0]
  for (const s of sections) {
    const num: C = [s.b0 + s.b1 * e1[0] + s.b2 * e2[0], s.b1 * e1[1] + s.b2 * e2[1]]
    const den: C = [1 + s.a1 * e1[0] + s.a2 * e2[0], s.a1 * e1[1] + s.a2 * e2[1]]
    h = cmul(h, cdiv(num, den))
  }
  return Math.hypot(h[0], h[1])
}

/** Runs x through a biquad cascade (causal, zero initial state). Does not mutate x. */
export function filterSos(x: ArrayLike<number>, sections: Biquad[]): Float64Array {
  const y = new Float64Array(x.length)
  let i0 = 0
  // sections in groups of up to three per pass over the signal, so each sample stays in registers
  for (let s = 0; s < sections.length; s += 3) {
    const src: ArrayLike<number> = i0 === 0 ? x : y
    i0 = 1
    const a = sections[s]
    const b = sections[s + 1] ?? { b0: 1, b1: 0, b2: 0, a1: 0, a2: 0 }
    const c = sections[s + 2] ?? { b0: 1, b1: 0, b2: 0, a1: 0, a2: 0 }
    const { b0: ab0, b1: ab1, b2: ab2, a1: aa1, a2: aa2 } = a
    const { b0: bb0, b1: bb1, b2: bb2, a1: ba1, a2: ba2 } = b
    const { b0: cb0, b1: cb1, b2: cb2, a1: ca1, a2: ca2 } = c
    let a1 = 0, a2 = 0, b1 = 0, b2 = 0, c1 = 0, c2 = 0
    const n = x.length
    for (let i = 0; i < n; i++) {
      const xi = src[i]
      const ya = ab0 * xi + a1
      a1 = ab1 * xi - aa1 * ya + a2
      a2 = ab2 * xi - aa2 * ya
      const yb = bb0 * ya + b1
      b1 = bb1 * ya - ba1 * yb + b2
      b2 = bb2 * ya - ba2 * yb
      const yc = cb0 * yb + c1
      c1 = cb1 * yb - ca1 * yc + c2
      c2 = cb2 * yb - ca2 * yc
      y[i] = yc
    }
  }
  if (sections.length === 0) y.set(x as ArrayLike<number>)
  return y
}

/**
 * Digital Butterworth low-pass (order even), −3.01 dB at cutoffHz, as order/2 biquads.
 * Used before decimating for the low-frequency analyses.
 * @see Oppenheim & Schafer, Discrete-Time Signal Processing 3e, §7.2
 */
export function butterworthLowpass(cutoffHz: number, sampleRate: number, order = 8): Biquad[] {
  if (order % 2 !== 0) throw new RangeError(`low-pass order must be even: got ${order}`)
  const fs2 = 2 * sampleRate
  const wc = fs2 * Math.tan((Math.PI * cutoffHz) / sampleRate)
  const sections: Biquad[] = []
  for (let k = 1; k <= order / 2; k++) {
    const theta = (Math.PI * (2 * k + order - 1)) / (2 * order)
    const s: C = [wc * Math.cos(theta), wc * Math.sin(theta)]
    const z = cdiv([fs2 + s[0], s[1]], [fs2 - s[0], -s[1]])
    const a1 = -2 * z[0]
    const a2 = z[0] * z[0] + z[1] * z[1]
    const gain = (1 + a1 + a2) / 4 // unity at DC: numerator (1 + z⁻¹)²
    sections.push({ b0: gain, b1: 2 * gain, b2: gain, a1, a2 })
  }
  return sections
}
