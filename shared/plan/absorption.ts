import { OCTAVE_BANDS_HZ, PANEL_FLOW_RESISTIVITY, getMaterial, midBandAlpha, treatmentAlpha } from '../acoustics'
import type { Treatment as EngineTreatment } from '../acoustics'
import type { PlanTreatment } from '../schemas/plan'

/** The porous model the engine uses for a treatment without a materials-table row. */
export const POROUS_MODEL_SOURCE = 'porous model: Miki (J. Acoust. Soc. Jpn (E) 11(1), 1990), random incidence by the Paris average'

/**
 * The treatment as the engine takes it. A diffuser without a material row scatters rather than
 * absorbs: it goes in with no absorption (our simplification of an energy model), keeping its depth
 * for the drawings only.
 */
export function engineTreatment(t: PlanTreatment): EngineTreatment {
  const scatterOnly = t.type === 'diffuser' && !t.materialId
  return {
    type: t.type,
    surface: t.surface,
    materialId: t.materialId || undefined,
    thickness: scatterOnly ? 0 : t.thickness,
    airGap: t.airGap,
    flowResistivity: t.flowResistivity,
    width: t.width,
    height: t.height,
    x: t.x,
    y: t.y,
    z: t.z,
    mounting: t.mounting,
    label: t.label ?? t.id,
  }
}

export interface TreatmentAbsorption {
  /** per OCTAVE_BANDS_HZ (63 … 8000 Hz), null where the source gives none */
  alpha: (number | null)[]
  bandsHz: number[]
  /** mean of 500 Hz–2 kHz, capped at 0.99: the figure the engine uses for reflection levels */
  midBand: number
  /** m² of the treatment's face */
  areaM2: number
  /** where the coefficients come from, in words */
  source: string
  kind: 'table' | 'porous' | 'none'
}

/** Absorption of a plan treatment with the source of its coefficients. */
export function treatmentAbsorption(t: PlanTreatment, celsius = 20): TreatmentAbsorption {
  const e = engineTreatment(t)
  const alpha = treatmentAlpha(e, celsius)
  const areaM2 = t.width * t.height
  const base = { alpha, bandsHz: [...OCTAVE_BANDS_HZ], midBand: Math.min(0.99, midBandAlpha(alpha)), areaM2 }
  if (e.materialId) {
    const mat = getMaterial(e.materialId, 'treatment material')
    return { ...base, kind: 'table', source: `materials table: ${mat.name} (${mat.source})` }
  }
  if (e.thickness && e.thickness > 0) {
    const sigma = t.flowResistivity ?? PANEL_FLOW_RESISTIVITY
    const gap = t.airGap ? `, over a ${Math.round(t.airGap * 1000)} mm air gap` : ''
    return { ...base, kind: 'porous', source: `${POROUS_MODEL_SOURCE}; flow resistivity ${sigma.toLocaleString('en-GB')} Pa·s/m², ${Math.round(e.thickness * 1000)} mm thick${gap}` }
  }
  return {
    ...base,
    kind: 'none',
    source: t.type === 'diffuser' ? 'a diffuser spreads sound rather than absorbing it: counted with no absorption (our simplification)' : 'no absorption: give a material or a thickness',
  }
}
