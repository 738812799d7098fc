import { airDensity, speedOfSound } from './units'
import { assertFrequencies, assertNonNegative, assertPositive } from './validate'

/** Complex number as [re, im]. */
export type Complex = [number, number]

const cmul = (a: Complex, b: Complex): Complex => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]]
const cdiv = (a: Complex, b: Complex): Complex => {
  const d = b[0] * b[0] + b[1] * b[1]
  return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d]
}
const cadd = (a: Complex, b: Complex): Complex => [a[0] + b[0], a[1] + b[1]]
const csub = (a: Complex, b: Complex): Complex => [a[0] - b[0], a[1] - b[1]]
const cabs2 = (a: Complex) => a[0] * a[0] + a[1] * a[1]

/** tan(a + jb), stable for large |b| (→ ±j). */
function ctan(z: Complex): Complex {
  const [a, b] = z
  if (Math.abs(b) > 20) return [0, Math.sign(b)]
  const d = Math.cos(2 * a) + Math.cosh(2 * b)
  return [Math.sin(2 * a) / d, Math.sinh(2 * b) / d]
}

export type PorousModel = 'delany-bazley' | 'miki'

/**
 * Normalised characteristic impedance Zc/(ρ₀c₀) and wavenumber kc/k₀ of a porous material, e^(+jωt).
 * @param hz frequency; @param flowResistivity Pa·s/m²; @param rho0 air density kg/m³
 * @see Delany & Bazley, Applied Acoustics 3, 1970 (X = ρ₀f/σ); Miki, J. Acoust. Soc. Jpn (E) 11(1), 1990 (Y = f/σ)
 */
export function porousCharacteristics(model: PorousModel, hz: number, flowResistivity: number, rho0 = airDensity(20)): { z: Complex; k: Complex } {
  if (model === 'miki') {
    const y = hz / flowResistivity
    const a = y ** -0.632
    const b = y ** -0.618
    return { z: [1 + 0.0699 * a, -0.107 * a], k: [1 + 0.109 * b, -0.16 * b] }
  }
  const x = (rho0 * hz) / flowResistivity
  return {
    z: [1 + 0.0571 * x ** -0.754, -0.087 * x ** -0.732],
    k: [1 + 0.0978 * x ** -0.7, -0.189 * x ** -0.595],
  }
}

export interface PorousLayer {
  /** metres */
  thickness: number
  /** Pa·s/m² */
  flowResistivity: number
  /** air gap between the layer and the rigid wall, metres (default 0) */
  airGap?: number
  /** default 'delany-bazley' */
  model?: PorousModel
}

function checkLayer(layer: PorousLayer): void {
  if (layer === null || typeof layer !== 'object') throw new RangeError('porous layer must be an object with thickness and flowResistivity')
  assertPositive(layer.thickness, 'layer thickness', 'm')
  assertPositive(layer.flowResistivity, 'flow resistivity', 'Pa·s/m²')
  if (layer.airGap !== undefined) assertNonNegative(layer.airGap, 'air gap', 'm')
  if (layer.model !== undefined && layer.model !== 'delany-bazley' && layer.model !== 'miki') {
    throw new RangeError(`porous model must be 'delany-bazley' or 'miki': got '${String(layer.model)}'`)
  }
}

/** The layer checked, and the air's speed of sound and density at opts.celsius (default 20 °C). */
function checkLayerAndAir(layer: PorousLayer, opts: { celsius?: number }): { c0: number; rho0: number } {
  checkLayer(layer)
  const celsius = opts.celsius ?? 20
  return { c0: speedOfSound(celsius), rho0: airDensity(celsius) }
}

/**
 * Normalised surface impedance Zs/(ρ₀c₀) of the layer on a rigid wall, optionally over an air gap:
 * rigid backing Zs = −j·Zc·cot(kc·d); an air gap's impedance −jρ₀c₀·cot(k₀D) is carried through the
 * layer by its transfer matrix, Zs = Zc·(Zb + j·Zc·tan(kc·d)) / (Zc + j·Zb·tan(kc·d)).
 * @see Cox & D'Antonio, Acoustic Absorbers and Diffusers, ch. 2 (transfer matrix, impedance translation)
 */
export function porousSurfaceImpedance(layer: PorousLayer, hz: number, opts: { celsius?: number } = {}): Complex {
  const { c0, rho0 } = checkLayerAndAir(layer, opts)
  assertPositive(hz, 'frequency', 'Hz')
  return surfaceImpedance(layer, hz, c0, rho0)
}

function surfaceImpedance(layer: PorousLayer, hz: number, c0: number, rho0: number): Complex {
  const { z: zc, k: kn } = porousCharacteristics(layer.model ?? 'delany-bazley', hz, layer.flowResistivity, rho0)
  const k0 = (2 * Math.PI * hz) / c0
  const kd: Complex = [kn[0] * k0 * layer.thickness, kn[1] * k0 * layer.thickness]
  const t = ctan(kd)
  const gap = layer.airGap ?? 0
  if (gap === 0) {
    // −j·Zc/tan(kc·d)
    return cmul([0, -1], cdiv(zc, t))
  }
  const zb: Complex = [0, -1 / Math.tan(k0 * gap)] // −j·cot(k₀D), normalised
  const jt = cmul([0, 1], t)
  return cmul(zc, cdiv(cadd(zb, cmul(jt, zc)), cadd(zc, cmul(jt, zb))))
}

function alphaFromImpedance(zs: Complex, cosTheta: number): number {
  // R = (Zs·cosθ − 1)/(Zs·cosθ + 1), normalised to ρ₀c₀
  const zc: Complex = [zs[0] * cosTheta, zs[1] * cosTheta]
  const r = cdiv(csub(zc, [1, 0]), cadd(zc, [1, 0]))
  return Math.min(1, Math.max(0, 1 - cabs2(r)))
}

/**
 * Normal-incidence absorption coefficient α = 1 − |R|² of a porous layer on a rigid wall, with an
 * optional air gap; default model Delany–Bazley.
 * @param freqsHz frequencies, Hz
 * @see Delany & Bazley, Applied Acoustics 3, 1970; Miki, J. Acoust. Soc. Jpn (E) 11(1), 1990
 */
export function porousAbsorption(layer: PorousLayer, freqsHz: number[], opts: { celsius?: number } = {}): number[] {
  const { c0, rho0 } = checkLayerAndAir(layer, opts)
  assertFrequencies(freqsHz)
  return freqsHz.map((f) => alphaFromImpedance(surfaceImpedance(layer, f, c0, rho0), 1))
}

/**
 * Random-incidence (statistical) absorption estimate: the layer treated as locally reacting, its
 * oblique-incidence α(θ) from the normal surface impedance, averaged over a diffuse field by Paris'
 * integral α = ∫₀^{π/2} α(θ)·sin 2θ dθ (48-point midpoint rule). Edge effects of a finite panel are
 * not included. Values can slightly exceed the normal-incidence ones at mid frequencies, as expected.
 * @see Kuttruff, Room Acoustics, ch. 2 (Paris formula, locally reacting surfaces)
 */
export function porousAbsorptionRandom(layer: PorousLayer, freqsHz: number[], opts: { celsius?: number } = {}): number[] {
  const { c0, rho0 } = checkLayerAndAir(layer, opts)
  assertFrequencies(freqsHz)
  const N = 48
  return freqsHz.map((f) => {
    const zs = surfaceImpedance(layer, f, c0, rho0)
    let sum = 0
    for (let i = 0; i < N; i++) {
      const th = ((i + 0.5) / N) * (Math.PI / 2)
      sum += alphaFromImpedance(zs, Math.cos(th)) * Math.sin(2 * th)
    }
    return Math.min(1, sum * (Math.PI / 2 / N))
  })
}

/**
 * Octave-band random-incidence coefficients: the mean of the estimate at the band's three one-third-octave centres.
 * @param bandsHz nominal octave centres
 */
export function porousOctaveBands(layer: PorousLayer, bandsHz: readonly number[], opts: { celsius?: number } = {}): number[] {
  const g = 2 ** (1 / 3)
  return bandsHz.map((b) => {
    const a = porousAbsorptionRandom(layer, [b / g, b, b * g], opts)
    return (a[0] + a[1] + a[2]) / 3
  })
}
