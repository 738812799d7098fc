/**
 * Synthetic impulse responses built from known modes of a rigid rectangular room, independently of the
 * engine: Rayleigh's closed form f = (c/2)·√((nx/Lx)² + (ny/Ly)² + (nz/Lz)²) with
 * c = 331.3·√(1 + θ/273.15) (REFERENCES.md), cosine mode shapes at the source and the seat, each mode a
 * damped sine decaying 60 dB in T seconds (δ = 3·ln10/T), weighted 2^(non-zero indices) (1/K of the
 * normalised mode). Sources: Kuttruff, Room Acoustics, ch. 3 (modal sum of the rectangular room).
 */
export const C20 = 331.3 * Math.sqrt(1 + 20 / 273.15)
export interface Box { length: number; width: number; height: number }
export interface P { x: number; y: number; z: number }
export const rayleigh = (room: Box, n: number[]) => (C20 / 2) * Math.hypot(n[0] / room.length, n[1] / room.width, n[2] / room.height)
const shape = (room: Box, n: number[], p: P) =>
  Math.cos((n[0] * Math.PI * p.x) / room.length) * Math.cos((n[1] * Math.PI * p.y) / room.width) * Math.cos((n[2] * Math.PI * p.z) / room.height)

export function modalIr(room: Box, src: P, seat: P, opts: { rt: number; maxHz?: number; sampleRate?: number; seconds?: number; extra?: { hz: number; amp: number; rt: number }[] }): Float64Array {
  const fs = opts.sampleRate ?? 8000
  const n = Math.round((opts.seconds ?? 3) * fs)
  const lead = Math.round(0.005 * fs)
  const x = new Float64Array(n)
  const maxHz = opts.maxHz ?? 260
  const terms: { hz: number; amp: number; rt: number }[] = []
  for (let a = 0; a < 20; a++) for (let b = 0; b < 20; b++) for (let c = 0; c < 20; c++) {
    if (a + b + c === 0) continue
    const hz = rayleigh(room, [a, b, c])
    if (hz > maxHz) continue
    const nz = (a > 0 ? 1 : 0) + (b > 0 ? 1 : 0) + (c > 0 ? 1 : 0)
    terms.push({ hz, amp: 2 ** nz * shape(room, [a, b, c], src) * shape(room, [a, b, c], seat), rt: opts.rt })
  }
  terms.push(...(opts.extra ?? []))
  for (const t of terms) {
    const w = 2 * Math.PI * t.hz
    const d = (3 * Math.LN10) / t.rt
    const step = Math.exp(-d / fs)
    let env = 1
    for (let i = lead; i < n; i++) {
      x[i] += t.amp * env * Math.sin((w * (i - lead)) / fs)
      env *= step
    }
  }
  return x
}
