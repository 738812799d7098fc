import { describe, expect, it } from 'vitest'
import type { Complex } from '../../../shared/acoustics'
import { airDensity, porousAbsorption, porousAbsorptionRandom, porousCharacteristics, porousSurfaceImpedance, speedOfSound } from '../../../shared/acoustics'
import { deepFreeze } from './helpers'

describe('porousCharacteristics — Delany & Bazley, Applied Acoustics 3, 1970', () => {
  it('at X = ρ₀f/σ = 0.1 gives Zc/ρ₀c₀ = 1.32406797 − 0.46937424j and kc/k₀ = 1.49016111 − 0.74380964j (REFERENCES.md, follows from the formulas)', () => {
    const rho0 = 1.2
    const sigma = 12_000
    const f = (0.1 * sigma) / rho0
    const { z, k } = porousCharacteristics('delany-bazley', f, sigma, rho0)
    expect(z[0]).toBeCloseTo(1.32406797, 8)
    expect(z[1]).toBeCloseTo(-0.46937424, 8)
    expect(k[0]).toBeCloseTo(1.49016111, 8)
    expect(k[1]).toBeCloseTo(-0.74380964, 8)
  })
  it('Miki (J. Acoust. Soc. Jpn (E) 11(1), 1990) at Y = f/σ = 0.1 gives Zc/ρ₀c₀ = 1.29955542 − 0.45854692j and kc/k₀ = 1.45229991 − 0.66392647j (REFERENCES.md formulas, worked by hand)', () => {
    const { z, k } = porousCharacteristics('miki', 1000, 10_000)
    expect(z[0]).toBeCloseTo(1.29955542, 8)
    expect(z[1]).toBeCloseTo(-0.45854692, 8)
    expect(k[0]).toBeCloseTo(1.45229991, 8)
    expect(k[1]).toBeCloseTo(-0.66392647, 8)
  })
  it('Miki (J. Acoust. Soc. Jpn (E) 11(1), 1990) stays within 10 % of Delany–Bazley in the middle of their range', () => {
    const a = porousCharacteristics('delany-bazley', 1000, 10_000)
    const b = porousCharacteristics('miki', 1000, 10_000)
    expect(Math.abs(a.z[0] - b.z[0]) / a.z[0]).toBeLessThan(0.1)
    expect(Math.abs(a.k[0] - b.k[0]) / a.k[0]).toBeLessThan(0.1)
  })
})

// independent transfer-matrix evaluation of layer + air gap on a rigid wall (Cox & D'Antonio, Acoustic Absorbers and Diffusers, ch. 2)
type C = Complex
const mul = (a: C, b: C): C => [a[0] * b[0] - a[1] * b[1], a[0] * b[1] + a[1] * b[0]]
const add = (a: C, b: C): C => [a[0] + b[0], a[1] + b[1]]
const div = (a: C, b: C): C => { const d = b[0] ** 2 + b[1] ** 2; return [(a[0] * b[0] + a[1] * b[1]) / d, (a[1] * b[0] - a[0] * b[1]) / d] }
const ccos = (z: C): C => [Math.cos(z[0]) * Math.cosh(z[1]), -Math.sin(z[0]) * Math.sinh(z[1])]
const csin = (z: C): C => [Math.sin(z[0]) * Math.cosh(z[1]), Math.cos(z[0]) * Math.sinh(z[1])]
function layerMatrix(zc: C, kd: C): [C, C, C, C] {
  const j: C = [0, 1]
  return [ccos(kd), mul(mul(j, zc), csin(kd)), div(mul(j, csin(kd)), zc), ccos(kd)]
}
function matmul(a: [C, C, C, C], b: [C, C, C, C]): [C, C, C, C] {
  return [add(mul(a[0], b[0]), mul(a[1], b[2])), add(mul(a[0], b[1]), mul(a[1], b[3])), add(mul(a[2], b[0]), mul(a[3], b[2])), add(mul(a[2], b[1]), mul(a[3], b[3]))]
}

describe('porousAbsorption', () => {
  const freqs = [63, 125, 250, 500, 1000, 2000, 4000]
  for (const model of ['delany-bazley', 'miki'] as const) it(`agrees with an independent transfer-matrix evaluation (layer × air gap, rigid wall: Zs = T11/T21), ${model}`, () => {
    const layer = { thickness: 0.05, flowResistivity: 15_000, airGap: 0.08, model }
    const c0 = speedOfSound(20)
    const rho0 = airDensity(20)
    for (const f of freqs) {
      const { z, k } = porousCharacteristics(model, f, layer.flowResistivity, rho0)
      const k0 = (2 * Math.PI * f) / c0
      const t = matmul(layerMatrix(z, [k[0] * k0 * layer.thickness, k[1] * k0 * layer.thickness]), layerMatrix([1, 0], [k0 * layer.airGap, 0]))
      const zs = div(t[0], t[2])
      const ours = porousSurfaceImpedance(layer, f)
      expect(ours[0]).toBeCloseTo(zs[0], 9)
      expect(ours[1]).toBeCloseTo(zs[1], 9)
      const r = div(add(zs, [-1, 0]), add(zs, [1, 0]))
      expect(porousAbsorption(layer, [f])[0]).toBeCloseTo(1 - (r[0] ** 2 + r[1] ** 2), 9)
    }
  })
  it('rigid backing equals −j·Zc·cot(kc·d), and a zero air gap equals no gap', () => {
    const a = porousAbsorption({ thickness: 0.1, flowResistivity: 8000 }, freqs)
    const b = porousAbsorption({ thickness: 0.1, flowResistivity: 8000, airGap: 0 }, freqs)
    a.forEach((v, i) => expect(v).toBeCloseTo(b[i], 12))
  })
  it('stays within 0…1, and thicker layers or an air gap absorb more at low frequencies', () => {
    const thin = porousAbsorption({ thickness: 0.025, flowResistivity: 10_000 }, [125])[0]
    const thick = porousAbsorption({ thickness: 0.1, flowResistivity: 10_000 }, [125])[0]
    const gap = porousAbsorption({ thickness: 0.025, flowResistivity: 10_000, airGap: 0.1 }, [125])[0]
    expect(thick).toBeGreaterThan(thin)
    expect(gap).toBeGreaterThan(thin)
    for (const model of ['delany-bazley', 'miki'] as const) {
      for (const v of porousAbsorption({ thickness: 0.05, flowResistivity: 20_000, airGap: 0.05, model }, freqs)) {
        expect(v).toBeGreaterThanOrEqual(0)
        expect(v).toBeLessThanOrEqual(1)
      }
    }
  })
  it('a thick layer absorbs nearly everything at high frequencies (its impedance tends to Zc)', () => {
    expect(porousAbsorption({ thickness: 0.2, flowResistivity: 10_000 }, [4000])[0]).toBeGreaterThan(0.95)
  })
  it('random incidence (Paris integral, locally reacting) stays within 0…1 and is nearly as high as normal incidence at mid frequencies for 100 mm', () => {
    const layer = { thickness: 0.1, flowResistivity: 10_000 }
    const rnd = porousAbsorptionRandom(layer, freqs)
    const nrm = porousAbsorption(layer, freqs)
    rnd.forEach((v) => { expect(v).toBeGreaterThanOrEqual(0); expect(v).toBeLessThanOrEqual(1) })
    expect(Math.abs(rnd[4] - nrm[4])).toBeLessThan(0.15)
  })
  it('does not mutate its inputs and rejects impossible layers', () => {
    const layer = deepFreeze({ thickness: 0.05, flowResistivity: 10_000 })
    const f = deepFreeze([125, 250])
    expect(() => porousAbsorption(layer, f)).not.toThrow()
    expect(() => porousAbsorption({ thickness: 0, flowResistivity: 10_000 }, [125])).toThrow('layer thickness must be greater than zero: got 0 m')
    expect(() => porousAbsorption({ thickness: 0.05, flowResistivity: -5 }, [125])).toThrow(/flow resistivity must be greater than zero/)
    expect(() => porousAbsorption({ thickness: 0.05, flowResistivity: 1e4, airGap: -0.1 }, [125])).toThrow(/air gap must not be negative/)
    expect(() => porousAbsorption({ thickness: 0.05, flowResistivity: 1e4 }, [0])).toThrow(/frequency \[0\] must be greater than zero/)
  })
})
