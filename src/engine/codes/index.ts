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
export { type Finding, parseBytes, type ParseBytesResult } from './raw-bytes';
