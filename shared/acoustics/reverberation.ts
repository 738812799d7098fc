import { porousOctaveBands } from './absorbers'
import { PANEL_FLOW_RESISTIVITY, PANEL_POROUS_MODEL, getMaterial, materialForOpening } from './materials'
import type { Furnishing, Opening, RoomBox, Surface, Treatment } from './types'
import { OCTAVE_BANDS_HZ, SURFACES, furnishingArea, roomSurfaceArea, roomVolume, surfaceArea, treatmentSize, treatmentSurface } from './types'
import { speedOfSound } from './units'
import { assertCelsius, assertFinite, assertNonNegative, assertOpening, assertPositive, assertRoom, assertSurface } from './validate'

/**
 * Schroeder frequency, Hz: above it modes overlap and the field is statistical.
 * @param rt60 seconds; @param volume m³
 * @see Schroeder, "The Schroeder frequency revisited", JASA 99(5), 1996: f = 2000·√(T/V)
 */
export function schroederFrequency(rt60: number, volume: number): number {
  assertPositive(rt60, 'reverberation time', 's')
  assertPositive(volume, 'room volume', 'm³')
  return 2000 * Math.sqrt(rt60 / volume)
}

export interface RtOptions {
  /** air temperature, °C (default 20); sets c in 24·ln10/c */
  celsius?: number
  /** speed of sound, m/s (overrides celsius) */
  speedOfSound?: number
  /** air absorption, energy attenuation coefficient m in 1/m (α_dB / 4.343); default 0 */
  airAttenuation?: number
}

function rtConstant(opts: RtOptions): { k: number; m: number } {
  const c = opts.speedOfSound ?? speedOfSound(opts.celsius ?? 20)
  assertPositive(c, 'speed of sound', 'm/s')
  const m = opts.airAttenuation ?? 0
  assertNonNegative(m, 'air attenuation coefficient', '1/m')
  return { k: (24 * Math.LN10) / c, m }
}

/**
 * Sabine reverberation time, s.
 * @param volume m³; @param absorptionArea m² (metric sabins)
 * @see Sabine; T = (24·ln10/c)·V/(A + 4mV) (Kuttruff, Room Acoustics, ch. 5)
 */
export function sabineRt(volume: number, absorptionArea: number, opts: RtOptions = {}): number {
  assertPositive(volume, 'room volume', 'm³')
  assertNonNegative(absorptionArea, 'absorption area', 'm²')
  const { k, m } = rtConstant(opts)
  const a = absorptionArea + 4 * m * volume
  if (a <= 0) throw new RangeError('absorption area is zero: the reverberation time would be infinite')
  return (k * volume) / a
}

/**
 * Eyring reverberation time, s.
 * @param volume m³; @param surfaceArea m²; @param meanAlpha mean absorption coefficient, 0 < ᾱ ≤ 1
 * @see Eyring, JASA 1, 1930; T = (24·ln10/c)·V/(−S·ln(1 − ᾱ) + 4mV)
 */
export function eyringRt(volume: number, surfaceArea: number, meanAlpha: number, opts: RtOptions = {}): number {
  assertPositive(volume, 'room volume', 'm³')
  assertPositive(surfaceArea, 'surface area', 'm²')
  assertFinite(meanAlpha, 'mean absorption coefficient')
  if (meanAlpha < 0 || meanAlpha > 1) throw new RangeError(`mean absorption coefficient must lie between 0 and 1: got ${meanAlpha}`)
  const { k, m } = rtConstant(opts)
  const a = -surfaceArea * Math.log(1 - meanAlpha) + 4 * m * volume
  if (a <= 0) throw new RangeError('mean absorption coefficient is zero: the reverberation time would be infinite')
  return (k * volume) / a
}

/**
 * Attenuation of sound in air, dB/m.
 * @param hz frequency; opts.celsius (default 20), opts.humidity relative, % (default 50), opts.pressureKPa (default 101.325)
 * @see ISO 9613-1:1993, eqs. (3)–(5) and Annex B (saturation vapour pressure)
 */
export function airAttenuationDbPerM(hz: number, opts: { celsius?: number; humidity?: number; pressureKPa?: number } = {}): number {
  assertPositive(hz, 'frequency', 'Hz')
  const celsius = opts.celsius ?? 20
  assertCelsius(celsius)
  const hr = opts.humidity ?? 50
  assertFinite(hr, 'relative humidity (%)')
  if (hr < 0 || hr > 100) throw new RangeError(`relative humidity must lie between 0 and 100 %: got ${hr}`)
  const pa = opts.pressureKPa ?? 101.325
  assertPositive(pa, 'air pressure', 'kPa')
  const pr = 101.325
  const T = celsius + 273.15
  const T0 = 293.15
  const T01 = 273.16
  const psatRatio = 10 ** (-6.8346 * (T01 / T) ** 1.261 + 4.6151)
  const h = (hr * psatRatio) / (pa / pr)
  const frO = (pa / pr) * (24 + (4.04e4 * h * (0.02 + h)) / (0.391 + h))
  const frN = (pa / pr) * (T / T0) ** -0.5 * (9 + 280 * h * Math.exp(-4.17 * ((T / T0) ** (-1 / 3) - 1)))
  const f2 = hz * hz
  return (
    8.686 * f2 *
    (1.84e-11 * (pr / pa) * Math.sqrt(T / T0) +
      (T / T0) ** -2.5 * ((0.01275 * Math.exp(-2239.1 / T)) / (frO + f2 / frO) + (0.1068 * Math.exp(-3352 / T)) / (frN + f2 / frN)))
  )
}

export interface ReverberationInput {
  room: RoomBox
  /** material id per surface */
  surfaces: Record<Surface, string>
  openings?: Opening[]
  furnishings?: Furnishing[]
  treatments?: Treatment[]
  celsius?: number
  /** relative humidity, % (default 50) */
  humidity?: number
  /** the panel the targets' panel areas are worked out for (default 'porous-panel-50mm') and the surface it covers (default 'left') */
  panelMaterialId?: string
  panelSurface?: Surface
}

export interface ReverberationBand {
  hz: number
  /** Σ S·α of the surfaces plus furnishings and treatments, m² (without air) */
  absorptionAreaM2: number
  /** 4mV, m² */
  airAbsorptionAreaM2: number
  meanAlpha: number
  sabine: number
  eyring: number
}

export interface RtTarget {
  rule: 'bs1116' | 'domestic'
  description: string
  /** per band, seconds */
  bands: {
    hz: number; target: number; lower: number; upper: number; eyring: number; status: 'above' | 'within' | 'below'
    /** absorption area (metric sabins, m² of a perfect absorber) to add for the target */
    extraAbsorptionM2: number
    /**
     * face area of the chosen panel (`panel`) that adds it: extraAbsorptionM2 / (α_panel − α_surface), the panel
     * covering that much of the surface; null where the panel absorbs no more than the surface (or nothing is needed: 0)
     */
    panelAreaM2: number | null
  }[]
  /** the panel the areas are for and the surface it covers */
  panel: { materialId: string; coversSurface: Surface; coversMaterialId: string }
}

export interface ReverberationAnalysis {
  volumeM3: number
  surfaceAreaM2: number
  bands: ReverberationBand[]
  /** Eyring, mean of the 125 and 250 Hz bands, s */
  lowFrequencyRt: number
  schroederHz: number
  /** where each surface's area went, m² */
  areas: { surface: Surface; materialId: string; areaM2: number }[]
  targets: { bs1116: RtTarget; domestic: RtTarget }
}

/** Absorption per octave band (OCTAVE_BANDS_HZ) of a treatment; null entries where unknown. */
export function treatmentAlpha(t: Treatment, celsius = 20): (number | null)[] {
  if (t.materialId) return [...getMaterial(t.materialId, 'treatment material').alpha]
  if (t.thickness !== undefined && t.thickness !== 0) {
    assertPositive(t.thickness, 'treatment thickness', 'm')
    const layer = { thickness: t.thickness, flowResistivity: t.flowResistivity ?? PANEL_FLOW_RESISTIVITY, airGap: t.airGap, model: PANEL_POROUS_MODEL }
    return porousOctaveBands(layer, OCTAVE_BANDS_HZ, { celsius })
  }
  return OCTAVE_BANDS_HZ.map(() => null)
}

/** Mean of a row's 500, 1000 and 2000 Hz coefficients: the figure used for first-reflection levels. */
export function midBandAlpha(alpha: readonly (number | null)[]): number {
  const v = [alpha[3], alpha[4], alpha[5]].filter((a): a is number => a !== null)
  return v.length ? v.reduce((s, a) => s + a, 0) / v.length : 0
}

/** BS.1116 tolerance about Tm (from memory): ±0.05 s from 200 Hz to 4 kHz, upper limit rising to +0.3 s at 63 Hz, lower limit −0.1 s at 8 kHz. */
function bs1116Limits(hz: number, tm: number): { lower: number; upper: number } {
  const up = hz >= 200 ? 0.05 : 0.05 + (0.25 * Math.log(200 / hz)) / Math.log(200 / 63)
  const lo = hz > 4000 ? 0.1 : 0.05
  return { lower: tm - lo, upper: tm + up }
}

/**
 * Reverberation per octave band (125 Hz–4 kHz, and 63 Hz / 8 kHz where every material has data):
 * Sabine and Eyring from the surface areas (less openings and treatments, which add their own
 * absorption), furnishings and air absorption; the Schroeder frequency; targets with the extra
 * absorption area per band needed to reach them (Eyring solved for the area).
 * @see ITU-R BS.1116 (from memory): Tm = 0.25·(V/100 m³)^(1/3) s; domestic target 0.3 s ± 0.1 s (common practice, no source)
 */
export function bandReverberation(input: ReverberationInput): ReverberationAnalysis {
  const { room } = input
  assertRoom(room)
  const celsius = input.celsius ?? 20
  assertCelsius(celsius)
  const humidity = input.humidity ?? 50
  for (const s of SURFACES) {
    if (!input.surfaces || typeof input.surfaces[s] !== 'string') throw new RangeError(`surface material missing for the ${s}`)
    getMaterial(input.surfaces[s], `${s} material`)
  }
  const v = roomVolume(room)
  const sTotal = roomSurfaceArea(room)
  const nb = OCTAVE_BANDS_HZ.length
  const area = new Map<Surface, number>(SURFACES.map((s) => [s, surfaceArea(room, s)]))
  const patches: { areaM2: number; alpha: (number | null)[] }[] = []
  ;(input.openings ?? []).forEach((o, i) => {
    assertOpening(room, o, `opening ${i + 1}`)
    const a = (o.to - o.from) * (o.top - o.bottom)
    const id = materialForOpening(o.kind)
    if (!id) return
    area.set(o.wall, (area.get(o.wall) ?? 0) - a)
    patches.push({ areaM2: a, alpha: [...getMaterial(id).alpha] })
  })
  ;(input.treatments ?? []).forEach((t, i) => {
    const s = treatmentSurface(t)
    if (!s) throw new RangeError(`treatment ${i + 1} needs the surface it is mounted on`)
    assertSurface(s, `treatment ${i + 1} surface`)
    const { widthM, heightM } = treatmentSize(t)
    assertPositive(widthM, `treatment ${i + 1} width`, 'm')
    assertPositive(heightM, `treatment ${i + 1} height`, 'm')
    const alpha = treatmentAlpha(t, celsius)
    if (alpha.every((a) => a === null)) return
    const a = widthM * heightM
    area.set(s, (area.get(s) ?? 0) - a)
    patches.push({ areaM2: a, alpha })
  })
  for (const s of SURFACES) {
    if ((area.get(s) ?? 0) < -1e-9) throw new RangeError(`openings and treatments on the ${s} cover more than its area of ${surfaceArea(room, s).toFixed(2)} m²`)
  }
  const furnish = (input.furnishings ?? []).map((f, i) => {
    const areaM2 = furnishingArea(f)
    assertPositive(areaM2, `furnishing ${i + 1} area`, 'm²')
    return { areaM2, alpha: [...getMaterial(f.materialId, `furnishing ${i + 1} material`).alpha] }
  })
  const rows: { areaM2: number; alpha: readonly (number | null)[] }[] = [
    ...SURFACES.map((s) => ({ areaM2: Math.max(0, area.get(s) ?? 0), alpha: getMaterial(input.surfaces[s]).alpha })),
    ...patches,
    ...furnish,
  ]
  const c = speedOfSound(celsius)
  const bands: ReverberationBand[] = []
  for (let b = 0; b < nb; b++) {
    const hz = OCTAVE_BANDS_HZ[b]
    if (rows.some((r) => r.areaM2 > 0 && r.alpha[b] === null)) continue
    const a = rows.reduce((s, r) => s + r.areaM2 * (r.alpha[b] ?? 0), 0)
    const m = airAttenuationDbPerM(hz, { celsius, humidity }) / (10 * Math.log10(Math.E))
    const meanAlpha = Math.min(a / sTotal, 0.999999)
    bands.push({
      hz,
      absorptionAreaM2: a,
      airAbsorptionAreaM2: 4 * m * v,
      meanAlpha,
      sabine: sabineRt(v, a, { speedOfSound: c, airAttenuation: m }),
      eyring: eyringRt(v, sTotal, meanAlpha, { speedOfSound: c, airAttenuation: m }),
    })
  }
  const low = bands.filter((b) => b.hz === 125 || b.hz === 250)
  const lowFrequencyRt = low.length ? low.reduce((s, b) => s + b.eyring, 0) / low.length : bands[0].eyring
  const k = (24 * Math.LN10) / c
  const panelId = input.panelMaterialId ?? 'porous-panel-50mm'
  const coversSurface = input.panelSurface ?? 'left'
  const panelAlpha = getMaterial(panelId, 'panel material').alpha
  const coverAlpha = getMaterial(input.surfaces[coversSurface], `${coversSurface} material`).alpha
  let neededFor: (b: (typeof bands)[number]) => number = () => 0
  const extra = (b: (typeof bands)[number]) => Math.max(0, neededFor(b) - b.absorptionAreaM2)
  const panelArea = (b: (typeof bands)[number]) => {
    const e = extra(b)
    if (e === 0) return 0
    const i = (OCTAVE_BANDS_HZ as readonly number[]).indexOf(b.hz)
    const ap = panelAlpha[i], as = coverAlpha[i]
    if (ap === null || as === null || ap - as <= 0.02) return null
    return e / (ap - as)
  }
  const target = (rule: RtTarget['rule']): Omit<RtTarget, 'panel'> => {
    const tm = 0.25 * Math.cbrt(v / 100)
    return {
      rule,
      description: rule === 'bs1116'
        ? `ITU-R BS.1116 (from memory): Tm = 0.25·(V/100 m³)^(1/3) = ${tm.toFixed(2)} s over 200 Hz–4 kHz, ±0.05 s`
        : 'Domestic listening room: about 0.3 s ± 0.1 s in every band (common practice, no source)',
      bands: bands.map((b) => {
        const t = rule === 'bs1116' ? tm : 0.3
        const { lower, upper } = rule === 'bs1116' ? bs1116Limits(b.hz, tm) : { lower: 0.2, upper: 0.4 }
        // Eyring solved for the mean absorption that gives the target: −S·ln(1 − ᾱ) = kV/T − 4mV
        const x = (k * v) / t - b.airAbsorptionAreaM2
        const needed = x > 0 ? sTotal * (1 - Math.exp(-x / sTotal)) : 0
        neededFor = () => needed
        return {
          hz: b.hz, target: t, lower, upper, eyring: b.eyring,
          status: b.eyring > upper ? 'above' : b.eyring < lower ? 'below' : 'within',
          extraAbsorptionM2: extra(b),
          panelAreaM2: panelArea(b),
        }
      }),
    }
  }
  return {
    volumeM3: v,
    surfaceAreaM2: sTotal,
    bands,
    lowFrequencyRt,
    schroederHz: schroederFrequency(lowFrequencyRt, v),
    areas: SURFACES.map((s) => ({ surface: s, materialId: input.surfaces[s], areaM2: Math.max(0, area.get(s) ?? 0) })),
    targets: { bs1116: { ...target('bs1116'), panel: { materialId: panelId, coversSurface, coversMaterialId: input.surfaces[coversSurface] } }, domestic: { ...target('domestic'), panel: { materialId: panelId, coversSurface, coversMaterialId: input.surfaces[coversSurface] } } },
  }
}
