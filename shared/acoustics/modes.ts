import type { Point, RoomBox } from './types'
import { roomDims, roomSurfaceArea, roomVolume } from './types'
import { speedOfSound } from './units'
import { assertBand, assertCelsius, assertFinite, assertPointInRoom, assertPositive, assertRoom } from './validate'

export interface RoomMode {
  /** mode indices along length, width, height */
  n: [number, number, number]
  kind: 'axial' | 'tangential' | 'oblique'
  hz: number
}

const KINDS = ['axial', 'axial', 'tangential', 'oblique'] as const

/**
 * @internal Every index triple (nx, ny, nz) of a box with (nx/Lx)² + (ny/Ly)² + (nz/Lz)² ≤ k² (plus a
 * rounding allowance), (0, 0, 0) included, with that sum s²; the mode is at (c/2)·s (Rayleigh).
 */
export function forEachModeIndex(room: RoomBox, k: number, visit: (nx: number, ny: number, nz: number, s2: number) => void): void {
  const { length: lx, width: ly, height: lz } = room
  const k2 = k * k * (1 + 1e-12)
  const nxMax = Math.floor(k * lx + 1e-9)
  for (let nx = 0; nx <= nxMax; nx++) {
    const ax = (nx / lx) ** 2
    const nyMax = Math.floor(Math.sqrt(Math.max(0, k2 - ax)) * ly + 1e-9)
    for (let ny = 0; ny <= nyMax; ny++) {
      const axy = ax + (ny / ly) ** 2
      if (axy > k2) break
      const nzMax = Math.floor(Math.sqrt(Math.max(0, k2 - axy)) * lz + 1e-9)
      for (let nz = 0; nz <= nzMax; nz++) {
        const s2 = axy + (nz / lz) ** 2
        if (s2 <= k2) visit(nx, ny, nz, s2)
      }
    }
  }
}

/**
 * Every mode of a rigid rectangular room with 0 < hz ≤ maxHz, ascending by frequency
 * (ties: fewer non-zero indices first, then by indices).
 * @param room metres
 * @param opts.maxHz upper limit, Hz; opts.celsius air temperature (default 20 °C)
 * @see Rayleigh: f = (c/2)·√((nx/Lx)² + (ny/Ly)² + (nz/Lz)²) (Kuttruff, Room Acoustics, ch. 3)
 */
export function roomModes(room: RoomBox, opts: { maxHz: number; celsius?: number }): RoomMode[] {
  assertRoom(room)
  if (opts === null || typeof opts !== 'object') throw new RangeError('roomModes needs opts with maxHz (Hz)')
  assertPositive(opts.maxHz, 'maxHz', 'Hz')
  const c = speedOfSound(opts.celsius ?? 20)
  const modes: RoomMode[] = []
  forEachModeIndex(room, (2 * opts.maxHz) / c, (nx, ny, nz, s2) => {
    const hz = (c / 2) * Math.sqrt(s2)
    if (hz <= 0 || hz > opts.maxHz) return
    const nonZero = (nx > 0 ? 1 : 0) + (ny > 0 ? 1 : 0) + (nz > 0 ? 1 : 0)
    modes.push({ n: [nx, ny, nz], kind: KINDS[nonZero], hz })
  })
  const order = (m: RoomMode) => (m.kind === 'axial' ? 0 : m.kind === 'tangential' ? 1 : 2)
  modes.sort((a, b) => a.hz - b.hz || order(a) - order(b) || a.n[0] - b.n[0] || a.n[1] - b.n[1] || a.n[2] - b.n[2])
  return modes
}

/**
 * Relative pressure of a mode at a point: the product of the cosine mode shapes, −1…1
 * (±1 at a peak such as a corner, 0 on a nodal plane).
 * @see Kuttruff, Room Acoustics, eq. for the rigid rectangular room: ψ = cos(nxπx/Lx)·cos(nyπy/Ly)·cos(nzπz/Lz)
 */
export function modePressure(room: RoomBox, mode: RoomMode | readonly [number, number, number], point: Point): number {
  assertRoom(room)
  assertPointInRoom(room, point, 'point')
  const n = Array.isArray(mode) ? mode : (mode as RoomMode).n
  n.forEach((v, i) => {
    if (!Number.isInteger(v) || v < 0) throw new RangeError(`mode index ${i} must be a non-negative integer: got ${v}`)
  })
  return modeShape(roomDims(room), n as readonly number[], point)
}

function modeShape(dims: readonly number[], n: readonly number[], p: Point): number {
  return Math.cos((n[0] * Math.PI * p.x) / dims[0]) * Math.cos((n[1] * Math.PI * p.y) / dims[1]) * Math.cos((n[2] * Math.PI * p.z) / dims[2])
}

/** Where a point sits on a mode: near a null (|ψ| < 0.316, −10 dB), near a peak (|ψ| > 0.891, −1 dB), or between. */
export function modePositionClass(pressure: number): 'null' | 'peak' | 'between' {
  const a = Math.abs(pressure)
  return a < 0.316 ? 'null' : a > 0.891 ? 'peak' : 'between'
}

/** The input checked, and what the mode-count formulas take: c, volume V, surface S and total edge length L. */
function modeCountTerms(room: RoomBox, hz: number, celsius: number): { c: number; v: number; s: number; l: number } {
  assertRoom(room)
  assertPositive(hz, 'frequency', 'Hz')
  return { c: speedOfSound(celsius), v: roomVolume(room), s: roomSurfaceArea(room), l: 4 * (room.length + room.width + room.height) }
}

/**
 * Asymptotic number of modes with frequency below f.
 * @see Kuttruff, Room Acoustics: N(f) ≈ 4πVf³/(3c³) + πSf²/(4c²) + Lf/(8c), L the total edge length
 */
export function modeCountEstimate(room: RoomBox, hz: number, celsius = 20): number {
  const { c, v, s, l } = modeCountTerms(room, hz, celsius)
  return (4 * Math.PI * v * hz ** 3) / (3 * c ** 3) + (Math.PI * s * hz ** 2) / (4 * c ** 2) + (l * hz) / (8 * c)
}

/**
 * Modal density dN/df, modes per Hz.
 * @see Long, Architectural Acoustics 2e, eq. 8.46: dN/df = 4πVf²/c³ + πSf/(2c²) + L/(8c)
 */
export function modalDensity(room: RoomBox, hz: number, celsius = 20): number {
  const { c, v, s, l } = modeCountTerms(room, hz, celsius)
  return (4 * Math.PI * v * hz ** 2) / c ** 3 + (Math.PI * s * hz) / (2 * c ** 2) + l / (8 * c)
}

// ---------------------------------------------------------------------------------------------
// Distribution analysis

export interface ModeCoincidence {
  /** mean frequency of the group, Hz */
  hz: number
  modes: RoomMode[]
  /** number of axial modes in the group */
  axialCount: number
}

export interface AxialGap {
  lowHz: number
  highHz: number
  gapHz: number
  low: [number, number, number]
  high: [number, number, number]
  /** 'close': < 5 Hz apart, 'wide': > 20 Hz apart (Handbook for Sound Engineers §6.6) */
  verdict: 'close' | 'wide' | 'ok'
}

export interface ThirdOctaveModeCount {
  /** nominal centre, Hz */
  centerHz: number
  lowHz: number
  highHz: number
  count: number
  /** modes in the band that belong to a coincidence group */
  coincidentModes: number
}

export interface RatioReference {
  name: string
  ratio: [number, number, number]
  /** Euclidean distance in (middle/smallest, largest/smallest) space */
  distance: number
  source: string
}

export interface ModeAnalysis {
  analysisMaxHz: number
  coincidenceTolerance: { octaves: number; percent: number }
  coincidences: ModeCoincidence[]
  axialGaps: { gaps: AxialGap[]; closeCount: number; wideCount: number; meetsGuidance: boolean }
  thirdOctaveBands: ThirdOctaveModeCount[]
  bonello: { passes: boolean; decreasingAtHz: number[]; coincidentAtHz: number[] }
  ratios: {
    /** dimensions sorted ascending, normalised to the smallest */
    normalised: [number, number, number]
    references: RatioReference[]
    nearest: RatioReference
    walker: { passes: boolean; failures: string[] }
  }
  modeCount: { atHz: number; counted: number; predicted: number }[]
}

const NOMINAL_THIRD_OCTAVES = [16, 20, 25, 31.5, 40, 50, 63, 80, 100, 125, 160, 200, 250, 315, 400, 500, 630, 800, 1000]

/**
 * Analyse the distribution of the room's modes up to `analysisMaxHz` (default 200 Hz).
 *
 * Coincidence tolerance (our choice): two modes coincide when the higher lies within
 * `coincidenceOctaves` (default 1/24 octave, 2.93 %) of the lowest mode of its group — closer than a
 * 1/12-octave-smoothed measurement can separate them. Groups are anchored on their lowest mode, so
 * they do not chain.
 * @see Bonello, JAES 29(9), 1981 (from memory): modes per 1/3 octave must not decrease; coincidences only in bands with ≥ 5 modes
 * @see Handbook for Sound Engineers (Ballou) §6.6: axial modes no closer than 5 Hz, no more than 20 Hz apart
 */
export function analyzeModes(
  room: RoomBox,
  opts: { celsius?: number; analysisMaxHz?: number; coincidenceOctaves?: number } = {},
): ModeAnalysis {
  assertRoom(room)
  const celsius = opts.celsius ?? 20
  assertCelsius(celsius)
  const maxHz = opts.analysisMaxHz ?? 200
  assertPositive(maxHz, 'analysisMaxHz', 'Hz')
  const octaves = opts.coincidenceOctaves ?? 1 / 24
  assertPositive(octaves, 'coincidenceOctaves')
  const ratio = 2 ** octaves

  const bands = NOMINAL_THIRD_OCTAVES.map((nominal) => {
    const k = Math.round(10 * Math.log10(nominal / 1000))
    const exact = 1000 * 10 ** (k / 10)
    return { centerHz: nominal, lowHz: exact * 10 ** -0.05, highHz: exact * 10 ** 0.05 }
  }).filter((b) => b.centerHz <= maxHz)
  const topHz = Math.max(maxHz, bands.length ? bands[bands.length - 1].highHz : maxHz)
  const all = roomModes(room, { maxHz: topHz, celsius })
  const modes = all.filter((m) => m.hz <= maxHz)

  const coincidences: ModeCoincidence[] = []
  const inGroup = new Set<RoomMode>()
  for (let i = 0; i < all.length; ) {
    let j = i + 1
    while (j < all.length && all[j].hz <= all[i].hz * ratio) j++
    if (j - i > 1) {
      const group = all.slice(i, j)
      group.forEach((m) => inGroup.add(m))
      if (all[i].hz <= maxHz) {
        coincidences.push({
          hz: group.reduce((s, m) => s + m.hz, 0) / group.length,
          modes: group,
          axialCount: group.filter((m) => m.kind === 'axial').length,
        })
      }
    }
    i = j
  }

  const axial = modes.filter((m) => m.kind === 'axial')
  const gaps: AxialGap[] = []
  for (let i = 1; i < axial.length; i++) {
    const gap = axial[i].hz - axial[i - 1].hz
    gaps.push({
      lowHz: axial[i - 1].hz,
      highHz: axial[i].hz,
      gapHz: gap,
      low: axial[i - 1].n,
      high: axial[i].n,
      verdict: gap < 5 ? 'close' : gap > 20 ? 'wide' : 'ok',
    })
  }
  const closeCount = gaps.filter((g) => g.verdict === 'close').length
  const wideCount = gaps.filter((g) => g.verdict === 'wide').length

  const thirdOctaveBands: ThirdOctaveModeCount[] = bands.map((b) => {
    const inBand = all.filter((m) => m.hz >= b.lowHz && m.hz < b.highHz)
    return { ...b, count: inBand.length, coincidentModes: inBand.filter((m) => inGroup.has(m)).length }
  })
  const decreasingAtHz: number[] = []
  const coincidentAtHz: number[] = []
  let started = false
  for (let i = 0; i < thirdOctaveBands.length; i++) {
    const b = thirdOctaveBands[i]
    if (b.count > 0) started = true
    if (!started) continue
    if (i > 0 && b.count < thirdOctaveBands[i - 1].count) decreasingAtHz.push(b.centerHz)
    if (b.coincidentModes > 0 && b.count < 5) coincidentAtHz.push(b.centerHz)
  }

  const modeCount = [50, 100, 200, 300]
    .filter((f) => f <= maxHz)
    .map((f) => ({ atHz: f, counted: all.filter((m) => m.hz <= f).length, predicted: modeCountEstimate(room, f, celsius) }))

  return {
    analysisMaxHz: maxHz,
    coincidenceTolerance: { octaves, percent: (ratio - 1) * 100 },
    coincidences,
    axialGaps: { gaps, closeCount, wideCount, meetsGuidance: closeCount === 0 && wideCount === 0 },
    thirdOctaveBands,
    bonello: { passes: decreasingAtHz.length === 0 && coincidentAtHz.length === 0, decreasingAtHz, coincidentAtHz },
    ratios: compareRatios(room),
    modeCount,
  }
}

const RATIO_REFERENCES: { name: string; ratio: [number, number, number]; source: string }[] = [
  // 1 : 1.26 : 1.59 is 1 : 2^(1/3) : 2^(2/3), the cube-root-of-two proportion: labelled by what it is, not by a person
  { name: 'Cube-root-of-two ratio 1 : ∛2 : ∛4', ratio: [1, 1.26, 1.59], source: '1 : 2^(1/3) : 2^(2/3); listed among room-sizing ratios by Cox, D\'Antonio & Avis, JAES 52(6), 2004 (from memory)' },
  { name: 'Sepmeyer A', ratio: [1, 1.14, 1.39], source: 'Sepmeyer, JAES 1965 (from memory)' },
  { name: 'Sepmeyer B', ratio: [1, 1.28, 1.54], source: 'Sepmeyer, JAES 1965 (from memory)' },
  { name: 'Sepmeyer C', ratio: [1, 1.6, 2.33], source: 'Sepmeyer, JAES 1965 (from memory)' },
  { name: 'Louden', ratio: [1, 1.4, 1.9], source: 'Louden, Acustica 1971 (from memory)' },
]

/**
 * Compare the room's proportions with published ratio guidance.
 * @see Walker, BBC RD 1993/8 (from memory): 1.1·w/h ≤ l/h ≤ 4.5·w/h − 4, l/h < 3, w/h < 3, no ratio within ±5 % of an integer
 */
export function compareRatios(room: RoomBox): ModeAnalysis['ratios'] {
  assertRoom(room)
  const [h, w, l] = roomDims(room).slice().sort((a, b) => a - b)
  const r1 = w / h
  const r2 = l / h
  const references = RATIO_REFERENCES.map((r) => ({ ...r, distance: Math.hypot(r1 - r.ratio[1], r2 - r.ratio[2]) }))
  const nearest = references.reduce((a, b) => (b.distance < a.distance ? b : a))
  const failures: string[] = []
  if (r2 < 1.1 * r1) failures.push(`l/h = ${r2.toFixed(2)} is below 1.1·w/h = ${(1.1 * r1).toFixed(2)}`)
  if (r2 > 4.5 * r1 - 4) failures.push(`l/h = ${r2.toFixed(2)} is above 4.5·w/h − 4 = ${(4.5 * r1 - 4).toFixed(2)}`)
  if (r2 >= 3) failures.push(`l/h = ${r2.toFixed(2)} is not below 3`)
  if (r1 >= 3) failures.push(`w/h = ${r1.toFixed(2)} is not below 3`)
  for (const [name, r] of [['l/h', r2], ['w/h', r1], ['l/w', l / w]] as const) {
    const nearInt = Math.round(r)
    if (Math.abs(r - nearInt) <= 0.05 * nearInt) failures.push(`${name} = ${r.toFixed(2)} lies within 5 % of ${nearInt}`)
  }
  return { normalised: [1, r1, r2], references, nearest, walker: { passes: failures.length === 0, failures } }
}

// ---------------------------------------------------------------------------------------------
// Modal response

/** Reverberation time, seconds: one value, or per band (log-frequency interpolation, held constant beyond the ends). */
export type Rt60Spec = number | readonly { hz: number; seconds: number }[]

export function rt60At(spec: Rt60Spec, hz: number): number {
  if (typeof spec === 'number') return spec
  const bands = spec
  if (hz <= bands[0].hz) return bands[0].seconds
  for (let i = 1; i < bands.length; i++) {
    if (hz <= bands[i].hz) {
      const t = Math.log(hz / bands[i - 1].hz) / Math.log(bands[i].hz / bands[i - 1].hz)
      return bands[i - 1].seconds + t * (bands[i].seconds - bands[i - 1].seconds)
    }
  }
  return bands[bands.length - 1].seconds
}

function assertRt60Spec(spec: Rt60Spec): void {
  if (typeof spec === 'number') return assertPositive(spec, 'rt60', 's')
  if (!Array.isArray(spec) || spec.length === 0) throw new RangeError('rt60 must be seconds or a non-empty list of { hz, seconds }')
  spec.forEach((b, i) => {
    assertPositive(b.hz, `rt60 band [${i}] hz`, 'Hz')
    assertPositive(b.seconds, `rt60 band [${i}] seconds`, 's')
    if (i > 0 && b.hz <= spec[i - 1].hz) throw new RangeError(`rt60 bands must ascend in frequency: ${b.hz} Hz after ${spec[i - 1].hz} Hz`)
  })
}

export interface ModalResponseOptions {
  /** seconds, or per band; sets each mode's damping δ = 3·ln10/T (default 0.4 s) */
  rt60?: Rt60Spec
  celsius?: number
  /** Hz, default 15 */
  fromHz?: number
  /** Hz, default 300 */
  toHz?: number
  /** frequency points per octave, log-spaced (default 48) */
  pointsPerOctave?: number
  /**
   * modes summed up to this frequency, Hz (default 3 × the higher of toHz and spreadToHz). Modes in its
   * upper octave (modalMaxHz/2 … modalMaxHz) are weighted by a raised-cosine taper, so the truncated
   * sum converges smoothly instead of oscillating with the cut-off; doubling the default changes the
   * spread by less than `MODAL_CONVERGENCE_DB` in the test rooms.
   */
  modalMaxHz?: number
  /** power smoothing width for the spread, octaves (default 1/6; 0 for none) */
  smoothingOctaves?: number
  /** band over which the peak-to-null spread is taken, Hz (default fromHz…toHz) */
  spreadFromHz?: number
  spreadToHz?: number
}

export interface ModalResponse {
  freqsHz: number[]
  /** unsmoothed level, dB relative to the mean power over the whole curve */
  levelDb: number[]
  /** the same, power-smoothed over `smoothingOctaves` */
  smoothedDb: number[]
  /** peak-to-null spread of the smoothed curve within the spread band, dB */
  spreadDb: number
  /** peak-to-null spread of the unsmoothed curve within the spread band, dB */
  rawSpreadDb: number
  /** standard deviation of the smoothed curve within the spread band, dB */
  stdDevDb: number
  spreadBandHz: [number, number]
  peakHz: number
  nullHz: number
  smoothingOctaves: number
}

/**
 * Documented convergence of the modal sum: doubling `modalMaxHz` from its default moves the smoothed
 * peak-to-null spread by less than this, dB (tests/unit/acoustics/modes.test.ts checks it).
 */
export const MODAL_CONVERGENCE_DB = 0.1

/** Terms of the power series used for the modes far above the band (see `ModalSystem`). */
const FAR_TERMS = 14

/**
 * @internal Frequency grid and per-mode transfer terms shared by the response and the position search.
 * Modes up to `nearMaxHz` (1.5 × the top of the grid) are summed exactly, frequency by frequency
 * (`hRe`/`hIm`); modes above it (`farCount` of them, indices after the near ones in `n`) through the
 * power series H_m(ω) = −(g_m/K_m)·Σ_j ω^(2j)/a_m^(j+1), a_m = ω_m² + 2jδ_mω_m, which for
 * ω²/|a_m| ≤ 0.44 and 14 terms is exact to about 1e-5 of each term. Weights (`sourceWeights`) cover
 * both; `powerFromWeights` adds both.
 */
export interface ModalSystem {
  freqsHz: Float64Array
  /** mode indices, flattened: nx, ny, nz per mode, the exactly summed modes first, then the far ones */
  n: Int32Array
  /** modes summed exactly (with `hRe`/`hIm`) */
  modeCount: number
  /** modes summed through the far-mode series, after the exact ones in `n` */
  farCount: number
  /** H_m(f) = (g_m/K_m) / (ω² − ω_m² − 2jδ_m·ω_m), mode-major: [m·F + f] (g_m the taper, 1 below modalMaxHz/2) */
  hRe: Float64Array
  hIm: Float64Array
  /** far-mode series coefficients −(g_m/K_m)·ω_ref^(2j)/a_m^(j+1), [m·FAR_TERMS + j] */
  farRe: Float64Array
  farIm: Float64Array
  /** (ω_f/ω_ref)² per frequency, for the series */
  u: Float64Array
  nearMaxHz: number
  modalMaxHz: number
  dims: [number, number, number]
  opts: Required<Omit<ModalResponseOptions, 'rt60' | 'celsius' | 'modalMaxHz' | 'spreadFromHz' | 'spreadToHz'>> & {
    spreadFromHz: number
    spreadToHz: number
  }
}

/**
 * Build the modal transfer terms for a room.
 * The speaker is taken as flat in free field (constant volume acceleration), so the response is the
 * bare modal sum; the (0,0,0) pressure mode is left out, as domestic rooms are not sealed.
 * @see Kuttruff, Room Acoustics, ch. 3: p(r,ω) ∝ Σ ψ_m(r)ψ_m(r₀) / (K_m(ω² − ω_m² − 2jδ_mω_m)), δ = 3·ln10/T
 */
export function buildModalSystem(room: RoomBox, options: ModalResponseOptions = {}): ModalSystem {
  assertRoom(room)
  const rt60 = options.rt60 ?? 0.4
  assertRt60Spec(rt60)
  const celsius = options.celsius ?? 20
  assertCelsius(celsius)
  const [fromHz, toHz] = assertBand(options.fromHz ?? 15, options.toHz ?? 300)
  const ppo = options.pointsPerOctave ?? 48
  assertPositive(ppo, 'pointsPerOctave')
  const modalMaxHz = options.modalMaxHz ?? 3 * Math.max(toHz, options.spreadToHz ?? toHz)
  assertPositive(modalMaxHz, 'modalMaxHz', 'Hz')
  const smoothingOctaves = options.smoothingOctaves ?? 1 / 6
  assertFinite(smoothingOctaves, 'smoothingOctaves')
  if (smoothingOctaves < 0) throw new RangeError(`smoothingOctaves must not be negative: got ${smoothingOctaves}`)
  const [spreadFromHz, spreadToHz] = assertBand(options.spreadFromHz ?? fromHz, options.spreadToHz ?? toHz, ['spreadFromHz', 'spreadToHz'])

  const nPoints = Math.max(2, Math.round(Math.log2(toHz / fromHz) * ppo) + 1)
  const freqsHz = new Float64Array(nPoints)
  for (let i = 0; i < nPoints; i++) freqsHz[i] = fromHz * (toHz / fromHz) ** (i / (nPoints - 1))

  const c = speedOfSound(celsius)
  const taperFrom = modalMaxHz / 2
  // raised-cosine taper over the top octave of the summed modes (a smooth truncation: the hard cut-off's
  // error oscillates and decays only slowly with the cut-off)
  const taper = (hz: number) => (hz <= taperFrom ? 1 : 0.5 * (1 + Math.cos((Math.PI * (hz - taperFrom)) / (modalMaxHz - taperFrom))))
  const nearMaxHz = Math.min(modalMaxHz, 1.5 * toHz)
  const modes = roomModes(room, { maxHz: nearMaxHz, celsius })
  const M = modes.length
  const far = farModes(room, c, nearMaxHz, modalMaxHz)
  const FM = far.length / 3
  const n = new Int32Array(3 * (M + FM))
  n.set(far, 3 * M)
  const v = roomVolume(room)
  const wn2 = new Float64Array(M)
  const damp = new Float64Array(M) // 2·δ·ω_m
  const invK = new Float64Array(M)
  modes.forEach((m, i) => {
    n[3 * i] = m.n[0]; n[3 * i + 1] = m.n[1]; n[3 * i + 2] = m.n[2]
    const w = 2 * Math.PI * m.hz
    wn2[i] = w * w
    damp[i] = 2 * ((3 * Math.LN10) / rt60At(rt60, m.hz)) * w
    // K = ∫ψ² dV = V · Π(1/2 for each non-zero index)
    const nonZero = (m.n[0] > 0 ? 1 : 0) + (m.n[1] > 0 ? 1 : 0) + (m.n[2] > 0 ? 1 : 0)
    invK[i] = (taper(m.hz) * 2 ** nonZero) / v
  })
  const hRe = new Float64Array(nPoints * M)
  const hIm = new Float64Array(nPoints * M)
  const w2s = new Float64Array(nPoints)
  for (let f = 0; f < nPoints; f++) w2s[f] = (2 * Math.PI * freqsHz[f]) ** 2
  for (let i = 0; i < M; i++) {
    const base = i * nPoints
    const wn = wn2[i]
    const b = damp[i]
    const b2 = b * b
    const k = invK[i]
    for (let f = 0; f < nPoints; f++) {
      // 1 / (a − jb) = (a + jb) / (a² + b²)
      const a = w2s[f] - wn
      const s = k / (a * a + b2)
      hRe[base + f] = a * s
      hIm[base + f] = b * s
    }
  }
  // far modes: 1/(ω² − a) = −Σ_j ω^(2j)/a^(j+1), in u = (ω/ω_ref)²
  const wRef2 = (2 * Math.PI * toHz) ** 2
  const u = new Float64Array(nPoints)
  for (let f = 0; f < nPoints; f++) u[f] = w2s[f] / wRef2
  const farRe = new Float64Array(FM * FAR_TERMS)
  const farIm = new Float64Array(FM * FAR_TERMS)
  const [lx, ly, lz] = roomDims(room)
  for (let i = 0; i < FM; i++) {
    const nx = far[3 * i], ny = far[3 * i + 1], nz = far[3 * i + 2]
    const hz = (c / 2) * Math.sqrt((nx / lx) ** 2 + (ny / ly) ** 2 + (nz / lz) ** 2)
    const w = 2 * Math.PI * hz
    const nonZero = (nx > 0 ? 1 : 0) + (ny > 0 ? 1 : 0) + (nz > 0 ? 1 : 0)
    const k = (taper(hz) * 2 ** nonZero) / v
    // q = ω_ref²/a (complex), a = ω_m² + 2jδω_m
    const aRe = (w * w) / wRef2
    const aIm = (2 * ((3 * Math.LN10) / rt60At(rt60, hz)) * w) / wRef2
    const d = aRe * aRe + aIm * aIm
    const qRe = aRe / d, qIm = -aIm / d
    // term j: −k·q^(j+1)/ω_ref² (the 1/ω_ref² is restored below so units match hRe)
    let pRe = qRe, pIm = qIm
    for (let j = 0; j < FAR_TERMS; j++) {
      farRe[i * FAR_TERMS + j] = (-k * pRe) / wRef2
      farIm[i * FAR_TERMS + j] = (-k * pIm) / wRef2
      const tRe = pRe * qRe - pIm * qIm
      pIm = pRe * qIm + pIm * qRe
      pRe = tRe
    }
  }
  return {
    freqsHz,
    n,
    modeCount: M,
    farCount: FM,
    hRe,
    hIm,
    farRe,
    farIm,
    u,
    nearMaxHz,
    modalMaxHz,
    dims: roomDims(room),
    opts: { fromHz, toHz, pointsPerOctave: ppo, smoothingOctaves, spreadFromHz, spreadToHz },
  }
}

/** Mode indices (flattened nx, ny, nz) of every mode with loHz < f ≤ hiHz, in no particular order. */
function farModes(room: RoomBox, c: number, loHz: number, hiHz: number): Int32Array {
  if (hiHz <= loHz) return new Int32Array(0)
  const kLo2 = ((2 * loHz) / c) ** 2 * (1 + 1e-12)
  const out: number[] = []
  forEachModeIndex(room, (2 * hiHz) / c, (nx, ny, nz, s2) => {
    if (s2 > kLo2) out.push(nx, ny, nz)
  })
  return Int32Array.from(out)
}

/** @internal Σ over sources of the mode shapes, per mode (exact modes, then far modes). */
export function sourceWeights(sys: ModalSystem, sources: readonly Point[]): Float64Array {
  const total = sys.modeCount + sys.farCount
  const w = new Float64Array(total)
  const [lx, ly, lz] = sys.dims
  let nMax = 0
  for (let i = 0; i < sys.n.length; i++) if (sys.n[i] > nMax) nMax = sys.n[i]
  const table = (x: number, l: number) => {
    const t = new Float64Array(nMax + 1)
    for (let k = 0; k <= nMax; k++) t[k] = Math.cos((k * Math.PI * x) / l)
    return t
  }
  for (const p of sources) {
    const tx = table(p.x, lx), ty = table(p.y, ly), tz = table(p.z, lz)
    for (let i = 0; i < total; i++) w[i] += tx[sys.n[3 * i]] * ty[sys.n[3 * i + 1]] * tz[sys.n[3 * i + 2]]
  }
  return w
}

/**
 * @internal re[f] += Σ_{m < count} w_m·srcRe[m·F + f] (and im likewise): a weighted sum of term-major rows
 * on an F-point grid. Terms with |w_m| < 1e-12 (nodal planes) are skipped.
 */
export function addWeightedRows(weights: ArrayLike<number>, count: number, srcRe: Float64Array, srcIm: Float64Array, F: number, re: Float64Array, im: Float64Array): void {
  for (let m = 0; m < count; m++) {
    const w = weights[m]
    if (Math.abs(w) < 1e-12) continue
    const base = m * F
    for (let f = 0; f < F; f++) {
      re[f] += w * srcRe[base + f]
      im[f] += w * srcIm[base + f]
    }
  }
}

/** @internal out[f] = re[f]² + im[f]² (out may be re). */
export function complexPower(re: Float64Array, im: Float64Array, out: Float64Array = new Float64Array(re.length)): Float64Array {
  for (let f = 0; f < re.length; f++) out[f] = re[f] * re[f] + im[f] * im[f]
  return out
}

/**
 * @internal The complex modal sum Σ_m w_m·H_m(f) on the system's grid, into re and im (cleared first): the
 * exactly summed modes, then the far modes through their series when the weights cover them.
 */
export function transferFromWeights(sys: ModalSystem, weights: ArrayLike<number>, re: Float64Array, im: Float64Array): void {
  re.fill(0)
  im.fill(0)
  addWeightedRows(weights, sys.modeCount, sys.hRe, sys.hIm, sys.freqsHz.length, re, im)
  if (sys.farCount > 0 && weights.length >= sys.modeCount + sys.farCount) {
    const { aRe, aIm } = farSeries(sys, weights, 0, sys.farCount)
    addSeries(sys, aRe, aIm, re, im)
  }
}

/** @internal Power |p|² per frequency for per-mode weights w_m (source shape × receiver shape). */
export function powerFromWeights(sys: ModalSystem, weights: Float64Array): Float64Array {
  const F = sys.freqsHz.length
  const re = new Float64Array(F)
  const im = new Float64Array(F)
  transferFromWeights(sys, weights, re, im)
  return complexPower(re, im, re)
}

/** @internal Σ_m w_m·c_{m,j} over far modes [from, to) (weights indexed like `n`), per series term. */
export function farSeries(sys: ModalSystem, weights: ArrayLike<number>, from: number, to: number, pick?: ArrayLike<number>) {
  const aRe = new Float64Array(FAR_TERMS)
  const aIm = new Float64Array(FAR_TERMS)
  const M = sys.modeCount
  for (let k = from; k < to; k++) {
    const i = pick ? pick[k] : k
    const w = weights[M + i]
    if (Math.abs(w) < 1e-12) continue
    const base = i * FAR_TERMS
    for (let j = 0; j < FAR_TERMS; j++) {
      aRe[j] += w * sys.farRe[base + j]
      aIm[j] += w * sys.farIm[base + j]
    }
  }
  return { aRe, aIm }
}

/** @internal re/im[f] += Σ_j a_j·u_f^j (Horner). */
export function addSeries(sys: ModalSystem, aRe: Float64Array, aIm: Float64Array, re: Float64Array, im: Float64Array, offset = 0): void {
  const F = sys.freqsHz.length
  for (let f = 0; f < F; f++) {
    const x = sys.u[f]
    let sr = 0, si = 0
    for (let j = FAR_TERMS - 1; j >= 0; j--) { sr = sr * x + aRe[j]; si = si * x + aIm[j] }
    re[offset + f] += sr
    im[offset + f] += si
  }
}

/**
 * @internal Fractional-octave power smoothing: at each grid frequency f the mean of |p|² over linear
 * frequency between the band edges f·2^(∓b/2) (b = smoothingOctaves), the power taken as linear between
 * grid points (trapezoidal rule); a band reaching past the grid is averaged over the part inside it.
 * This is the band level of a constant-percentage filter with ideal edges, divided by the bandwidth.
 * @see IEC 61260-1:2014 §3 (fractional-octave band edges); the average is the band power per Hz
 */
export function smoothPower(sys: ModalSystem, power: ArrayLike<number>, out: Float64Array = new Float64Array(power.length)): Float64Array {
  const F = power.length
  const fr = sys.freqsHz
  const b = sys.opts.smoothingOctaves
  if (b === 0 || F < 2) { for (let f = 0; f < F; f++) out[f] = power[f]; return out }
  // cumulative trapezoid integral of power over frequency
  const cum = new Float64Array(F)
  for (let f = 1; f < F; f++) cum[f] = cum[f - 1] + 0.5 * (power[f] + power[f - 1]) * (fr[f] - fr[f - 1])
  const { edgeIndex: ei, edgeHz: eh } = smoothingEdges(sys)
  const integral = (k: number) => {
    const i = ei[k]
    const d = eh[k] - fr[i]
    if (d <= 0 || i >= F - 1) return cum[i]
    const h = fr[i + 1] - fr[i]
    return cum[i] + power[i] * d + ((power[i + 1] - power[i]) * d * d) / (2 * h)
  }
  for (let f = 0; f < F; f++) {
    const lo = eh[2 * f], hi = eh[2 * f + 1]
    out[f] = (integral(2 * f + 1) - integral(2 * f)) / (hi - lo)
  }
  return out
}

const EDGES = new WeakMap<ModalSystem, { edgeIndex: Int32Array; edgeHz: Float64Array }>()
/** Band edges of each grid point's smoothing band, clipped to the grid, and the grid point at or below each. */
function smoothingEdges(sys: ModalSystem) {
  let e = EDGES.get(sys)
  if (e) return e
  const fr = sys.freqsHz
  const F = fr.length
  const r = 2 ** (sys.opts.smoothingOctaves / 2)
  const edgeIndex = new Int32Array(2 * F)
  const edgeHz = new Float64Array(2 * F)
  let lo = 0, hi = 0
  for (let f = 0; f < F; f++) {
    const a = Math.max(fr[0], fr[f] / r)
    const z = Math.min(fr[F - 1], fr[f] * r)
    while (lo < F - 1 && fr[lo + 1] <= a) lo++
    while (hi < F - 1 && fr[hi + 1] <= z) hi++
    edgeIndex[2 * f] = lo; edgeHz[2 * f] = a
    edgeIndex[2 * f + 1] = hi; edgeHz[2 * f + 1] = z
  }
  e = { edgeIndex, edgeHz }
  EDGES.set(sys, e)
  return e
}

/** @internal Spread figures of a power curve on the system's grid. */
export function spreadOfPower(sys: ModalSystem, power: Float64Array): Omit<ModalResponse, 'freqsHz' | 'smoothingOctaves'> {
  const F = power.length
  let mean = 0
  for (let f = 0; f < F; f++) mean += power[f]
  mean = mean / F || Number.MIN_VALUE
  const floor = mean * 1e-12
  const smooth = smoothPower(sys, power)
  const levelDb: number[] = new Array(F)
  const smoothedDb: number[] = new Array(F)
  for (let f = 0; f < F; f++) {
    levelDb[f] = 10 * Math.log10(Math.max(power[f], floor) / mean)
    smoothedDb[f] = 10 * Math.log10(Math.max(smooth[f], floor) / mean)
  }
  let lo = Infinity, hi = -Infinity, rawLo = Infinity, rawHi = -Infinity, peakHz = NaN, nullHz = NaN
  let sum = 0, sum2 = 0, count = 0
  const { spreadFromHz: a, spreadToHz: b } = sys.opts
  for (let f = 0; f < F; f++) {
    const hz = sys.freqsHz[f]
    if (hz < a * (1 - 1e-9) || hz > b * (1 + 1e-9)) continue
    const s = smoothedDb[f]
    if (s > hi) { hi = s; peakHz = hz }
    if (s < lo) { lo = s; nullHz = hz }
    rawLo = Math.min(rawLo, levelDb[f])
    rawHi = Math.max(rawHi, levelDb[f])
    sum += s; sum2 += s * s; count++
  }
  if (count === 0) throw new RangeError(`the spread band ${a}–${b} Hz lies outside the computed range`)
  const m = sum / count
  return {
    levelDb,
    smoothedDb,
    spreadDb: hi - lo,
    rawSpreadDb: rawHi - rawLo,
    stdDevDb: Math.sqrt(Math.max(0, sum2 / count - m * m)),
    spreadBandHz: [a, b],
    peakHz,
    nullHz,
  }
}

/**
 * @internal Smoothed peak-to-null spread only (no per-point logarithms): the figure the position search
 * minimises, identical to `spreadOfPower(...).spreadDb`.
 */
export function spreadDbOfPower(sys: ModalSystem, power: Float64Array, scratch: Float64Array): number {
  const F = power.length
  let mean = 0
  for (let f = 0; f < F; f++) mean += power[f]
  mean = mean / F || Number.MIN_VALUE
  const floor = mean * 1e-12
  const smooth = smoothPower(sys, power, scratch.length >= F ? scratch : new Float64Array(F))
  const { spreadFromHz: a, spreadToHz: b } = sys.opts
  let lo = Infinity
  let hi = -Infinity
  for (let f = 0; f < F; f++) {
    const hz = sys.freqsHz[f]
    if (hz < a * (1 - 1e-9) || hz > b * (1 + 1e-9)) continue
    const s = Math.max(smooth[f], floor)
    if (s > hi) hi = s
    if (s < lo) lo = s
  }
  return 10 * Math.log10(hi / lo)
}

/**
 * Low-frequency response from one or more speakers (driven in phase) to a seat by modal summation,
 * with each mode damped from the reverberation time, and its peak-to-null spread.
 * @param source a point or several (e.g. both speakers carrying the same bass), metres
 * @param receiver the seat, metres
 * @see Kuttruff, Room Acoustics, ch. 3 (modal sum of the rectangular room)
 */
export function modalResponse(room: RoomBox, source: Point | readonly Point[], receiver: Point, opts: ModalResponseOptions = {}): ModalResponse {
  assertRoom(room)
  const sources = Array.isArray(source) ? (source as readonly Point[]) : [source as Point]
  if (sources.length === 0) throw new RangeError('modalResponse needs at least one source')
  sources.forEach((s, i) => assertPointInRoom(room, s, sources.length > 1 ? `source ${i + 1}` : 'source'))
  assertPointInRoom(room, receiver, 'receiver')
  const sys = buildModalSystem(room, opts)
  return modalResponseFromSystem(sys, sources, receiver)
}

/** @internal */
export function modalResponseFromSystem(sys: ModalSystem, sources: readonly Point[], receiver: Point): ModalResponse {
  return modalResponseFromPower(sys, modalPower(sys, sources, receiver))
}

/** @internal |p|² per frequency from sources to a receiver. */
export function modalPower(sys: ModalSystem, sources: readonly Point[], receiver: Point): Float64Array {
  const w = sourceWeights(sys, sources)
  const r = sourceWeights(sys, [receiver])
  for (let i = 0; i < w.length; i++) w[i] *= r[i]
  return powerFromWeights(sys, w)
}

/** @internal */
export function modalResponseFromPower(sys: ModalSystem, power: Float64Array): ModalResponse {
  return { freqsHz: Array.from(sys.freqsHz), smoothingOctaves: sys.opts.smoothingOctaves, ...spreadOfPower(sys, power) }
}
