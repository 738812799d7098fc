import type { Point, RoomAnalysis, Surface } from '../acoustics'
import type { PlanTreatmentInput } from '../schemas/plan'
import type { PlanRoom } from './apply'
import { fitOnSurface, round2, roundUp5cm } from './geometry'
import { m, surfaceWords } from './names'

export type SnapKind = 'mirror' | 'ceiling' | 'corner' | 'back-wall' | 'front-wall'

/** A place the engine suggests for a treatment, with the reason in plain words. */
export interface SnapTarget {
  id: string
  kind: SnapKind
  surface: Surface
  /** the point the target marks: a mirror point, a corner, the spot behind the seat or a speaker */
  point: Point
  /** where a treatment placed here is centred, and its size on the surface (metres) */
  centre: Point
  widthM: number
  heightM: number
  suggestion: Pick<PlanTreatmentInput, 'type' | 'thickness' | 'airGap' | 'mounting' | 'materialId'>
  reason: string
  /** reflections (speaker → seat off surface) a treatment here catches */
  covers: { speaker: string; seat: string; surface: Surface }[]
}

/**
 * Common practice, no source (REFERENCES.md): first-reflection panels about 50 mm thick, back-wall
 * bass traps 150 mm or more, a trap behind the speakers 100 mm or more, corner traps in symmetric pairs.
 */
export const SUGGESTED_THICKNESS = { panel: 0.05, cloud: 0.05, backWall: 0.15, frontWall: 0.1, corner: 0.3 } as const
/** Corner traps: a 0.6 m face, floor to ceiling (our choice of a usual size). */
export const CORNER_TRAP_FACE_M = 0.6

const pt = (p: Point): Point => ({ x: p.x, y: p.y, z: p.z })
const within = (r: { inWindow: boolean; delayMs: number; levelDb: number }) =>
  `${r.delayMs.toFixed(1)} ms after the direct sound at ${r.levelDb.toFixed(1)} dB${r.inWindow ? ', inside the early-reflection window' : ''}`

/**
 * Snap targets from the engine's analysis of the room (with the plan's seat and speaker moves made):
 * every first-reflection mirror point of the main seat on the side walls, ceiling and floor with the
 * panel size that covers the listener's head movement; one cloud over all ceiling points; the four
 * vertical corners (front first, for bass traps); the back wall behind the seat; the front wall behind
 * each speaker.
 */
export function snapTargets(room: PlanRoom, analysis: RoomAnalysis): SnapTarget[] {
  const out: SnapTarget[] = []
  const box = { length: room.length, width: room.width, height: room.height }
  const { length: L, width: W, height: H } = box
  const main = analysis.seat.label
  const pairs = analysis.reflections.filter((p) => p.seat === main)

  for (const pair of pairs) {
    for (const r of pair.first) {
      if (r.surface === 'front' || r.surface === 'back') continue
      const fit = fitOnSurface(box, r.surface, pt({ x: (r.panel.min.x + r.panel.max.x) / 2, y: (r.panel.min.y + r.panel.max.y) / 2, z: (r.panel.min.z + r.panel.max.z) / 2 }), roundUp5cm(r.panel.widthM), roundUp5cm(r.panel.heightM))
      const type = r.surface === 'ceiling' ? 'cloud' : r.surface === 'floor' ? 'rug' : 'panel'
      const where = r.surface === 'floor'
        ? `${m(r.point.x)} from the front wall and ${m(r.point.y)} from the left wall`
        : r.surface === 'ceiling'
          ? `${m(r.point.x)} from the front wall and ${m(r.point.y)} from the left wall`
          : `${m(r.point.x)} from the front wall, ${m(r.point.z)} above the floor`
      out.push({
        id: `mirror-${pair.speaker}-${r.surface}`,
        kind: 'mirror',
        surface: r.surface,
        point: pt(r.point),
        centre: fit.centre,
        widthM: fit.width,
        heightM: fit.height,
        suggestion: type === 'rug'
          ? { type, thickness: 0.01, mounting: 'floor', materialId: 'heavy-carpet-on-concrete' }
          : { type, thickness: SUGGESTED_THICKNESS.panel, mounting: type === 'cloud' ? 'ceiling-hung' : 'wall', airGap: type === 'cloud' ? 0.1 : undefined },
        reason: `First reflection of speaker ${pair.speaker} off the ${surfaceWords[r.surface]}: it meets the surface ${where} and reaches the main seat ${within(r)}. A ${type === 'rug' ? 'rug' : 'panel'} of ${m(fit.width)} × ${m(fit.height)} here catches it while the head moves a little.`,
        covers: [{ speaker: pair.speaker, seat: pair.seat, surface: r.surface }],
      })
    }
  }

  const ceiling = pairs.map((p) => p.first.find((r) => r.surface === 'ceiling')).filter((r) => r !== undefined)
  if (ceiling.length > 1) {
    const lo = { x: Math.min(...ceiling.map((r) => r.panel.min.x)), y: Math.min(...ceiling.map((r) => r.panel.min.y)) }
    const hi = { x: Math.max(...ceiling.map((r) => r.panel.max.x)), y: Math.max(...ceiling.map((r) => r.panel.max.y)) }
    const fit = fitOnSurface(box, 'ceiling', { x: (lo.x + hi.x) / 2, y: (lo.y + hi.y) / 2, z: H }, roundUp5cm(hi.x - lo.x), roundUp5cm(hi.y - lo.y))
    out.push({
      id: 'ceiling-above-seat',
      kind: 'ceiling',
      surface: 'ceiling',
      point: fit.centre,
      centre: fit.centre,
      widthM: fit.width,
      heightM: fit.height,
      suggestion: { type: 'cloud', thickness: SUGGESTED_THICKNESS.cloud, airGap: 0.1, mounting: 'ceiling-hung' },
      reason: `Ceiling between the speakers and the main seat: one cloud of ${m(fit.width)} × ${m(fit.height)} catches the ceiling reflection of every speaker (${ceiling.map((r, i) => `${pairs[i].speaker}: ${r.levelDb.toFixed(1)} dB`).join(', ')}).`,
      covers: ceiling.map((_, i) => ({ speaker: pairs[i].speaker, seat: pairs[i].seat, surface: 'ceiling' as Surface })),
    })
  }

  const lowest = (axis: 0 | 1) => analysis.modes.find((md) => md.kind === 'axial' && md.n[axis] === 1)?.hz
  const lengthHz = lowest(0)
  const widthHz = lowest(1)
  const modeWords = [lengthHz && `${Math.round(lengthHz)} Hz along the length`, widthHz && `${Math.round(widthHz)} Hz across the width`].filter(Boolean).join(' and ')
  const corners = [
    { id: 'corner-front-left', wall: 'front' as Surface, x: 0, y: 0, words: 'front-left', front: true },
    { id: 'corner-front-right', wall: 'front' as Surface, x: 0, y: W, words: 'front-right', front: true },
    { id: 'corner-back-left', wall: 'back' as Surface, x: L, y: 0, words: 'back-left', front: false },
    { id: 'corner-back-right', wall: 'back' as Surface, x: L, y: W, words: 'back-right', front: false },
  ]
  for (const c of corners) {
    const face = Math.min(CORNER_TRAP_FACE_M, W / 4)
    const fit = fitOnSurface(box, c.wall, { x: c.x, y: c.y === 0 ? face / 2 : W - face / 2, z: H / 2 }, face, H)
    out.push({
      id: c.id,
      kind: 'corner',
      surface: c.wall,
      point: { x: c.x, y: c.y, z: H / 2 },
      centre: fit.centre,
      widthM: fit.width,
      heightM: fit.height,
      suggestion: { type: 'corner-trap', thickness: SUGGESTED_THICKNESS.corner, mounting: 'corner' },
      reason: `${c.words[0].toUpperCase()}${c.words.slice(1)} corner, floor to ceiling: every room mode has a pressure maximum in the corners, so a trap here meets all of them${modeWords ? ` (the lowest: ${modeWords})` : ''}. ${c.front ? 'Start with the front corners, as a pair' : 'The back corners come after the front ones, again as a pair'} (common practice, no source).`,
      covers: [],
    })
  }

  const seat = analysis.seat.point
  const backRefl = pairs.map((p) => ({ p, r: p.first.find((r) => r.surface === 'back') })).filter((e) => e.r)
  {
    const w = Math.min(2.4, W - 0.2)
    const h = Math.min(1.2, H)
    const fit = fitOnSurface(box, 'back', { x: L, y: seat.y, z: seat.z }, w, h)
    const loud = backRefl.reduce((a, b) => ((b.r?.levelDb ?? -99) > (a?.r?.levelDb ?? -99) ? b : a), backRefl[0])
    out.push({
      id: 'back-wall-behind-seat',
      kind: 'back-wall',
      surface: 'back',
      point: { x: L, y: seat.y, z: seat.z },
      centre: fit.centre,
      widthM: round2(fit.width),
      heightM: round2(fit.height),
      suggestion: { type: 'bass-trap', thickness: SUGGESTED_THICKNESS.backWall, mounting: 'wall' },
      reason: `Back wall behind the main seat, which is ${m(L - seat.x)} in front of it${loud?.r ? `; its reflection reaches you ${within(loud.r)}` : ''}. Every length mode has a pressure maximum on this wall, so thick absorption here (150 mm or more, common practice, no source) calms the bass as well as the late echo.`,
      covers: backRefl.map((e) => ({ speaker: e.p.speaker, seat: e.p.seat, surface: 'back' as Surface })),
    })
  }

  for (const s of analysis.notches.filter((n) => room.speakers.some((sp) => sp.label === n.speaker))) {
    const front = s.notches.find((n) => n.surface === 'front')
    const fit = fitOnSurface(box, 'front', { x: 0, y: s.point.y, z: s.point.z }, 0.6, Math.min(1.2, H))
    out.push({
      id: `front-wall-behind-${s.speaker}`,
      kind: 'front-wall',
      surface: 'front',
      point: { x: 0, y: s.point.y, z: s.point.z },
      centre: fit.centre,
      widthM: fit.width,
      heightM: fit.height,
      suggestion: { type: 'bass-trap', thickness: SUGGESTED_THICKNESS.frontWall, mounting: 'wall' },
      reason: `Wall behind speaker ${s.speaker}, ${m(s.point.x)} behind it${front ? `: the sound it sends back cancels near ${Math.round(front.notchHz)} Hz (speaker-boundary interference)` : ''}. Absorption of 100 mm or more here (common practice, no source) makes that dip shallower.`,
      covers: pairs.filter((p) => p.speaker === s.speaker).map((p) => ({ speaker: p.speaker, seat: p.seat, surface: 'front' as Surface })),
    })
  }
  return out
}

/** A plan treatment placed on a target (the caller gives it an id). */
export function treatmentFromTarget(target: SnapTarget, id: string): PlanTreatmentInput {
  return {
    id,
    type: target.suggestion.type,
    surface: target.surface,
    materialId: target.suggestion.materialId,
    thickness: target.suggestion.thickness,
    airGap: target.suggestion.airGap,
    mounting: target.suggestion.mounting,
    width: round2(target.widthM),
    height: round2(target.heightM),
    x: round2(target.centre.x),
    y: round2(target.centre.y),
    z: round2(target.centre.z),
    snap: { targetId: target.id, reason: target.reason },
    note: '',
  }
}
