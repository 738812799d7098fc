import type { Opening, Point, RoomBox, Surface } from './types'
import { SURFACES } from './types'

const fmt = (v: number): string => (Number.isFinite(v) ? String(Math.round(v * 1e4) / 1e4) : String(v))

/** Throws unless `value` is a finite number. */
export function assertFinite(value: number, what: string): void {
  if (typeof value !== 'number' || !Number.isFinite(value)) {
    throw new RangeError(`${what} must be a finite number: got ${String(value)}`)
  }
}

/** Throws unless `value` is finite and > 0. */
export function assertPositive(value: number, what: string, unit = ''): void {
  assertFinite(value, what)
  if (value <= 0) throw new RangeError(`${what} must be greater than zero: got ${fmt(value)}${unit ? ' ' + unit : ''}`)
}

/** Throws unless `value` is finite and ≥ 0. */
export function assertNonNegative(value: number, what: string, unit = ''): void {
  assertFinite(value, what)
  if (value < 0) throw new RangeError(`${what} must not be negative: got ${fmt(value)}${unit ? ' ' + unit : ''}`)
}

/**
 * A frequency band: both ends finite and > 0 Hz, the upper above the lower; returns [from, to].
 * @param names how the two ends are called in messages (the option names)
 */
export function assertBand(fromHz: number, toHz: number, names: [string, string] = ['fromHz', 'toHz']): [number, number] {
  assertPositive(fromHz, names[0], 'Hz')
  assertPositive(toHz, names[1], 'Hz')
  if (toHz <= fromHz) throw new RangeError(`${names[1]} (${toHz} Hz) must lie above ${names[0]} (${fromHz} Hz)`)
  return [fromHz, toHz]
}

/** Air temperature must be finite and above absolute zero. */
export function assertCelsius(celsius: number): void {
  assertFinite(celsius, 'air temperature (°C)')
  if (celsius <= -273.15) throw new RangeError(`air temperature lies below absolute zero: ${fmt(celsius)} °C`)
}

/** Absorption coefficient in [0, 1]. */
export function assertAlpha(alpha: number, what: string): void {
  assertFinite(alpha, what)
  if (alpha < 0 || alpha > 1) throw new RangeError(`${what} must lie between 0 and 1: got ${fmt(alpha)}`)
}

/** Room dimensions: each finite and > 0 metres. */
export function assertRoom(room: RoomBox): void {
  if (room === null || typeof room !== 'object') throw new RangeError('room must be an object with length, width and height in metres')
  assertPositive(room.length, 'room length', 'm')
  assertPositive(room.width, 'room width', 'm')
  assertPositive(room.height, 'room height', 'm')
}

/** A point inside the room or on its boundary. */
export function assertPointInRoom(room: RoomBox, p: Point, what = 'point'): void {
  if (p === null || typeof p !== 'object') throw new RangeError(`${what} must be an object with x, y, z in metres`)
  const axes: [keyof Point, number, string][] = [
    ['x', room.length, 'length'],
    ['y', room.width, 'width'],
    ['z', room.height, 'height'],
  ]
  for (const [key, limit, dim] of axes) {
    const v = p[key]
    assertFinite(v, `${what} ${key}`)
    if (v < 0) throw new RangeError(`${what} lies outside the room: ${key} = ${fmt(v)} m < 0`)
    if (v > limit) throw new RangeError(`${what} lies outside the room: ${key} = ${fmt(v)} m > ${dim} ${fmt(limit)} m`)
  }
}

export function assertSurface(surface: string, what = 'surface'): asserts surface is Surface {
  if (!(SURFACES as readonly string[]).includes(surface)) {
    throw new RangeError(`${what} must be one of ${SURFACES.join(', ')}: got '${surface}'`)
  }
}

/** An opening must lie within its wall: span along the wall and height both inside the wall's extent. */
export function assertOpening(room: RoomBox, o: Opening, what = 'opening'): void {
  if (o === null || typeof o !== 'object') throw new RangeError(`${what} must be an object`)
  assertSurface(o.wall, `${what} wall`)
  if (o.wall === 'floor' || o.wall === 'ceiling') {
    throw new RangeError(`${what} must sit in a wall (front, back, left or right): got '${o.wall}'`)
  }
  for (const k of ['from', 'to', 'bottom', 'top'] as const) assertFinite(o[k], `${what} ${k}`)
  const alongY = o.wall === 'front' || o.wall === 'back'
  const span = alongY ? room.width : room.length
  const spanName = alongY ? `width ${fmt(room.width)} m (y)` : `length ${fmt(room.length)} m (x)`
  if (o.from >= o.to) throw new RangeError(`${what} on the ${o.wall} wall: from = ${fmt(o.from)} m must be less than to = ${fmt(o.to)} m`)
  if (o.from < 0 || o.to > span) {
    throw new RangeError(`${what} lies off the ${o.wall} wall: span ${fmt(o.from)}–${fmt(o.to)} m exceeds the wall's ${spanName}`)
  }
  if (o.bottom >= o.top) throw new RangeError(`${what} on the ${o.wall} wall: bottom = ${fmt(o.bottom)} m must be below top = ${fmt(o.top)} m`)
  if (o.bottom < 0 || o.top > room.height) {
    throw new RangeError(`${what} lies off the ${o.wall} wall: height ${fmt(o.bottom)}–${fmt(o.top)} m exceeds the room height ${fmt(room.height)} m`)
  }
}

/** A list of frequencies, each finite and > 0 Hz. */
export function assertFrequencies(freqsHz: readonly number[], what = 'frequency'): void {
  if (!Array.isArray(freqsHz)) throw new RangeError(`${what} list must be an array of hertz values`)
  freqsHz.forEach((f, i) => assertPositive(f, `${what} [${i}]`, 'Hz'))
}
