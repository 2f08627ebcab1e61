export {
  CHECK_DIGIT_POSITION,
  type CheckDigitResult,
  computeCheckDigit,
  type Finding,
  VIN_LENGTH,
  VIN_TRANSLITERATION,
  VIN_WEIGHTS,
  withCheckDigit,
  type WithCheckDigitResult,
} from './check-digit';
export { checkVin, type CheckVinOptions, type CheckVinResult, MODEL_YEAR_CODES, modelYearsFor } from './check-vin';
