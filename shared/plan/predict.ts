import { ENGINE_VERSION, computeRoomAnalysis } from '../acoustics'
import type { AnalysisOptions, RoomAnalysis, SetupFlag, Surface } from '../acoustics'
import type { PlanBody, PlanTreatment } from '../schemas/plan'
import type { PlanRoom } from './apply'
import { applyPlan, changeIds } from './apply'
import { treatmentAbsorption } from './absorption'
import type { TreatmentAbsorption } from './absorption'
import { insideRect } from './geometry'
import { changeTitle, changeSummary } from './summary'
import { predictSubwooferItem, type SubwooferItemPrediction } from './subwoofers'

export type RtRule = 'domestic' | 'bs1116'

/** Figures of one state of the room that the plan compares. */
export interface Outcome {
  /** first-order reflections of the main seat inside the reflection window */
  firstInWindow: number
  /** reflections of both orders inside the window, every speaker–seat pair */
  allInWindow: number
  /** low-frequency peak-to-null spread at the main seat, dB (1/6-octave smoothed modal response) */
  spreadDb: number
  /** Eyring RT, mean of 500 Hz and 1 kHz, s */
  rtMidS: number
  /** mean distance of the Eyring RT outside the target band, 125 Hz–4 kHz, s */
  rtExcessS: number
  problems: number
  warnings: number
}

export interface EffectParts {
  reflections: number
  bass: number
  reverberation: number
  flags: number
}

export interface ChangePrediction {
  id: string
  kind: 'seat' | 'speakers' | 'subwoofers' | 'treatment'
  title: string
  /** what the change does, in plain words with the predicted figures */
  summary: string
  /** effect points (see EFFECT_MEASURE) and their parts */
  effect: { points: number; parts: EffectParts }
  base: Outcome
  alone: Outcome
  clearedFlags: string[]
  raisedFlags: string[]
  /** first-order reflections of the main seat this treatment catches */
  covers: { speaker: string; seat: string; surface: Surface; beforeDb: number; afterDb: number; inWindowBefore: boolean; inWindowAfter: boolean }[]
  absorption: (TreatmentAbsorption & { changeId: string }) | null
}

export interface ReflectionComparison {
  speaker: string
  seat: string
  surface: Surface
  beforeDb: number
  afterDb: number
  delayMsBefore: number
  delayMsAfter: number
  inWindowBefore: boolean
  inWindowAfter: boolean
  /** after the plan: where the reflection meets the surface */
  point: { x: number; y: number; z: number }
  /** plan treatments whose rectangle holds the reflection point */
  coveredBy: string[]
}

export interface PlanPredictions {
  engineVersion: string
  rtTarget: { rule: RtRule; description: string }
  before: Outcome
  after: Outcome
  reverberation: {
    bands: { hz: number; sabineBefore: number; sabineAfter: number; eyringBefore: number; eyringAfter: number; target: number; lower: number; upper: number; statusBefore: string; statusAfter: string; absorptionBeforeM2: number; absorptionAfterM2: number }[]
    volumeM3: number
  }
  /** every plan treatment's absorption with its source */
  absorption: (TreatmentAbsorption & { changeId: string })[]
  reflections: ReflectionComparison[]
  reflectionWindow: { windowMs: number; thresholdDb: number }
  lowFrequency: { freqsHz: number[]; beforeDb: number[]; afterDb: number[]; spreadBeforeDb: number; spreadAfterDb: number; bandHz: [number, number] }
  flags: { before: SetupFlag[]; after: SetupFlag[]; cleared: SetupFlag[]; raised: SetupFlag[] }
  /** every change, in the plan's order */
  changes: ChangePrediction[]
  /** change ids, biggest effect first */
  byEffect: string[]
  /** the order the plan gives the listener: the advisor's, completed by effect; else by effect */
  order: string[]
  /** the room after each step of `order`, cumulatively */
  steps: { changeId: string; outcome: Outcome }[]
  effectMeasure: string
  /** the plan's subwoofer item, when it has one (predicted beside the changes, see predictSubwooferItem) */
  subwooferLayout?: SubwooferItemPrediction
}

/**
 * How "biggest effect" is measured (our weights, common practice, no source). Each change is scored
 * against the room it lands in: a seat or speaker move on today's room; a treatment on the room with
 * the plan's seat and speaker moves made (they come first because treatment positions follow them).
 * Points = reflections + bass + reverberation + flags:
 *   reflections: 2 per first-order reflection of the main seat that leaves the early-reflection window
 *     (−2 per one that enters it), plus 0.2 per dB it drops while inside the window (at most 10 dB each);
 *   bass: 1 per dB the low-frequency peak-to-null spread at the main seat shrinks;
 *   reverberation: 1 per 0.02 s that the mean distance of the Eyring RT outside the target band
 *     (125 Hz–4 kHz) shrinks;
 *   flags: 5 per problem, 2 per warning, 0.5 per note that clears (the same taken off for new ones,
 *     unless the whole plan clears them again, as a corner trap's partner does).
 */
export const EFFECT_MEASURE =
  'Effect points (our weights, no published source): 2 per early reflection leaving the 20 ms window and 0.2 per dB it drops; 1 per dB less low-frequency spread at the seat; 1 per 0.02 s the reverberation time moves towards its target band; 5, 2 and 0.5 per problem, warning and note that clears. Seat and speaker moves are scored on today\'s room, treatments on the room after those moves.'

/** The change ids that move the seat or a source (they are scored on today's room and come first). */
export const isSetupId = (id: string) => id === 'seat' || id === 'speakers' || id === 'subwoofers'

const SEVERITY_POINTS = { problem: 5, warning: 2, info: 0.5 } as const
const BANDS_FOR_EXCESS = [125, 250, 500, 1000, 2000, 4000]

/** Analysis options the plan uses (the engine's defaults). */
export const PLAN_ANALYSIS_OPTIONS: AnalysisOptions = {}

export function outcomeOf(a: RoomAnalysis, rule: RtRule = 'domestic'): Outcome {
  const main = a.seat.label
  const target = a.reverberation.targets[rule].bands.filter((b) => BANDS_FOR_EXCESS.includes(b.hz))
  const excess = target.length ? target.reduce((s, b) => s + Math.max(0, b.eyring - b.upper, b.lower - b.eyring), 0) / target.length : 0
  const mid = a.reverberation.bands.filter((b) => b.hz === 500 || b.hz === 1000)
  return {
    firstInWindow: a.reflections.filter((p) => p.seat === main).reduce((n, p) => n + p.first.filter((r) => r.inWindow).length, 0),
    allInWindow: a.reflections.reduce((n, p) => n + p.inWindowCount, 0),
    spreadDb: a.seat.modalResponse.spreadDb,
    rtMidS: mid.length ? mid.reduce((s, b) => s + b.eyring, 0) / mid.length : NaN,
    rtExcessS: excess,
    problems: a.flags.filter((f) => f.severity === 'problem').length,
    warnings: a.flags.filter((f) => f.severity === 'warning').length,
  }
}

type FirstKey = string
const keyOf = (speaker: string, surface: string): FirstKey => `${speaker}|${surface}`

function mainFirst(a: RoomAnalysis) {
  const map = new Map<FirstKey, { speaker: string; seat: string; surface: Surface; levelDb: number; inWindow: boolean; delayMs: number; point: { x: number; y: number; z: number } }>()
  for (const p of a.reflections.filter((p) => p.seat === a.seat.label)) {
    for (const r of p.first) map.set(keyOf(p.speaker, r.surface), { speaker: p.speaker, seat: p.seat, surface: r.surface, levelDb: r.levelDb, inWindow: r.inWindow, delayMs: r.delayMs, point: r.point })
  }
  return map
}

/** Effect points of going from analysis `a` to analysis `b` (see EFFECT_MEASURE). */
export function effectBetween(a: RoomAnalysis, b: RoomAnalysis, rule: RtRule = 'domestic', keepRaised?: ReadonlySet<string>): { points: number; parts: EffectParts; cleared: string[]; raised: string[] } {
  const fa = mainFirst(a)
  const fb = mainFirst(b)
  let reflections = 0
  for (const [k, ra] of fa) {
    const rb = fb.get(k)
    if (!rb) continue
    if (ra.inWindow && !rb.inWindow) reflections += 2
    if (!ra.inWindow && rb.inWindow) reflections -= 2
    if (ra.inWindow || rb.inWindow) reflections += 0.2 * Math.max(-10, Math.min(10, ra.levelDb - rb.levelDb))
  }
  const oa = outcomeOf(a, rule)
  const ob = outcomeOf(b, rule)
  const bass = oa.spreadDb - ob.spreadDb
  const reverberation = (oa.rtExcessS - ob.rtExcessS) / 0.02
  const idsA = new Map(a.flags.map((f) => [f.id, f]))
  const idsB = new Map(b.flags.map((f) => [f.id, f]))
  const cleared = [...idsA.keys()].filter((id) => !idsB.has(id))
  const raised = [...idsB.keys()].filter((id) => !idsA.has(id) && (!keepRaised || keepRaised.has(id)))
  const flags = cleared.reduce((s, id) => s + SEVERITY_POINTS[idsA.get(id)!.severity], 0) - raised.reduce((s, id) => s + SEVERITY_POINTS[idsB.get(id)!.severity], 0)
  const r1 = (v: number) => Math.round(v * 10) / 10
  const parts = { reflections: r1(reflections), bass: r1(bass), reverberation: r1(reverberation), flags: r1(flags) }
  return { points: r1(reflections + bass + reverberation + flags), parts, cleared, raised }
}

/** Plan treatments (by id) whose rectangle holds a reflection point on `surface`. */
function coveringTreatments(treatments: readonly PlanTreatment[], surface: Surface, p: { x: number; y: number; z: number }): string[] {
  return treatments.filter((t) => t.surface === surface && insideRect(surface, p, t)).map((t) => t.id)
}

/**
 * The plan's predicted before and after, computed by the engine on copies of the room: today's room,
 * the room with every change, each change on the room it lands in (see EFFECT_MEASURE) and the room
 * after each step of the order. Pure; the room and plan are not changed.
 */
export function predictPlan(room: PlanRoom, body: PlanBody, opts: { rtTarget?: RtRule } = {}): PlanPredictions {
  const rule = opts.rtTarget ?? 'domestic'
  const analyse = (only?: readonly string[]) => computeRoomAnalysis(applyPlan(room, body, only ?? []), PLAN_ANALYSIS_OPTIONS)
  const before = computeRoomAnalysis(applyPlan(room, body, []), PLAN_ANALYSIS_OPTIONS)
  const ids = changeIds(body)
  const setupIds = ids.filter(isSetupId)
  const after = ids.length ? analyse(ids) : before
  const setupRoom = setupIds.length ? analyse(setupIds) : before
  const celsius = room.celsius ?? 20
  const absorption = body.treatments.map((t) => ({ changeId: t.id, ...treatmentAbsorption(t, celsius) }))

  const changes: ChangePrediction[] = ids.map((id) => {
    const isSetup = isSetupId(id)
    const base = isSetup ? before : setupRoom
    const alone = isSetup ? analyse([id]) : analyse([...setupIds, id])
    // a flag this change raises alone but the whole plan does not (a corner trap before its partner) is not held against it
    const eff = effectBetween(base, alone, rule, new Set(after.flags.map((f) => f.id)))
    const t = body.treatments.find((x) => x.id === id)
    const baseFirst = mainFirst(base)
    const covers = t
      ? [...mainFirst(alone).values()]
        .filter((r) => r.surface === t.surface && insideRect(t.surface, r.point, t))
        .map((r) => {
          const b = baseFirst.get(keyOf(r.speaker, r.surface))!
          return { speaker: r.speaker, seat: r.seat, surface: r.surface, beforeDb: b.levelDb, afterDb: r.levelDb, inWindowBefore: b.inWindow, inWindowAfter: r.inWindow }
        })
      : []
    const abs = absorption.find((x) => x.changeId === id) ?? null
    const change: ChangePrediction = {
      id,
      kind: isSetup ? (id as 'seat' | 'speakers' | 'subwoofers') : 'treatment',
      title: changeTitle(room, body, id),
      summary: '',
      effect: { points: eff.points, parts: eff.parts },
      base: outcomeOf(base, rule),
      alone: outcomeOf(alone, rule),
      clearedFlags: eff.cleared,
      raisedFlags: eff.raised,
      covers,
      absorption: abs,
    }
    change.summary = changeSummary(room, body, change, { rule })
    return change
  })

  const byEffect = [...changes].sort((a, b) => b.effect.points - a.effect.points || ids.indexOf(a.id) - ids.indexOf(b.id)).map((c) => c.id)
  const given = body.order.filter((id) => ids.includes(id))
  const order = given.length ? [...new Set([...given, ...byEffect])] : byEffect
  const steps = order.map((_, k) => {
    const upTo = order.slice(0, k + 1)
    const a = k === order.length - 1 ? after : analyse(upTo)
    return { changeId: order[k], outcome: outcomeOf(a, rule) }
  })

  const reflections: ReflectionComparison[] = []
  for (const p of after.reflections) {
    for (const r of p.first) {
      const b = before.reflections.find((q) => q.speaker === p.speaker && q.seat === p.seat)?.first.find((q) => q.surface === r.surface)
      if (!b) continue
      reflections.push({
        speaker: p.speaker, seat: p.seat, surface: r.surface,
        beforeDb: b.levelDb, afterDb: r.levelDb, delayMsBefore: b.delayMs, delayMsAfter: r.delayMs,
        inWindowBefore: b.inWindow, inWindowAfter: r.inWindow, point: r.point,
        coveredBy: coveringTreatments(body.treatments, r.surface, r.point),
      })
    }
  }

  const tb = before.reverberation.targets[rule]
  const ta = after.reverberation.targets[rule]
  const bands = before.reverberation.bands.flatMap((b) => {
    const a = after.reverberation.bands.find((x) => x.hz === b.hz)
    const tB = tb.bands.find((x) => x.hz === b.hz)
    const tA = ta.bands.find((x) => x.hz === b.hz)
    if (!a || !tB || !tA) return []
    return [{
      hz: b.hz, sabineBefore: b.sabine, sabineAfter: a.sabine, eyringBefore: b.eyring, eyringAfter: a.eyring,
      target: tB.target, lower: tB.lower, upper: tB.upper, statusBefore: tB.status, statusAfter: tA.status,
      absorptionBeforeM2: b.absorptionAreaM2, absorptionAfterM2: a.absorptionAreaM2,
    }]
  })

  const fb = new Map(before.flags.map((f) => [f.id, f]))
  const fa = new Map(after.flags.map((f) => [f.id, f]))
  return {
    engineVersion: ENGINE_VERSION,
    rtTarget: { rule, description: tb.description },
    before: outcomeOf(before, rule),
    after: outcomeOf(after, rule),
    reverberation: { bands, volumeM3: before.reverberation.volumeM3 },
    absorption,
    reflections,
    reflectionWindow: { ...after.reflectionWindow },
    lowFrequency: {
      freqsHz: before.seat.modalResponse.freqsHz,
      beforeDb: before.seat.modalResponse.smoothedDb,
      afterDb: after.seat.modalResponse.smoothedDb,
      spreadBeforeDb: before.seat.modalResponse.spreadDb,
      spreadAfterDb: after.seat.modalResponse.spreadDb,
      bandHz: before.seat.modalResponse.spreadBandHz,
    },
    flags: {
      before: before.flags,
      after: after.flags,
      cleared: before.flags.filter((f) => !fa.has(f.id)),
      raised: after.flags.filter((f) => !fb.has(f.id)),
    },
    changes,
    byEffect,
    order,
    steps,
    effectMeasure: EFFECT_MEASURE,
    ...(body.subwooferLayout ? { subwooferLayout: predictSubwooferItem(room, body.subwooferLayout) } : {}),
  }
}
