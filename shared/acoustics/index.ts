/**
 * Roomwright's room engine: pure TypeScript (no I/O, no DOM), shared by the server's triage and the
 * browser preview. The names of ENGINE.md are the contract; the rest are additions beside it.
 */
import { MATERIALS } from './materials'

export type { Surface, RoomBox, Point, Opening, Treatment, Furnishing, OctaveBandHz } from './types'
export { SURFACES, OCTAVE_BANDS_HZ, roomVolume, roomSurfaceArea, surfaceArea, distanceToSurface } from './types'

// contract (ENGINE.md)
export { speedOfSound } from './units'
export { roomModes } from './modes'
export type { RoomMode } from './modes'
export { schroederFrequency, sabineRt, eyringRt } from './reverberation'
export { firstReflections } from './reflections'
export type { Reflection } from './reflections'
export { boundaryNotches } from './boundaries'
export type { BoundaryNotch } from './boundaries'
export { porousAbsorption } from './absorbers'
export { setupFlags } from './setup-flags'
export type { SetupFlag } from './setup-flags'
export { searchSubwoofers } from './subwoofers'
export type { SubwooferSearchOptions, SubwooferLayout, SubwooferSearch } from './subwoofers'

// additions
export {
  airDensity, feetInchesToMetres, feetToMetres, metresToFeet, metresToFeetInches, formatFeetInches,
  squareMetresToSquareFeet, squareFeetToSquareMetres, cubicMetresToCubicFeet, METRES_PER_FOOT, METRES_PER_INCH,
} from './units'
export {
  modePressure, modePositionClass, modeCountEstimate, modalDensity, analyzeModes, compareRatios, modalResponse, rt60At, MODAL_CONVERGENCE_DB,
} from './modes'
export type { ModeAnalysis, ModeCoincidence, AxialGap, ThirdOctaveModeCount, RatioReference, ModalResponse, ModalResponseOptions, Rt60Spec } from './modes'
export { subwooferCandidates, subwooferLayoutResponse } from './subwoofers'
export { subwooferAdvice } from './subwoofer-advice'
export type { SubwooferAdvice, SubwooferAdviceLayout } from './subwoofer-advice'
export type { SubwooferLayoutResponse } from './subwoofers'
export { searchPositions } from './position-search'
export type { PositionSearch, PositionSearchOptions, SpreadAt } from './position-search'
export {
  secondOrderReflections, imageSource, inReflectionWindow, reflectionPanel, DEFAULT_REFLECTION_WINDOW, DEFAULT_HEAD_MOVEMENT,
} from './reflections'
export type { SecondOrderReflection, ReflectionOptions, ReflectionWindow, ReflectionPanel, HeadMovement } from './reflections'
export { boundaryResponse } from './boundaries'
export type { BoundaryResponse } from './boundaries'
export { airAttenuationDbPerM, bandReverberation, treatmentAlpha, midBandAlpha } from './reverberation'
export type { RtOptions, ReverberationInput, ReverberationBand, ReverberationAnalysis, RtTarget } from './reverberation'
export { MATERIALS, getMaterial, hasMaterial, materialForOpening, PANEL_FLOW_RESISTIVITY } from './materials'
export type { Material, MaterialCategory } from './materials'
export { porousAbsorptionRandom, porousOctaveBands, porousSurfaceImpedance, porousCharacteristics } from './absorbers'
export type { PorousLayer, PorousModel, Complex } from './absorbers'
export { SETUP_FLAG_IDS, FLAG_THRESHOLDS, lengthsInUnits } from './setup-flags'
export type { SetupFlagInput } from './setup-flags'
export { computeRoomAnalysis, ENGINE_VERSION } from './triage'
export type {
  RoomDescription, AnalysisOptions, RoomAnalysis, PairReflections, FirstReflectionEntry, SecondReflectionEntry,
  ReflectionSurfaceHit, SpeakerBoundaries, SeatAnalysis, LabelledPoint,
} from './triage'
export { assertRoom, assertPointInRoom, assertOpening } from './validate'

/** Ids of every row of the materials table. */
export function materialIds(): string[] {
  return MATERIALS.map((m) => m.id)
}
