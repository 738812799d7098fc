import type { RoomMode, Surface } from '../../../shared/acoustics'

export const surfaceLabel: Record<Surface, string> = {
  front: 'Front wall',
  back: 'Back wall',
  left: 'Left wall',
  right: 'Right wall',
  floor: 'Floor',
  ceiling: 'Ceiling',
}

export const modeKindLabel: Record<RoomMode['kind'], string> = {
  axial: 'Axial',
  tangential: 'Tangential',
  oblique: 'Oblique',
}

/** What a mode's indices mean in words: '2 × length', 'length + height', 'all three'. */
export function modeAlong(n: readonly [number, number, number]): string {
  const names = ['length', 'width', 'height']
  const parts = n.flatMap((k, i) => (k ? [k === 1 ? names[i]! : `${k} × ${names[i]}`] : []))
  return parts.length === 3 ? `${parts.join(', ')}` : parts.join(' + ')
}

export const modeIndices = (n: readonly [number, number, number]) => n.join('-')
export const modeKey = (n: readonly [number, number, number]) => n.join(',')

export const hz = (value: number, digits = 1) => `${value.toFixed(digits)} Hz`
export const db = (value: number, digits = 1) => `${value > 0 ? '+' : value < 0 ? '−' : ''}${Math.abs(value).toFixed(digits)} dB`
export const ms = (value: number) => `${value.toFixed(1)} ms`
export const seconds = (value: number) => `${value.toFixed(2)} s`
export const bandLabel = (value: number) => (value >= 1000 ? `${value / 1000}k` : String(value))
