import { describe, expect, it } from 'vitest'
import { cubicMetresToCubicFeet, feetInchesToMetres, feetToMetres, formatFeetInches, metresToFeet, metresToFeetInches, speedOfSound, squareFeetToSquareMetres, squareMetresToSquareFeet } from '../../../shared/acoustics'

describe('speedOfSound', () => {
  it('matches the published values at 0, 20 and 25 °C (REFERENCES.md; python-acoustics tests/test_atmosphere.py asserts 343.2 m/s at 293.15 K)', () => {
    expect(speedOfSound(0)).toBeCloseTo(331.3, 6)
    expect(speedOfSound(20)).toBeCloseTo(343.21, 2)
    expect(speedOfSound()).toBeCloseTo(343.21, 2)
    expect(speedOfSound(25)).toBeCloseTo(346.13, 2)
  })
  it('agrees with the ISO 9613-1 form 343.2·√(T/293.15) to within 0.02 m/s from −10 to 40 °C', () => {
    for (let t = -10; t <= 40; t += 5) expect(Math.abs(speedOfSound(t) - 343.2 * Math.sqrt((t + 273.15) / 293.15))).toBeLessThan(0.02)
  })
  it('rises with temperature', () => {
    expect(speedOfSound(30)).toBeGreaterThan(speedOfSound(10))
  })
  it('rejects temperatures at or below absolute zero and NaN', () => {
    expect(() => speedOfSound(-273.15)).toThrow(RangeError)
    expect(() => speedOfSound(-300)).toThrow(/absolute zero: -300/)
    expect(() => speedOfSound(Number.NaN)).toThrow(RangeError)
  })
})

describe('imperial helpers', () => {
  it('converts feet and inches to metres exactly (1 ft = 0.3048 m, 1 in = 0.0254 m by definition)', () => {
    expect(feetInchesToMetres(16)).toBeCloseTo(4.8768, 12)
    expect(feetInchesToMetres(5, 6)).toBeCloseTo(1.6764, 12)
    expect(feetToMetres(10)).toBeCloseTo(3.048, 12)
    expect(metresToFeet(3.048)).toBeCloseTo(10, 12)
  })
  it('round-trips metres → feet + inches → metres to the inch step', () => {
    for (const m of [0, 0.1, 1, 2.4, 3.33, 4.8768, 7.25, 12.01]) {
      const { feet, inches } = metresToFeetInches(m)
      expect(inches).toBeGreaterThanOrEqual(0)
      expect(inches).toBeLessThan(12)
      expect(Math.abs(feetInchesToMetres(feet, inches) - m)).toBeLessThanOrEqual(0.125 * 0.0254 + 1e-12)
    }
  })
  it('carries 12 inches into a foot', () => {
    expect(metresToFeetInches(0.3047)).toEqual({ feet: 1, inches: 0 })
    expect(metresToFeetInches(4.8768)).toEqual({ feet: 16, inches: 0 })
    expect(formatFeetInches(1.6764)).toBe('5 ft 6 in')
    expect(formatFeetInches(0.3048 * 16 + 0.0254 * 4.5)).toBe('16 ft 4.5 in')
  })
  it('converts areas and volumes', () => {
    expect(squareMetresToSquareFeet(1)).toBeCloseTo(10.7639, 4)
    expect(squareFeetToSquareMetres(squareMetresToSquareFeet(12.5))).toBeCloseTo(12.5, 12)
    expect(cubicMetresToCubicFeet(1)).toBeCloseTo(35.3147, 4)
  })
  it('rejects negative lengths and non-finite input', () => {
    expect(() => metresToFeetInches(-1)).toThrow(/must not be negative: got -1/)
    expect(() => feetInchesToMetres(Number.POSITIVE_INFINITY)).toThrow(RangeError)
  })
})
