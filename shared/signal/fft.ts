import FFT from 'fft.js'

const plans = new Map<number, FFT>()

function plan(size: number): FFT {
  let p = plans.get(size)
  if (!p) {
    p = new FFT(size)
    plans.set(size, p)
  }
  return p
}

/** Smallest power of two ≥ n (at least 4, the smallest size fft.js accepts). */
export function nextPow2(n: number): number {
  let size = 4
  while (size < n) size *= 2
  return size
}

/**
 * Complex spectrum of a real signal, zero-padded to `size` (a power of two).
 * @returns interleaved [re0, im0, re1, im1, …] of length 2·size
 */
export function realSpectrum(x: ArrayLike<number>, size: number, offset = 0, length = x.length - offset): Float64Array {
  const input = new Float64Array(size)
  const n = Math.min(length, size)
  for (let i = 0; i < n; i++) input[i] = x[offset + i]
  const out = new Float64Array(2 * size)
  const p = plan(size)
  p.realTransform(out, input)
  p.completeSpectrum(out)
  return out
}

/**
 * Squared magnitude of the analytic signal, h² + H{h}², of x[offset … offset+length).
 * The analytic signal is formed in the frequency domain: negative frequencies zeroed,
 * positive ones doubled.
 * @see Marple, "Computing the discrete-time analytic signal via FFT", IEEE Trans. SP 47(9), 1999
 */
export function analyticEnergy(x: ArrayLike<number>, offset: number, length: number): Float64Array {
  const size = nextPow2(2 * length)
  const spec = realSpectrum(x, size, offset, length)
  const half = size / 2
  for (let k = 1; k < half; k++) {
    spec[2 * k] *= 2
    spec[2 * k + 1] *= 2
  }
  for (let k = half + 1; k < size; k++) {
    spec[2 * k] = 0
    spec[2 * k + 1] = 0
  }
  const time = new Float64Array(2 * size)
  plan(size).inverseTransform(time, spec)
  const e = new Float64Array(length)
  for (let i = 0; i < length; i++) e[i] = time[2 * i] * time[2 * i] + time[2 * i + 1] * time[2 * i + 1]
  return e
}
