import { z } from 'zod';
import { LIMITS } from '../../common/limits';
import { checkReading } from '../../engine/units';
import { IsoTime, MeasurementRequestFields, optionalText, PhaseEnum, refineRequest } from '../../common/validation/domain-schemas';

/** Readings beyond these are typing slips, not sensor-circuit readings (common practice, no source). */
const SI_LIMIT: Partial<Record<string, { max: number; what: string }>> = {
  V: { max: 100, what: 'voltage on a 12 V or 24 V vehicle circuit' },
  Ω: { max: 1e9, what: 'resistance a workshop meter reads' },
  A: { max: 1000, what: 'current on a sensor circuit' },
  Pa: { max: 1e7, what: 'pressure a sensor reports' },
  '°C': { max: 1000, what: 'temperature a sensor reports' },
  rpm: { max: 20000, what: 'engine speed' },
  '%': { max: 1000, what: 'percentage' },
};

export const MeasurementInput = z
  .strictObject({
    circuitId: z.uuid(),
    ...MeasurementRequestFields,
    value: z
      .union([z.number(), z.literal('OL')], { error: 'a number as the meter shows it, or "OL" when it shows over-range' })
      .describe('the reading as shown on the meter, or "OL" when it showed over-range (e.g. ohms across an open)'),
    unit: z.string().max(16),
    meterOhms: z.number().positive('a meter input resistance above 0 Ω').max(1e12).default(10_000_000),
    phase: PhaseEnum.default('diagnosis'),
    note: optionalText(LIMITS.text.readingNote).default(''),
    supersedes: z.uuid().optional().describe('id of the reading this one corrects'),
    clientKey: z
      .string()
      .min(8)
      .max(64)
      .regex(/^[A-Za-z0-9_-]+$/, 'letters, digits, "-" and "_"')
      .optional()
      .describe('chosen by the client per reading: sending the same key again returns the stored reading instead of a second one'),
    takenAt: IsoTime.optional(),
  })
  .superRefine((m, ctx) => {
    refineRequest(m, ctx);
    if (m.takenAt && Date.parse(m.takenAt) > Date.now() + 5 * 60_000) {
      ctx.addIssue({ code: 'custom', path: ['takenAt'], message: 'a reading cannot be taken in the future' });
    }
  })
  .transform((m, ctx) => {
    if (m.value === 'OL') {
      if (m.quantity === 'scan_value') {
        ctx.addIssue({ code: 'custom', path: ['value'], message: 'a scan value is a number; "OL" is for meter readings' });
        return z.NEVER;
      }
      // Check the unit all the same: an over-range ohms reading still has to be in ohms.
      const unitOnly = checkReading(0, m.unit, m.quantity);
      if (!unitOnly.ok) {
        for (const f of unitOnly.findings) ctx.addIssue({ code: 'custom', path: [f.path], message: f.message });
        return z.NEVER;
      }
      return { ...m, value: null, overload: true, unit: unitOnly.unit, valueSi: null, siUnit: unitOnly.siUnit };
    }
    const reading = checkReading(m.value, m.unit, m.quantity);
    const limit = reading.ok ? SI_LIMIT[reading.siUnit] : undefined;
    if (reading.ok && limit !== undefined && Math.abs(reading.siValue) > limit.max) {
      ctx.addIssue({ code: 'custom', path: ['value'], message: `${m.value} ${reading.unit} is beyond any ${limit.what} (at most ${limit.max} ${reading.siUnit}); check the decimal point` });
      return z.NEVER;
    }
    if (!reading.ok) {
      for (const f of reading.findings) ctx.addIssue({ code: 'custom', path: [f.path], message: f.message });
      return z.NEVER;
    }
    return { ...m, value: m.value as number | null, overload: false, unit: reading.unit, valueSi: reading.siValue as number | null, siUnit: reading.siUnit };
  });
export type MeasurementInput = z.output<typeof MeasurementInput>;

export const MeasurementBatch = z.array(MeasurementInput).min(1, 'at least one reading').max(500, 'at most 500 readings in one batch');

/** For the OpenAPI document: one reading, or a batch stored all-or-nothing. */
export const MeasurementBody = z.union([MeasurementInput, MeasurementBatch]);

export const RecordOptions = z.strictObject({
  diagnosis: z
    .enum(['true', 'false'])
    .transform((v) => v === 'true')
    .default(false)
    .describe('true: the answer also carries `diagnoses`, the diagnosis of each circuit the readings are on, recomputed with them'),
});
export type RecordOptions = z.output<typeof RecordOptions>;

export const ListMeasurements = z.strictObject({
  circuitId: z.uuid().optional(),
  phase: PhaseEnum.optional(),
  includeSuperseded: z
    .enum(['true', 'false'])
    .transform((v) => v === 'true')
    .default(false),
});
export type ListMeasurements = z.output<typeof ListMeasurements>;
