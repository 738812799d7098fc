import type { Surface } from '../acoustics'

/** Words for the listener: treatment types, surfaces and corners. */
export const treatmentTypeNames: Record<string, string> = {
  panel: 'absorbing panel',
  'bass-trap': 'bass trap',
  'corner-trap': 'corner bass trap',
  cloud: 'ceiling cloud',
  diffuser: 'diffuser',
  rug: 'rug',
  curtain: 'curtain',
}

export const surfaceWords: Record<Surface, string> = {
  front: 'front wall',
  back: 'back wall',
  left: 'left wall',
  right: 'right wall',
  floor: 'floor',
  ceiling: 'ceiling',
}

export const mountingWords: Record<string, string> = {
  wall: 'fixed to the wall',
  'ceiling-hung': 'hung from the ceiling',
  stand: 'on a stand',
  floor: 'on the floor',
  corner: 'in the corner',
}

export const capitalise = (s: string) => s.charAt(0).toUpperCase() + s.slice(1)

/** Metres as the plan writes them: `1.25 m`, or `50 mm` below 10 cm when asked for millimetres. */
export const m = (v: number, digits = 2) => `${v.toFixed(digits)} m`
export const mm = (v: number) => `${Math.round(v * 1000)} mm`
export const db = (v: number) => `${v < 0 ? '-' : v > 0 ? '+' : ''}${Math.abs(v).toFixed(1)} dB`
export const s = (v: number) => `${v.toFixed(2)} s`
