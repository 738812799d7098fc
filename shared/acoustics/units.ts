import { assertCelsius, assertFinite, assertNonNegative } from './validate'

/** Metres per international foot (exact). */
export const METRES_PER_FOOT = 0.3048
/** Metres per inch (exact). */
export const METRES_PER_INCH = 0.0254

/**
 * Speed of sound in dry air, m/s.
 * @param celsius air temperature, °C (default 20)
 * @see c = 331.3·√(1 + θ/273.15) m/s (ISO 9613-1 form 343.2·√(T/293.15); python-acoustics atmosphere)
 */
export function speedOfSound(celsius = 20): number {
  assertCelsius(celsius)
  return 331.3 * Math.sqrt(1 + celsius / 273.15)
}

/**
 * Density of dry air at sea-level pressure, kg/m³ (ideal gas, R = 287.05 J/(kg·K)).
 * @param celsius air temperature, °C (default 20)
 */
export function airDensity(celsius = 20): number {
  assertCelsius(celsius)
  return 101325 / (287.05 * (celsius + 273.15))
}

/** Feet plus inches → metres. */
export function feetInchesToMetres(feet: number, inches = 0): number {
  assertFinite(feet, 'feet')
  assertFinite(inches, 'inches')
  return feet * METRES_PER_FOOT + inches * METRES_PER_INCH
}

export function feetToMetres(feet: number): number {
  assertFinite(feet, 'feet')
  return feet * METRES_PER_FOOT
}

export function metresToFeet(metres: number): number {
  assertFinite(metres, 'metres')
  return metres / METRES_PER_FOOT
}

/**
 * Metres → whole feet plus inches, inches rounded to `inchStep` (default 1/4 inch), carrying 12 inches into a foot.
 * Lengths only: throws for a negative value.
 */
export function metresToFeetInches(metres: number, inchStep = 0.25): { feet: number; inches: number } {
  assertNonNegative(metres, 'length in metres', 'm')
  assertFinite(inchStep, 'inch step')
  if (inchStep <= 0) throw new RangeError(`inch step must be greater than zero: got ${inchStep}`)
  const totalInches = Math.round(metres / METRES_PER_INCH / inchStep) * inchStep
  let feet = Math.floor(totalInches / 12 + 1e-9)
  let inches = totalInches - feet * 12
  if (inches < 1e-9) inches = 0
  if (inches >= 12 - 1e-9) { feet += 1; inches = 0 }
  return { feet, inches: Math.round(inches / inchStep) * inchStep }
}

/** Metres → a label such as `16 ft 4.5 in`. */
export function formatFeetInches(metres: number, inchStep = 0.25): string {
  const { feet, inches } = metresToFeetInches(metres, inchStep)
  return inches === 0 ? `${feet} ft` : `${feet} ft ${inches} in`
}

export function squareMetresToSquareFeet(m2: number): number {
  assertFinite(m2, 'area in m²')
  return m2 / (METRES_PER_FOOT * METRES_PER_FOOT)
}

export function squareFeetToSquareMetres(ft2: number): number {
  assertFinite(ft2, 'area in ft²')
  return ft2 * METRES_PER_FOOT * METRES_PER_FOOT
}

export function cubicMetresToCubicFeet(m3: number): number {
  assertFinite(m3, 'volume in m³')
  return m3 / METRES_PER_FOOT ** 3
}
