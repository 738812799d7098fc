/**
 * The engine work the server runs off the event loop, by name. Each task is a pure function of
 * JSON-like arguments returning a JSON-like result; the worker thread (worker.ts, export `engine`)
 * looks the name up here and the main thread calls it through `runEngineTask(name, ...args)` (pool.ts).
 * To add a task (e.g. the subwoofer search), add one line here: the types follow.
 */
import { computeRoomAnalysis, type AnalysisOptions, type RoomDescription } from '../../shared/acoustics'
import { applyPlan, predictPlan, setupSuggestions, snapTargets, type PlanRoom } from '../../shared/plan'
import type { PlanBody } from '../../shared/schemas/plan'

export const engineTasks = {
  /** The complete room analysis (modes, reflections, notches, reverberation, flags, seat). */
  roomAnalysis: (room: RoomDescription, opts?: AnalysisOptions) => computeRoomAnalysis(room, opts),
  /**
   * The same, serialised in the worker: the preview sends it as it is, so the main thread neither
   * clones nor stringifies a result that reaches a megabyte for the largest accepted rooms.
   */
  roomAnalysisJson: (room: RoomDescription, opts?: AnalysisOptions) => JSON.stringify(computeRoomAnalysis(room, opts)),
  /** A plan's predicted before/after (several analyses of room copies). */
  planPredictions: (room: PlanRoom, body: PlanBody) => predictPlan(room, body),
  /** What the plan editor shows for an unsaved plan. */
  planPreview: (room: PlanRoom, body: PlanBody) => {
    const predictions = predictPlan(room, body)
    const today = computeRoomAnalysis(applyPlan(room, body, []))
    const setupOnly = [...(body.seat ? ['seat'] : []), ...(body.speakers.length ? ['speakers'] : []), ...(body.subwoofers.length ? ['subwoofers'] : [])]
    const setupRoom = setupOnly.length ? computeRoomAnalysis(applyPlan(room, body, setupOnly)) : today
    return { predictions, snapTargets: snapTargets(room, setupRoom), suggestions: setupSuggestions(room, today) }
  },
} satisfies Record<string, (...args: never[]) => unknown>

export type EngineTasks = typeof engineTasks
export type EngineTaskName = keyof EngineTasks

export interface EngineTaskRequest { name: string; args: unknown[] }
/** A RangeError (the engine's "impossible input") travels back as data; anything else is a crash. */
export type EngineTaskReply = { ok: true; value: unknown } | { ok: false; error: { name: 'RangeError'; message: string } }

/** Runs a task in this thread (the worker calls it; tests may too). */
export function runEngineTaskHere(req: EngineTaskRequest): EngineTaskReply {
  const task = (engineTasks as Record<string, (...args: unknown[]) => unknown>)[req.name]
  if (!Object.hasOwn(engineTasks, req.name) || typeof task !== 'function') throw new Error(`no engine task named "${req.name}"`)
  try {
    return { ok: true, value: task(...req.args) }
  } catch (err) {
    if (err instanceof RangeError) return { ok: false, error: { name: 'RangeError', message: err.message } }
    throw err
  }
}
