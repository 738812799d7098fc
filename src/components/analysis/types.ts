import type { RoomAnalysis } from '../../../shared/acoustics'

/**
 * What the analysis components show: the engine's `computeRoomAnalysis` output, or a stored triage
 * snapshot (which carries the same fields; `reflectionWindow` and `modesMaxHz` may be absent there).
 */
export type AnalysisData = Pick<RoomAnalysis, 'modes' | 'modeAnalysis' | 'reflections' | 'notches' | 'reverberation' | 'flags' | 'seat'> &
  Partial<Pick<RoomAnalysis, 'reflectionWindow' | 'modesMaxHz' | 'room'>>
