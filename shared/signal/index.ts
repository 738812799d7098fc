/**
 * Roomwright's measurement analysis: pure TypeScript, for the server's worker pool
 * and the browser's preview alike.
 */
export { analyzeImpulseResponse, analyzeMeasurement, lowFrequencySummary } from './analyze'
export type { IrAnalysis, MeasurementAnalysis, MeasurementOptions, AnalyzedReflection } from './analyze'

export {
  analyzeMeasurementBytes,
  analyzeImpulseResponseFile,
  analyzeFrequencyResponseFile,
  detectKind,
} from './measurement-file'
export type { MeasurementAnalysisResult, ImpulseResponseFileAnalysis, FrequencyResponseFileAnalysis, MeasurementKind } from './measurement-file'

export { compareLeftRight, compareBeforeAfter, LEFT_RIGHT_THRESHOLDS } from './compare'
export type { LeftRightComparison, BeforeAfterComparison } from './compare'

export { decodeWav, SUPPORTED_SAMPLE_RATES, MAX_DURATION_S, MIN_DURATION_S } from './wav'
export type { DecodedWav, WavEncoding, ChannelLabel } from './wav'

export { parseFrequencyResponse, parseFrequencyResponseBytes, FR_MIN_HZ, FR_MAX_HZ, FR_MIN_POINTS } from './frequency-response'
export type { FrequencyResponsePoints } from './frequency-response'

export { MeasurementFileError } from './errors'
export type { MeasurementErrorCode, MeasurementWarning } from './errors'

export {
  OCTAVE_RATIO,
  bandEdges,
  octaveBands,
  thirdOctaveBands,
  butterworthBandpass,
  octaveBandFilter,
  class1OctaveLimits,
  CLASS1_OCTAVE_MASK,
  butterworthLowpass,
  sosMagnitude,
  filterSos,
} from './bands'
export type { Band, Biquad } from './bands'

export {
  MIN_DYNAMIC_RANGE_DB,
  EVALUATION_RANGES,
  lundebyTruncation,
  schroederCurveDb,
  fitReverberationTime,
  analyzeDecay,
} from './decay'
export type { DecayFigures, Truncation } from './decay'

export {
  findOnsetIndex,
  energyTimeCurve,
  findReflections,
  inReflectionWindow,
  matchReflections,
  DEFAULT_REFLECTION_WINDOW,
} from './etc'
export type { EnergyTimeCurve, MeasuredReflection, PredictedReflection, ReflectionMatch, ReflectionWindow, ReflectionSearch } from './etc'

export { powerSpectrum, smoothSpectrumDb, smoothedResponse, bandLevelsDb, peaksAndNulls, logFrequencies, SMOOTHING_FRACTIONS } from './spectrum'
export type { PowerSpectrum, SmoothedResponse, SmoothingFraction, SpectralExtremum } from './spectrum'

export { lowFrequencyDecay } from './low-frequency'
export type { LowFrequencyDecay } from './low-frequency'

export { explainLowFrequencyPeaks, describeLowFrequencyFeature, modeName, modeFrequencyTolerance, LOW_FREQUENCY_MATCH_TOLERANCE } from './low-frequency-peaks'
export type { LowFrequencyDiagnosis, LowFrequencyFeature, LowFrequencyCause, LowFrequencyMeasurement, LowFrequencyPeakOptions, SourcedLowFrequencyDiagnosis } from './low-frequency-peaks'
