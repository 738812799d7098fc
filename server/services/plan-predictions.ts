import { materialIds } from '../../shared/acoustics'
import type { PlanPredictions, PlanPreview, PlanRoom } from '../../shared/plan'
import { planIssues, type PlanBody } from '../../shared/schemas/plan'
import { engineLimitIssues } from '../../shared/schemas/room'
import { AppError, badRequest } from '../errors'
import { EngineTaskFailedError, runEngineTask } from '../analysis/pool'

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

/**
 * Runs the engine in the worker pool (a plan is several analyses of room copies: never on the event loop);
 * an impossible room copy (the engine's RangeError) answers 400 with its physical reason.
 */
async function engine<T>(run: () => Promise<T>): Promise<T> {
  try {
    return await run()
  } catch (e) {
    if (e instanceof RangeError) throw badRequest(`The plan cannot be predicted: ${e.message}`)
    if (e instanceof EngineTaskFailedError) throw new AppError('The room engine is busy; please try again in a moment', { status: 503, code: 'engine_unavailable' })
    throw e
  }
}

/** A room stored before the engine limits existed is refused with the same 422 as a new one. */
function checkRoomLimits(room: PlanRoom): void {
  const issues = engineLimitIssues(room)
  if (issues.length) throw new AppError(`This room is beyond what Roomwright analyses: ${issues[0].message}`, { status: 422, code: 'beyond_engine_limits', fields: issues.map((i) => ({ path: i.path, message: i.message })) })
}

/** Predictions for a plan on a room, checked first. */
export async function planPredictions(room: PlanRoom, body: PlanBody): Promise<PlanPredictions> {
  checkPlan(room, body)
  checkRoomLimits(room)
  return engine(() => runEngineTask('planPredictions', room, body))
}

/** Everything the editor shows for an unsaved plan. */
export async function planPreview(room: PlanRoom, body: PlanBody): Promise<PlanPreview> {
  checkPlan(room, body)
  checkRoomLimits(room)
  return engine(() => runEngineTask('planPreview', room, body))
}
