import { z } from 'zod';
import { AMBIENT_RANGE_C, type ScanConditions } from '../../engine/diagnosis';

/**
 * What the technician knows of the temperatures, given with a diagnosis request: it bounds how plausible a scan
 * temperature (SAE J1979 PID 05 ECT, 0F IAT) is. Never stored: the answer is recomputed on every call.
 */
export const DiagnosisQuery = z.strictObject({
  ambientC: z.coerce
    .number('the air temperature around the vehicle in °C, e.g. 15')
    .min(AMBIENT_RANGE_C.min, `an air temperature of at least ${AMBIENT_RANGE_C.min} °C`)
    .max(AMBIENT_RANGE_C.max, `an air temperature of at most ${AMBIENT_RANGE_C.max} °C`)
    .optional()
    .describe('the air temperature around the vehicle, °C: a key-on scan temperature far below it (or, cold-soaked, far from it) is flagged'),
  coldSoaked: z
    .enum(['true', 'false'], 'true or false')
    .transform((v) => v === 'true')
    .optional()
    .describe('true: the engine has stood long enough (overnight) to reach the air temperature'),
});
export type DiagnosisQuery = z.output<typeof DiagnosisQuery>;

/** The engine's conditions from the query (only what was given). */
export function conditionsOf(query: DiagnosisQuery | undefined): ScanConditions | undefined {
  if (!query || (query.ambientC === undefined && query.coldSoaked === undefined)) return undefined;
  return { ...(query.ambientC === undefined ? {} : { ambientC: query.ambientC }), ...(query.coldSoaked === undefined ? {} : { coldSoaked: query.coldSoaked }) };
}
