/**
 * Treatment plans (pure TypeScript, used by the server and the client): applying a plan to a copy of
 * the room, snap targets from the engine, predicted before/after with a plain-language summary per
 * change and the order by effect, placements measured from walls and corners, the shopping list.
 */
export { applyPlan, changeIds } from './apply'
export type { PlanRoom } from './apply'
export { engineTreatment, treatmentAbsorption, POROUS_MODEL_SOURCE } from './absorption'
export type { TreatmentAbsorption } from './absorption'
export { snapTargets, treatmentFromTarget, SUGGESTED_THICKNESS, CORNER_TRAP_FACE_M } from './snap'
export type { SnapTarget, SnapKind } from './snap'
export { predictPlan, effectBetween, outcomeOf, isSetupId, EFFECT_MEASURE, PLAN_ANALYSIS_OPTIONS } from './predict'
export type { PlanPredictions, ChangePrediction, Outcome, EffectParts, ReflectionComparison, RtRule } from './predict'
export { changeSummary, changeTitle, flagWords } from './summary'
export { placement } from './dimensions'
export type { Placement } from './dimensions'
export { shoppingList } from './shopping'
export type { ShoppingItem } from './shopping'
export { setupSuggestions } from './suggest'
export type { SetupSuggestions, SourceMoveSuggestion } from './suggest'
export { fitOnSurface, insideRect, surfaceAxes, surfaceSize } from './geometry'
export { treatmentTypeNames, surfaceWords, mountingWords } from './names'
export { FOLLOW_UP_MEASURING, CAUTIONS } from './words'
export type { PlanPreview } from './preview'
export { predictSubwooferItem } from './subwoofers'
export type { SubwooferItemPrediction, SubwooferFigures } from './subwoofers'
