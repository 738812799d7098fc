/** Air temperature at which the engine's speedOfSound gives `c` m/s (inverse of c = 331.3·√(1 + θ/273.15)). */
export function celsiusFor(c: number): number {
  return 273.15 * ((c / 331.3) ** 2 - 1)
}

/** Recursively freeze a value so any mutation by the code under test throws. */
export function deepFreeze<T>(v: T): T {
  if (v && typeof v === 'object') {
    Object.values(v as object).forEach(deepFreeze)
    Object.freeze(v)
  }
  return v
}
