import { describe, expect, it } from 'vitest'
import { analyzeFrequencyResponseFile, MeasurementFileError, parseFrequencyResponse, parseFrequencyResponseBytes } from '../../../shared/signal/index'

const enc = (s: string) => new TextEncoder().encode(s)

/** 1/48-octave points, 20 Hz–20 kHz: 75 dB flat with a +8 dB peak at 45 Hz and a −12 dB null at 110 Hz (Gaussian in log f). */
function syntheticCurve(sep = ','): string {
  const rows = ['# synthetic seat response', `frequency_hz${sep}spl_db${sep}phase_deg`]
  for (let i = 0; ; i++) {
    const f = 20 * 2 ** (i / 48)
    if (f > 20000) break
    const bump = (f0: number, db: number, widthOct: number) => db * Math.exp(-0.5 * (Math.log2(f / f0) / widthOct) ** 2)
    rows.push([f.toFixed(3), (75 + bump(45, 8, 0.08) + bump(110, -12, 0.05)).toFixed(3), (-i).toFixed(1)].join(sep))
  }
  return rows.join('\n') + '\n'
}

function errorOf(text: string): MeasurementFileError {
  try {
    parseFrequencyResponse(text)
  } catch (err) {
    expect(err).toBeInstanceOf(MeasurementFileError)
    return err as MeasurementFileError
  }
  throw new Error('expected a MeasurementFileError')
}

describe('frequency-response text format (shared/signal/FORMAT.md)', () => {
  it('reads CSV with comments, blank lines, CRLF and a byte-order mark; phase kept', () => {
    const p = parseFrequencyResponse('\uFEFF# seat 1\r\n\r\nfrequency_hz, spl_db, phase_deg\r\n20,70.5,-3\r\n# mid comment\r\n' + Array.from({ length: 12 }, (_, i) => `${30 + i * 10},${71 + i},0`).join('\r\n'))
    expect(p.freqsHz.slice(0, 3)).toEqual([20, 30, 40])
    expect(p.splDb[0]).toBe(70.5)
    expect(p.phaseDeg?.[0]).toBe(-3)
  })

  it('reads whitespace-separated columns in any order, case-insensitive, ignoring unknown columns', () => {
    const rows = Array.from({ length: 10 }, (_, i) => `  ${60 + i}\t 0.9   ${100 + i * 5}`)
    const p = parseFrequencyResponse(['SPL_dB coherence Frequency_Hz', ...rows].join('\n'))
    expect(p.freqsHz[0]).toBe(100)
    expect(p.splDb[0]).toBe(60)
    expect(p.phaseDeg).toBeUndefined()
  })

  it('names the row of an unparseable value or a short row (line numbers count comments)', () => {
    const base = '# c\nfrequency_hz,spl_db\n20,70\n25,abc\n'
    const e = errorOf(base)
    expect(e.code).toBe('text-unparseable-row')
    expect(e.row).toBe(4)
    expect(e.message).toMatch(/^line 4: spl_db "abc" is not a number/)
    expect(errorOf('frequency_hz,spl_db\n20,70\n25\n').row).toBe(3)
    expect(errorOf('frequency_hz,spl_db\n20,70\n25,1,000\n').code).toBe('text-unparseable-row')
  })

  it('refuses descending and duplicate frequencies, naming the row', () => {
    const d = errorOf('frequency_hz,spl_db\n20,70\n40,71\n30,72\n')
    expect([d.code, d.row]).toEqual(['text-descending-frequency', 4])
    const u = errorOf('frequency_hz,spl_db\n20,70\n40,71\n40,72\n')
    expect([u.code, u.row]).toEqual(['text-duplicate-frequency', 4])
  })

  it('refuses frequencies outside 20–20 000 Hz, a missing header or column, too few points', () => {
    expect(errorOf('frequency_hz,spl_db\n19.9,70\n').code).toBe('text-frequency-out-of-range')
    expect(errorOf('frequency_hz,spl_db\n20,70\n20001,70\n').code).toBe('text-frequency-out-of-range')
    expect(errorOf('20,70\n30,71\n').code).toBe('text-no-header')
    expect(errorOf('# only comments\n').code).toBe('text-no-header')
    expect(errorOf('frequency_hz,level\n20,70\n').code).toBe('text-missing-column')
    expect(errorOf('frequency_hz,spl_db\n20,70\n30,71\n').code).toBe('text-too-few-points')
  })

  it('refuses bytes that are not UTF-8 text, and an empty file', () => {
    const code = (b: Uint8Array) => {
      try {
        parseFrequencyResponseBytes(b)
      } catch (e) {
        return (e as MeasurementFileError).code
      }
    }
    expect(code(Uint8Array.from([0xff, 0xfe, 0x00, 0x41]))).toBe('text-not-utf8')
    expect(code(new Uint8Array())).toBe('empty-file')
  })
})

describe('analysis of a frequency-response file', () => {
  for (const sep of [',', '\t']) {
    it(`finds the planted 45 Hz peak and 110 Hz null (separator ${JSON.stringify(sep)})`, () => {
      const a = analyzeFrequencyResponseFile(enc(syntheticCurve(sep)))
      expect(a.kind).toBe('frequency-response')
      expect(a.hasPhase).toBe(true)
      expect(a.minHz).toBe(20)
      const lf = a.lowFrequency!
      expect(lf.peaks).toHaveLength(1)
      expect(lf.nulls).toHaveLength(1)
      expect(Math.abs(Math.log2(lf.peaks[0].hz / 45))).toBeLessThan(1 / 24)
      expect(Math.abs(Math.log2(lf.nulls[0].hz / 110))).toBeLessThan(1 / 24)
      expect(lf.peaks[0].levelDb).toBeCloseTo(83, 0)
      expect(lf.spreadDb).toBeGreaterThan(8)
      expect(lf.spreadDb).toBeLessThan(20)
    })
  }

  it('smooths more with wider fractions: the null is shallowest at 1/1 octave and deepest at 1/24', () => {
    const a = analyzeFrequencyResponseFile(enc(syntheticCurve()))
    expect(a.response.curves.map((c) => c.fraction)).toEqual([1, 3, 6, 12, 24])
    const i = a.response.freqsHz.findIndex((f) => f >= 110)
    const depths = a.response.curves.map((c) => c.levelsDb[i])
    for (let k = 1; k < depths.length; k++) expect(depths[k]).toBeLessThan(depths[k - 1])
    // far from the features every smoothing reads the flat 75 dB
    const j = a.response.freqsHz.findIndex((f) => f >= 2000)
    for (const c of a.response.curves) expect(c.levelsDb[j]).toBeCloseTo(75, 1)
    expect(a.response.freqsHz.length).toBeLessThan(300)
  })
})
