import { computeRoomAnalysis, materialIds } from '../../shared/acoustics'
import { applyPlan, predictPlan, setupSuggestions, snapTargets, type PlanPredictions, type PlanPreview, type PlanRoom } from '../../shared/plan'
import { planIssues, type PlanBody } from '../../shared/schemas/plan'
import { badRequest } from '../errors'

export type { PlanPreview }

/** 400 with field paths for a plan that does not fit its room (positions outside, unknown ids or materials). */
export function checkPlan(room: PlanRoom, body: PlanBody): void {
  const fields = planIssues(body, room)
  const known = new Set(materialIds())
  body.treatments.forEach((t, i) => {
    if (t.materialId && !known.has(t.materialId)) fields.push({ path: `treatments.${i}.materialId`, message: `unknown material "${t.materialId}"` })
  })
  if (fields.length) throw badRequest('Some parts of the plan need another look', fields)
}

/** Runs the engine; an impossible room copy (the engine's RangeError) answers 400 with its physical reason. */
function engine<T>(fn: () => T): T {
  try {
    return fn()
  } catch (e) {
    if (e instanceof RangeError) throw badRequest(`The plan cannot be predicted: ${e.message}`)
    throw e
  }
}

/** Predictions for a plan on a room, checked first. */
export function planPredictions(room: PlanRoom, body: PlanBody): PlanPredictions {
  checkPlan(room, body)
  return engine(() => predictPlan(room, body))
}

/** Everything the editor shows for an unsaved plan. */
export function planPreview(room: PlanRoom, body: PlanBody): PlanPreview {
  checkPlan(room, body)
  return engine(() => {
    const predictions = predictPlan(room, body)
    const today = computeRoomAnalysis(applyPlan(room, body, []))
    const setupOnly = [...(body.seat ? ['seat'] : []), ...(body.speakers.length ? ['speakers'] : []), ...(body.subwoofers.length ? ['subwoofers'] : [])]
    const setupRoom = setupOnly.length ? computeRoomAnalysis(applyPlan(room, body, setupOnly)) : today
    return { predictions, snapTargets: snapTargets(room, setupRoom), suggestions: setupSuggestions(room, today) }
  })
}
