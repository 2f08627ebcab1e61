export {
  decodeDtcBytes,
  type DecodeDtcResult,
  DTC_SYSTEM_LETTERS,
  type DtcScope,
  type DtcSystem,
  type DtcSystemLetter,
  encodeDtc,
  type EncodeDtcResult,
  parseDtc,
  type ParseDtcResult,
  scopeOf,
  systemOf,
} from './dtc';
export {
  type CircuitGroup,
  GENERIC_MEANINGS,
  type GenericMeaning,
  genericMeaning,
  isReferenceVoltageCode,
} from './generic-meanings';
export {
  buildCodeTable,
  CODE_SENSORS,
  CODE_TABLE,
  CODE_WINDOWS,
  codeRow,
  type CodeRow,
  type CodeSensor,
  type CodeWindow,
  FAILURE_TYPES,
  type FailureType,
  failureWords,
  type Monitor,
  OUT_OF_SPAN,
  windowsOf,
} from './code-table';
export { codeMayConcern, codeSensorOf, type CodeSensorMatch } from './sensor-terms';
export { type Finding, parseBytes, type ParseBytesResult } from './raw-bytes';
