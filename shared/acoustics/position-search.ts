import type { ModalResponseOptions, ModalSystem } from './modes'
import { addSeries, addWeightedRows, buildModalSystem, complexPower, farSeries, modalPower, sourceWeights, spreadDbOfPower } from './modes'
import type { Point, RoomBox } from './types'
import { FLAG_THRESHOLDS } from './setup-flags'
import { assertPointInRoom, assertPositive, assertRoom } from './validate'

export interface PositionSearchOptions extends ModalResponseOptions {
  /** seat positions along the centre line (default 200) */
  seatPositions?: number
  /** also scan across the room (y), with this many positions per row (default 0: centre line only) */
  acrossPositions?: number
  /** speaker distances from the front wall to try (default 60) */
  speakerPositions?: number
  /** seat scan range along x, metres (default: max(1 m, 0.8 × speaker spacing) behind the speakers, at most 60 % of the length … 0.25 m from the back wall) */
  seatFromX?: number
  seatToX?: number
  /** speaker scan range from the front wall, metres (default 0.2 m … the nearer of 45 % of the length and 1 m in front of the seat) */
  speakerFromX?: number
  speakerToX?: number
}

export interface SpreadAt {
  point: Point
  spreadDb: number
}

export interface PositionSearch {
  seat: {
    best: SpreadAt
    current: SpreadAt
    /** 38 % of the length from the front wall */
    at38Percent: SpreadAt
    /** 38 % of the length from the back wall */
    at38PercentFromBack: SpreadAt
    atRoomCentre: SpreadAt
    scan: { x: number; y: number; spreadDb: number }[]
  }
  speakers: {
    best: { distanceFromFront: number; spreadDb: number }
    /** distanceFromFront: the mean of the sources' distances; positions: each source today */
    current: { distanceFromFront: number; spreadDb: number; positions: Point[] }
    scan: { distanceFromFront: number; spreadDb: number }[]
  }
  spreadBandHz: [number, number]
  smoothingOctaves: number
}

/**
 * Grouped transfer: C_g(f) = Σ_{m in g} w_m·H_m(f), grouped by mode index along x (and y when `byY`).
 * Evaluating a position is then a short sum over groups of cosines (separable mode shapes).
 */
function groupTransfer(sys: ModalSystem, weights: Float64Array, byY: boolean) {
  const keys = new Map<number, number>()
  const total = sys.modeCount + sys.farCount
  const groupOf = new Int32Array(total)
  const gx: number[] = []
  const gy: number[] = []
  for (let i = 0; i < total; i++) {
    const nx = sys.n[3 * i]
    const ny = byY ? sys.n[3 * i + 1] : 0
    const key = nx * 100000 + ny
    let g = keys.get(key)
    if (g === undefined) { g = gx.length; keys.set(key, g); gx.push(nx); gy.push(ny) }
    groupOf[i] = g
  }
  const G = gx.length
  const F = sys.freqsHz.length
  const M = sys.modeCount
  // group-major: [g·F + f]
  const cRe = new Float64Array(F * G)
  const cIm = new Float64Array(F * G)
  const { hRe, hIm } = sys
  for (let i = 0; i < M; i++) {
    const w = weights[i]
    if (Math.abs(w) < 1e-12) continue // nodal planes (e.g. odd width modes on the centre line)
    const src = i * F
    const out = groupOf[i] * F
    for (let f = 0; f < F; f++) {
      cRe[out + f] += w * hRe[src + f]
      cIm[out + f] += w * hIm[src + f]
    }
  }
  // far modes: their series summed per group, then evaluated on the grid once per group
  const members: number[][] = Array.from({ length: G }, () => [])
  for (let i = 0; i < sys.farCount; i++) members[groupOf[M + i]].push(i)
  for (let g = 0; g < G; g++) {
    if (members[g].length === 0) continue
    const { aRe, aIm } = farSeries(sys, weights, 0, members[g].length, members[g])
    addSeries(sys, aRe, aIm, cRe, cIm, g * F)
  }
  return { G, gx, gy, cRe, cIm, re: new Float64Array(F), im: new Float64Array(F) }
}

function powerAt(sys: ModalSystem, grp: ReturnType<typeof groupTransfer>, x: number, y: number | null, power: Float64Array): Float64Array {
  const [lx, ly] = sys.dims
  const { G, gx, gy, cRe, cIm } = grp
  const shape = new Float64Array(G)
  for (let g = 0; g < G; g++) shape[g] = Math.cos((gx[g] * Math.PI * x) / lx) * (y === null ? 1 : Math.cos((gy[g] * Math.PI * y) / ly))
  const F = sys.freqsHz.length
  const { re, im } = grp
  re.fill(0)
  im.fill(0)
  addWeightedRows(shape, G, cRe, cIm, F, re, im)
  return complexPower(re, im, power)
}

function linspace(a: number, b: number, n: number): number[] {
  if (n <= 1) return [(a + b) / 2]
  return Array.from({ length: n }, (_, i) => a + ((b - a) * i) / (n - 1))
}

/**
 * Scan seat positions along the room's centre line (optionally across it too) and speaker distances
 * from the front wall for the smallest low-frequency peak-to-null spread (1/6-octave smoothed modal
 * response, as `modalResponse`). The seat keeps its ear height; the speakers keep their y and height
 * and all move to the same distance from the front wall. `speakers` are the bass sources: in a room
 * with subwoofers the triage passes the subwoofers, and the speaker scan then moves those.
 * @param speakers the bass sources, driven in phase, metres
 * @param seat the current seat, metres
 */
export function searchPositions(room: RoomBox, speakers: readonly Point[], seat: Point, opts: PositionSearchOptions = {}): PositionSearch {
  assertRoom(room)
  if (!Array.isArray(speakers) || speakers.length === 0) throw new RangeError('the position search needs at least one speaker')
  speakers.forEach((s, i) => assertPointInRoom(room, s, `speaker ${i + 1}`))
  assertPointInRoom(room, seat, 'seat')
  const sys = buildModalSystem(room, opts)
  return searchPositionsWithSystem(sys, room, speakers, seat, opts)
}

/** @internal The search on a prepared modal system (shared with the triage). */
export function searchPositionsWithSystem(
  sys: ModalSystem, room: RoomBox, speakers: readonly Point[], seat: Point, opts: PositionSearchOptions = {},
  currentPower: Float64Array = modalPower(sys, speakers, seat),
): PositionSearch {
  const nSeat = opts.seatPositions ?? 200
  const nAcross = opts.acrossPositions ?? 0
  const nSpeaker = opts.speakerPositions ?? 60
  assertPositive(nSeat, 'seatPositions')
  assertPositive(nSpeaker, 'speakerPositions')
  const L = room.length
  const W = room.width
  const speakerX = Math.max(...speakers.map((s) => s.x))
  const clampX = (v: number) => Math.min(L, Math.max(0, v))
  // A seat closer than about the speakers' spacing stops being a stereo seat: scan from 0.8 × the
  // spacing (at least 1 m) behind the speakers, but never past 60 % of the length (common practice, no source).
  const spacing = Math.max(...speakers.map((s) => s.y)) - Math.min(...speakers.map((s) => s.y))
  const minListening = Math.max(1, 0.8 * spacing)
  let seatFrom = clampX(opts.seatFromX ?? Math.min(speakerX + minListening, 0.6 * L))
  // and never closer to the back wall than the setup check's seat-to-wall distance, so the best seat the
  // search offers is not one the same triage then flags as too close to the wall behind it
  let seatTo = clampX(opts.seatToX ?? L - FLAG_THRESHOLDS.seatWallM)
  if (opts.seatToX === undefined && seatTo <= seatFrom) seatTo = clampX(L - Math.min(0.25, 0.05 * L))
  if (seatTo <= seatFrom) { seatFrom = clampX(speakerX); seatTo = L }
  const centreY = W / 2
  const src = sourceWeights(sys, speakers)
  const power = new Float64Array(sys.freqsHz.length)
  const prefix = new Float64Array(sys.freqsHz.length + 1)
  const spread = (p: Float64Array) => spreadDbOfPower(sys, p, prefix)

  // seat scan: receiver shape in y and z fixed (centre line, ear height) unless scanning across
  const lz = sys.dims[2]
  const ly = sys.dims[1]
  const seatWeights = (y: number | null) => {
    const w = new Float64Array(sys.modeCount + sys.farCount)
    for (let i = 0; i < w.length; i++) {
      const cy = y === null ? 1 : Math.cos((sys.n[3 * i + 1] * Math.PI * y) / ly)
      w[i] = src[i] * cy * Math.cos((sys.n[3 * i + 2] * Math.PI * seat.z) / lz)
    }
    return w
  }
  const scan: { x: number; y: number; spreadDb: number }[] = []
  const xs = linspace(seatFrom, seatTo, nSeat)
  const centreGroups = groupTransfer(sys, seatWeights(centreY), false)
  if (nAcross > 0) {
    const grp = groupTransfer(sys, seatWeights(null), true)
    const ys = linspace(Math.min(0.3, W / 4), W - Math.min(0.3, W / 4), nAcross)
    for (const y of ys) for (const x of xs) scan.push({ x, y, spreadDb: spread(powerAt(sys, grp, x, y, power)) })
  } else {
    for (const x of xs) scan.push({ x, y: centreY, spreadDb: spread(powerAt(sys, centreGroups, x, null, power)) })
  }
  const bestSeat = scan.reduce((a, b) => (b.spreadDb < a.spreadDb ? b : a))
  const onCentre = (x: number): SpreadAt => ({
    point: { x, y: centreY, z: seat.z },
    spreadDb: spread(powerAt(sys, centreGroups, x, null, power)),
  })
  const currentSpread = spread(currentPower)

  // speaker scan: all speakers at the same distance from the front wall, receiver fixed at the seat
  const rec = sourceWeights(sys, [seat])
  const spkWeights = new Float64Array(sys.modeCount + sys.farCount)
  for (let i = 0; i < spkWeights.length; i++) {
    let s = 0
    for (const p of speakers) s += Math.cos((sys.n[3 * i + 1] * Math.PI * p.y) / ly) * Math.cos((sys.n[3 * i + 2] * Math.PI * p.z) / lz)
    spkWeights[i] = s * rec[i]
  }
  const spkGroups = groupTransfer(sys, spkWeights, false)
  let spkFrom = clampX(opts.speakerFromX ?? Math.min(0.2, 0.05 * L))
  let spkTo = clampX(opts.speakerToX ?? Math.min(0.45 * L, seat.x - 1))
  if (spkTo <= spkFrom) { spkFrom = 0; spkTo = Math.max(seat.x, 0.05 * L) }
  const speakerScan = linspace(spkFrom, spkTo, nSpeaker).map((d) => ({
    distanceFromFront: d,
    spreadDb: spread(powerAt(sys, spkGroups, d, null, power)),
  }))
  const bestSpeaker = speakerScan.reduce((a, b) => (b.spreadDb < a.spreadDb ? b : a))
  const currentSpeaker = {
    distanceFromFront: speakers.reduce((s, p) => s + p.x, 0) / speakers.length,
    spreadDb: currentSpread,
    positions: speakers.map((p) => ({ x: p.x, y: p.y, z: p.z })),
  }

  return {
    seat: {
      best: { point: { x: bestSeat.x, y: bestSeat.y, z: seat.z }, spreadDb: bestSeat.spreadDb },
      current: { point: { x: seat.x, y: seat.y, z: seat.z }, spreadDb: currentSpread },
      at38Percent: onCentre(0.38 * L),
      at38PercentFromBack: onCentre(0.62 * L),
      atRoomCentre: onCentre(L / 2),
      scan,
    },
    speakers: { best: bestSpeaker, current: currentSpeaker, scan: speakerScan },
    spreadBandHz: [sys.opts.spreadFromHz, sys.opts.spreadToHz],
    smoothingOctaves: sys.opts.smoothingOctaves,
  }
}
