/** Deep comparison with a relative tolerance for numbers (floating-point results may differ in the last bits across engines). */
export function compareGolden(actual: unknown, expected: unknown, path = '$'): string[] {
  if (typeof expected === 'number' && typeof actual === 'number') {
    const tol = 1e-9 * Math.max(1, Math.abs(expected))
    return Math.abs(actual - expected) <= tol ? [] : [`${path}: ${actual} ≠ ${expected}`]
  }
  if (Array.isArray(expected)) {
    if (!Array.isArray(actual)) return [`${path}: not an array`]
    if (actual.length !== expected.length) return [`${path}: length ${actual.length} ≠ ${expected.length}`]
    return expected.flatMap((e, i) => compareGolden(actual[i], e, `${path}[${i}]`))
  }
  if (expected && typeof expected === 'object') {
    if (!actual || typeof actual !== 'object') return [`${path}: not an object`]
    const keys = new Set([...Object.keys(expected), ...Object.keys(actual as object)])
    return [...keys].flatMap((k) => compareGolden((actual as Record<string, unknown>)[k], (expected as Record<string, unknown>)[k], `${path}.${k}`))
  }
  return actual === expected ? [] : [`${path}: ${JSON.stringify(actual)} ≠ ${JSON.stringify(expected)}`]
}
