/** Hand arithmetic of the sensor-circuit trade as pure functions; each validates its input into coded findings. */
export { type Finding, type Result, finding, joinPath } from './findings';
export {
  type MeterLoadingInput,
  type LoadedReadingInput,
  meterReading,
  sourceOhmsFromLoadedReading,
  sourceOhmsFromTwoLoads,
  biasOhmsFromReading,
  resistancesAgree,
  parallelOhms,
} from './meter-loading';
export {
  type ReferenceLimits,
  type ReferenceRecovery,
  type ReferenceUnderLoad,
  type Verdict,
  DEFAULT_REFERENCE_LIMITS,
  DEFAULT_GROUND_DROP_LIMIT_VOLTS,
  referenceUnderLoad,
  referenceVerdict,
  voltageDropVerdict,
  resistanceFromDrop,
} from './reference-check';
export {
  type SteinhartHartCoefficients,
  type BetaCoefficients,
  type DividerInput,
  KELVIN_OFFSET,
  steinhartHartTemperature,
  steinhartHartResistance,
  betaResistance,
  betaTemperature,
  thermistorDividerVolts,
  thermistorOhmsFromDivider,
} from './thermistor';
export {
  type ChartModel,
  type ChartComparison,
  type ChartComparisonInput,
  type ChartVerdict,
  CHART_TEMPERATURE_RANGE_C,
  DEFAULT_CHART_TOLERANCE_PERCENT,
  DEFAULT_TEMPERATURE_SPREAD_C,
  compareWithChart,
} from './thermistor-chart';
export {
  type CalibrationPoint,
  type LinearSensor,
  linearSensor,
  vacuumInHgToAbsoluteKpa,
  absoluteKpaToVacuumInHg,
  mapAgainstBaroKoeo,
  MAP_BARO_AGREE_KPA,
  type MapBaroCheck,
} from './pressure';
