/**
 * The DC circuit model of 5 V three-wire sensor circuits and two-wire thermistor circuits.
 *
 * - `defaultCircuit(kind, options?)` → a typical healthy `CircuitSpec` (tagged data).
 * - `predictReading(circuit, faults, request, meter?)` → `{ ok: true, value, unit, overload? } | { ok: false, findings }`.
 * - `sampleReadings({ circuit, faults, request, samples, seed, spreads?, meter? })` → sorted `values` and
 *   `percentiles` (plus `ok`/`unit`), deterministic per seed.
 * - `bandProbabilities(values, bands)` → share per band id plus `other`.
 * - `bandTable({ circuit, request, bands, hypotheses, samples, seed })` → the likelihood rows for a fault tree.
 * - `faultsFor(hypothesisId)` → the `FaultSpec[]` realising a hypothesis; `causeAlternatives(id)` the weighted lists.
 * - `adcReading(volts)` → what the module's converter reports (clamped to 0…5 V, 10-bit).
 * - `circuitNetlist(...)` + `toSpice(netlist)` → the exact netlist the solver uses, as SPICE text.
 */
export { type Finding } from '../calc/findings';
export {
  WIRE_ROLES,
  SENSOR_INTERNAL_VARIANTS,
  MODULE_INTERNAL_VARIANTS,
  type WireRole,
  type WireSpec,
  type BiasSpec,
  type BatterySpec,
  type RegulatorSpec,
  type ModuleSpec,
  type PotentiometerSpec,
  type PressureSpec,
  type ThermistorSpec,
  type ThermistorModel,
  type SensorSpec,
  type SensorKind,
  type CircuitSpec,
  type FaultSpec,
  type FaultKind,
  type SensorInternalVariant,
  type ModuleInternalVariant,
  type MeterSpec,
  type MeterAccuracy,
  type ReadingUnit,
} from './types';
export { defaultCircuit, meterWith, DEFAULT_METER, GENERIC_10K_STEINHART_HART, type DefaultCircuitOptions } from './defaults';
export { faultsFor, causeAlternatives, HYPOTHESIS_IDS, HEALTHY_IDS, type HypothesisId, type CauseAlternative } from './hypotheses';
export { adcReading, ADC_STEP_VOLTS, MODULE_ADC } from './adc';
export { FAULT_DEFAULT_OHMS, validateFaults } from './faults';
export { validateCircuit, validateMeter, validateRequest, CIRCUIT_LAYOUTS } from './validate';
export { predictReading, prepareReading, circuitNetlist, type PredictedReading, type PreparedReading } from './predict';
export { scanReadout, OTHER_SENSOR_TOLERANCE, type ScanReadout } from './scan-readout';
export { sampleReadings, sampleDifferences, defaultSpreads, percentile, type Spreads, type Percentiles, type SampleInput, type SampleResult, type DifferenceInput } from './monte-carlo';
export { bandProbabilities, bandTable, validateBands, OTHER_BAND, type Band, type BandRow, type BandTableInput } from './bands';
export { toSpice, parseSpiceNodeVoltages, type SpiceOptions } from './spice';
export { Netlist, CompiledNetlist, LEAK_OHMS, GROUND_NODE, solveNodeVoltages, type Element, type ElementKind } from './netlist';
export { mulberry32, type Random } from './prng';
export { OHMS_POWERED_LIMIT_VOLTS, FUSED_JUMPER_OHMS } from './measure';
export { pressureFraction, thermistorOhms } from './sensors';
export {
  defaultSharedReference,
  defaultSharedSpreads,
  predictSharedReading,
  sampleSharedReadings,
  sharedEvaluator,
  sharedNetlist,
  sharedNode,
  validateShared,
  type SharedFault,
  type SharedReferenceSpec,
  type SharedRequest,
  type SharedSensorSpec,
  type SharedSpreads,
  type Severity,
} from './shared-reference';
export { THERMISTOR_CURVES, THERMISTOR_BIASES, THERMISTOR_PAIRINGS, thermistorCurve, thermistorBias, biasAt, type ThermistorCurve, type ThermistorBias } from './thermistor-curves';
