/**
 * Numbers with units, the API's one convention: a plain JSON number in the unit its field name carries
 * (`…Volts` in V, `…Ohms` in Ω, `…Kpa` in kPa, `…InHg` in inches of mercury, `…C` in °C, `…Amps` in A).
 * Only the pressure unit conversion takes `{ value, unit }`, because converting the unit is its job.
 */
import { z } from 'zod';

export const UNITS_CONVENTION =
  'Values are plain numbers in the unit their field name carries: …Volts in V, …Ohms in Ω, …Kpa in kPa, …InHg in inches of mercury (conventional, NIST SP 811), …C in °C, …Amps in A.';

export const volts = (what: string) => z.number().min(-100, `${what}: at least −100 V`).max(100, `${what}: at most 100 V`).describe(`${what}, V`);

/** A resistance that may be 0 Ω (a wire, a contact), never negative. */
export const ohms = (what: string) =>
  z.number().min(0, `${what} cannot be negative: a resistance of 0 Ω or more`).max(1e12, `${what}: at most 1e12 Ω`).describe(`${what}, Ω`);

/** A resistance that must be above 0 Ω (a meter input, a load, a pull-up). */
export const positiveOhms = (what: string) =>
  z.number().positive(`${what} must be above 0 Ω`).max(1e12, `${what}: at most 1e12 Ω`).describe(`${what}, Ω`);

export const kpa = (what: string) => z.number().min(-1e5).max(1e5, `${what}: at most 100 000 kPa`).describe(`${what}, kPa`);
