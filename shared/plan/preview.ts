import type { PlanPredictions } from './predict'
import type { SnapTarget } from './snap'
import type { SetupSuggestions } from './suggest'

/** What the editor shows for an unsaved plan (POST /api/plans/preview). */
export interface PlanPreview {
  predictions: PlanPredictions
  /** places for treatments, from the room with the plan's seat and speaker moves made */
  snapTargets: SnapTarget[]
  /** seat and speaker positions from the engine's search on today's room */
  suggestions: SetupSuggestions
  /** the room revision the preview was computed on */
  roomRevision?: number
}
