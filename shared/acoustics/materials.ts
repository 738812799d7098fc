import { porousOctaveBands } from './absorbers'
import { OCTAVE_BANDS_HZ } from './types'

export type MaterialCategory = 'wall' | 'floor' | 'ceiling' | 'glazing' | 'door' | 'opening' | 'furnishing' | 'absorber'

export interface Material {
  /** stable id, e.g. 'gypsum-on-studs' */
  id: string
  name: string
  category: MaterialCategory
  /**
   * random-incidence absorption coefficients at OCTAVE_BANDS_HZ (63, 125, …, 8000 Hz); null where the
   * source gives no value. Furnishings: per m² of floor area they occupy.
   */
  alpha: readonly (number | null)[]
  /** where the coefficients come from */
  source: string
}

const BIES = 'Bies, Hansen & Howard, Engineering Noise Control, Table 6.2'
const EVEREST = 'Everest, Master Handbook of Acoustics 4e, reverberation worked example'
const VORLAENDER = 'Vorländer, Auralization (2008), Annex table of absorption coefficients (as tabulated in pyroomacoustics, data/materials.json)'

/**
 * Flow resistivity of the computed porous panels, Pa·s/m². One basis for every porous figure: the
 * measured row "glass or rock wool 50 mm, 16 kg/m³" of Bies, Hansen & Howard, Table 6.2 (.17 .45 .80 .89
 * .97 .94). This σ is the least-squares fit of the Miki model (random incidence by the Paris average) to
 * that row over 125 Hz–4 kHz (rms 0.04); it is a calibration to reverberation-room coefficients, which
 * include edge effects, rather than a measured σ of the board.
 */
export const PANEL_FLOW_RESISTIVITY = 36_000

/** The porous model used for treatments and computed panels: Miki, which stays physical at low ρf/σ where Delany–Bazley's fit ends (X < 0.01). */
export const PANEL_POROUS_MODEL = 'miki' as const

const row = (id: string, name: string, category: MaterialCategory, source: string, a125_4k: number[], a8k: number | null = null, a63: number | null = null): Material => ({
  id, name, category, source, alpha: [a63, ...a125_4k, a8k],
})

function computedPanel(thicknessMm: number, gapMm = 0): Material {
  const layer = { thickness: thicknessMm / 1000, flowResistivity: PANEL_FLOW_RESISTIVITY, airGap: gapMm / 1000, model: PANEL_POROUS_MODEL }
  const alpha = porousOctaveBands(layer, OCTAVE_BANDS_HZ).map((a) => Math.round(a * 100) / 100)
  return {
    id: gapMm ? `porous-panel-${thicknessMm}mm-gap-${gapMm}mm` : `porous-panel-${thicknessMm}mm`,
    name: `Porous panel ${thicknessMm} mm${gapMm ? ` over a ${gapMm} mm air gap` : ' on the wall'}, σ = ${PANEL_FLOW_RESISTIVITY / 1000} kPa·s/m²`,
    category: 'absorber',
    alpha,
    source: `computed: Miki, J. Acoust. Soc. Jpn (E) 11(1), 1990, with the Paris random-incidence average; σ = ${PANEL_FLOW_RESISTIVITY} Pa·s/m², fitted to the 50 mm mineral-wool row of ${BIES}`,
  }
}

export const MATERIALS: readonly Material[] = [
  row('gypsum-on-studs', 'Gypsum board, 13 mm on studs', 'wall', `${BIES}; ${EVEREST}`, [0.29, 0.1, 0.05, 0.04, 0.07, 0.09]),
  row('plasterboard-double-on-frame', 'Two layers of 13 mm plasterboard on a steel frame, mineral wool in the cavity, painted', 'wall', VORLAENDER, [0.15, 0.1, 0.06, 0.04, 0.04, 0.05], 0.05),
  row('plaster-on-masonry', 'Hard plaster on masonry, hard surfaces in general', 'wall', VORLAENDER, [0.02, 0.02, 0.03, 0.03, 0.04, 0.05], 0.05),
  row('brickwork-rendered', 'Rendered brickwork', 'wall', VORLAENDER, [0.01, 0.02, 0.02, 0.03, 0.03, 0.04], 0.04),
  row('concrete-rough', 'Rough concrete', 'wall', VORLAENDER, [0.02, 0.03, 0.03, 0.03, 0.04, 0.07], 0.07),
  row('wood-panelling-on-frame', 'Wooden lining, 12 mm on a frame', 'wall', VORLAENDER, [0.27, 0.23, 0.22, 0.15, 0.1, 0.07], 0.06),
  row('wood-16mm-on-studs', '16 mm wood on 40 mm studs', 'wall', VORLAENDER, [0.18, 0.12, 0.1, 0.09, 0.08, 0.07], 0.07),
  row('acoustic-plaster-25mm', 'Acoustic plaster, about 25 mm', 'wall', VORLAENDER, [0.17, 0.36, 0.66, 0.65, 0.62, 0.68]),
  row('concrete-floor', 'Concrete floor, bare', 'floor', EVEREST, [0.01, 0.01, 0.015, 0.02, 0.02, 0.02]),
  row('ceramic-tiles', 'Ceramic tiles, smooth', 'floor', VORLAENDER, [0.01, 0.01, 0.01, 0.02, 0.02, 0.02], 0.02),
  row('wood-floor-on-joists', 'Wooden floor on joists', 'floor', BIES, [0.15, 0.11, 0.1, 0.07, 0.06, 0.07]),
  row('linoleum-on-concrete', 'Linoleum, rubber or cork tile on concrete', 'floor', VORLAENDER, [0.02, 0.03, 0.03, 0.03, 0.03, 0.02]),
  row('heavy-carpet-on-concrete', 'Heavy carpet on concrete', 'floor', BIES, [0.02, 0.06, 0.14, 0.37, 0.6, 0.65]),
  row('carpet-on-felt-underlay', '9 mm tufted pile carpet on felt underlay', 'floor', VORLAENDER, [0.08, 0.08, 0.3, 0.6, 0.75, 0.8], 0.8),
  row('carpet-thin-on-concrete', 'Thin carpet cemented to concrete', 'floor', VORLAENDER, [0.02, 0.04, 0.08, 0.2, 0.35, 0.4]),
  row('plasterboard-ceiling-on-battens', 'Plasterboard ceiling on battens, large air space above', 'ceiling', VORLAENDER, [0.2, 0.15, 0.1, 0.08, 0.04, 0.02]),
  row('window-glass', 'Ordinary window glass', 'glazing', BIES, [0.35, 0.25, 0.18, 0.12, 0.07, 0.04]),
  row('double-glazing', 'Double glazing, 2–3 mm panes, gap over 30 mm', 'glazing', VORLAENDER, [0.15, 0.05, 0.03, 0.03, 0.02, 0.02], 0.02),
  row('door-solid-wood', 'Solid wooden door', 'door', VORLAENDER, [0.14, 0.1, 0.06, 0.08, 0.1, 0.1], 0.1),
  row('open-doorway', 'Open doorway or opening to a large space', 'opening',
    'Sabine\'s open-window unit: an opening into a large space returns no sound, α = 1 (Kuttruff, Room Acoustics, ch. 5)',
    [1, 1, 1, 1, 1, 1], 1, 1),
  row('curtains-cotton-draped', 'Cotton curtains, 0.5 kg/m², draped to 3/4 area about 130 mm from the wall', 'furnishing', VORLAENDER, [0.3, 0.45, 0.65, 0.56, 0.59, 0.71], 0.71),
  row('curtains-light', 'Light curtains, 0.2 kg/m², hung 90 mm from the wall', 'furnishing', VORLAENDER, [0.05, 0.06, 0.39, 0.63, 0.7, 0.73], 0.73),
  row('curtains-heavy-folded', 'Curtain fabric, folded, 15 cm from the wall', 'furnishing', VORLAENDER, [0.12, 0.6, 0.98, 1, 1, 1], 1),
  row('blinds-half-open', 'Vertical blinds 15 cm from the wall, half open', 'furnishing', VORLAENDER, [0.03, 0.09, 0.24, 0.46, 0.79, 0.76]),
  row('upholstered-seating-cloth', 'Upholstered seating with cloth cover, per m² of floor it occupies', 'furnishing', VORLAENDER, [0.44, 0.6, 0.77, 0.89, 0.82, 0.7], 0.7),
  row('upholstered-seating-leather', 'Upholstered seating with leather cover, per m² of floor it occupies', 'furnishing', VORLAENDER, [0.4, 0.5, 0.58, 0.61, 0.58, 0.5], 0.5),
  row('mineral-wool-50mm-16kg', 'Glass or rock wool 50 mm, 16 kg/m³, on the wall', 'absorber', BIES, [0.17, 0.45, 0.8, 0.89, 0.97, 0.94]),
  row('rockwool-50mm-40kg', 'Rock wool 50 mm, 40 kg/m³', 'absorber', VORLAENDER, [0.23, 0.59, 0.86, 0.86, 0.86, 0.86], 0.86),
  row('rockwool-50mm-80kg', 'Rock wool 50 mm, 80 kg/m³', 'absorber', VORLAENDER, [0.22, 0.6, 0.92, 0.9, 0.88, 0.88], 0.88),
  row('mineral-wool-50mm-300mm-gap', 'Mineral wool 50 mm, 70 kg/m³, 300 mm in front of the wall', 'absorber', VORLAENDER, [0.7, 0.45, 0.65, 0.6, 0.75, 0.65], 0.65),
  computedPanel(25),
  computedPanel(50),
  computedPanel(75),
  computedPanel(100),
  computedPanel(150),
  computedPanel(200),
  computedPanel(50, 50),
  computedPanel(100, 100),
]

const BY_ID = new Map(MATERIALS.map((m) => [m.id, m]))

/** Look a material up by id; throws a RangeError naming an unknown id. */
export function getMaterial(id: string, what = 'material'): Material {
  const m = BY_ID.get(id)
  if (!m) throw new RangeError(`unknown ${what} id '${String(id)}'`)
  return m
}

export function hasMaterial(id: string): boolean {
  return BY_ID.has(id)
}

/** Material used for an opening of a given kind, or null to keep the wall's own material. */
export function materialForOpening(kind: string): string | null {
  const k = kind.toLowerCase()
  if (k.includes('shelv') || k.includes('alcove') || k.includes('fireplace')) return null
  if (k.includes('window') || k.includes('glaz')) return 'window-glass'
  if (k.includes('doorway') || k.includes('open') || k.includes('arch') || k.includes('passage')) return 'open-doorway'
  if (k.includes('door')) return 'door-solid-wood'
  return null
}
