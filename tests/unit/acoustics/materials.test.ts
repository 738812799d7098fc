import { describe, expect, it } from 'vitest'
import { MATERIALS, OCTAVE_BANDS_HZ, PANEL_FLOW_RESISTIVITY, getMaterial, materialForOpening, materialIds, porousOctaveBands } from '../../../shared/acoustics'

describe('materials table', () => {
  it('has at least 20 finishes and furnishings plus porous panels of common thicknesses', () => {
    expect(MATERIALS.filter((m) => m.category !== 'absorber').length).toBeGreaterThanOrEqual(20)
    for (const t of [25, 50, 100, 150]) expect(materialIds()).toContain(`porous-panel-${t}mm`)
  })
  it('gives every row a stable kebab-case id, a named source, and coefficients 0…1 at 125 Hz–4 kHz', () => {
    const ids = new Set<string>()
    for (const m of MATERIALS) {
      expect(m.id).toMatch(/^[a-z0-9]+(-[a-z0-9]+)*$/)
      expect(ids.has(m.id)).toBe(false)
      ids.add(m.id)
      expect(m.source.length).toBeGreaterThan(10)
      expect(m.alpha).toHaveLength(OCTAVE_BANDS_HZ.length)
      for (let b = 1; b <= 6; b++) {
        expect(m.alpha[b]).not.toBeNull()
        expect(m.alpha[b]!).toBeGreaterThanOrEqual(0)
        expect(m.alpha[b]!).toBeLessThanOrEqual(1)
      }
    }
  })
  it('holds the Bies, Hansen & Howard, Engineering Noise Control Table 6.2 rows quoted in REFERENCES.md', () => {
    const rows: [string, number[]][] = [
      ['heavy-carpet-on-concrete', [0.02, 0.06, 0.14, 0.37, 0.6, 0.65]],
      ['gypsum-on-studs', [0.29, 0.1, 0.05, 0.04, 0.07, 0.09]],
      ['window-glass', [0.35, 0.25, 0.18, 0.12, 0.07, 0.04]],
      ['wood-floor-on-joists', [0.15, 0.11, 0.1, 0.07, 0.06, 0.07]],
      ['mineral-wool-50mm-16kg', [0.17, 0.45, 0.8, 0.89, 0.97, 0.94]],
    ]
    for (const [id, a] of rows) {
      expect(getMaterial(id).alpha.slice(1, 7)).toEqual(a)
      expect(getMaterial(id).source).toMatch(/Bies/)
    }
  })
  it('holds the Everest worked-example rows quoted in REFERENCES.md (Everest, Master Handbook of Acoustics 4e): concrete floor .01 .01 .015 .02 .02 .02, gypsum .29 .10 .05 .04 .07 .09', () => {
    expect(getMaterial('concrete-floor').alpha.slice(1, 7)).toEqual([0.01, 0.01, 0.015, 0.02, 0.02, 0.02])
    expect(getMaterial('concrete-floor').source).toMatch(/Everest/)
    expect(getMaterial('gypsum-on-studs').alpha.slice(1, 7)).toEqual([0.29, 0.1, 0.05, 0.04, 0.07, 0.09])
    expect(getMaterial('gypsum-on-studs').source).toMatch(/Everest/)
  })
  it('every row quoted from a book names that book and gives no 63 Hz or 8 kHz value the book does not print (Bies Table 6.2 and Everest list 125 Hz–4 kHz only, from memory)', () => {
    for (const m of MATERIALS.filter((x) => /^(Bies|Everest)/.test(x.source))) {
      expect(m.alpha[0], `${m.id} at 63 Hz`).toBeNull()
      expect(m.alpha[7], `${m.id} at 8 kHz`).toBeNull()
    }
  })
  it('one basis: the computed 50 mm panel agrees with the measured 50 mm mineral-wool row (Bies, Hansen & Howard, Table 6.2) within 0.09 per band (125 Hz–4 kHz), and its σ is the least-squares fit to that row', () => {
    const bies = [0.17, 0.45, 0.8, 0.89, 0.97, 0.94]
    const computed = getMaterial('porous-panel-50mm').alpha.slice(1, 7) as number[]
    computed.forEach((a, i) => expect(Math.abs(a - bies[i]), `${OCTAVE_BANDS_HZ[i + 1]} Hz`).toBeLessThan(0.09))
    const rms = (sigma: number) => {
      const a = porousOctaveBands({ thickness: 0.05, flowResistivity: sigma, model: 'miki' }, [125, 250, 500, 1000, 2000, 4000])
      return Math.sqrt(a.reduce((t, v, i) => t + (v - bies[i]) ** 2, 0) / 6)
    }
    for (const s of [PANEL_FLOW_RESISTIVITY - 2000, PANEL_FLOW_RESISTIVITY + 2000, 10_000, 60_000]) expect(rms(s)).toBeGreaterThan(rms(PANEL_FLOW_RESISTIVITY))
    expect(getMaterial('porous-panel-50mm').source).toMatch(/Miki.*Bies/)
  })
  it('computes the porous panels from the Miki model: thicker panels absorb more at 125 Hz', () => {
    const a = [25, 50, 100, 200].map((t) => getMaterial(`porous-panel-${t}mm`).alpha[1]!)
    for (let i = 1; i < a.length; i++) expect(a[i]).toBeGreaterThan(a[i - 1])
  })
  it('maps opening kinds to materials and rejects unknown ids', () => {
    expect(materialForOpening('window')).toBe('window-glass')
    expect(materialForOpening('open-doorway')).toBe('open-doorway')
    expect(materialForOpening('door')).toBe('door-solid-wood')
    expect(materialForOpening('fireplace')).toBeNull()
    expect(materialForOpening('open-shelving')).toBeNull()
    expect(materialForOpening('alcove')).toBeNull()
    expect(() => getMaterial('unobtainium')).toThrow("unknown material id 'unobtainium'")
  })
})
