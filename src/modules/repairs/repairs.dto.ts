import { z } from 'zod';
import { LIMITS } from '../../common/limits';
import { IsoTime, lineText, optionalLineText, optionalText, text } from '../../common/validation/domain-schemas';
import { typedInteger } from '../../common/validation/typed-number';

export const CIRCUIT_PARTS = ['reference', 'signal', 'ground', 'sensor', 'module', 'connector', 'other'] as const;

const T = LIMITS.text;

export const RecordRepair = z
  .strictObject({
    circuitId: z.uuid().optional().describe('the circuit repaired, when the repair was on one'),
    part: z.enum(CIRCUIT_PARTS).describe('which part of the circuit: readings taken before the repair on this part stop counting'),
    action: text(T.repairAction).describe('what was done, e.g. "Spliced the signal wire with a sealed crimp sleeve"'),
    location: optionalLineText(T.repairLocation).default('').describe('where on the circuit, e.g. "signal wire 15 cm from the sensor connector"'),
    parts: z
      .array(
        z.strictObject({
          name: lineText(T.partName),
          number: optionalLineText(T.partNumber).optional(),
          quantity: typedInteger(1, LIMITS.number.partQuantity, '2').default(1),
        }),
      )
      .max(LIMITS.count.partsPerRepair, `at most ${LIMITS.count.partsPerRepair} parts`)
      .default([]),
    note: optionalText(T.repairNote).default(''),
    clockOnAt: IsoTime.optional().describe('labour: when the technician clocked on to this repair'),
    clockOffAt: IsoTime.optional().describe('labour: when they clocked off'),
    labourMinutes: z.number().int().min(0).max(LIMITS.number.labourMinutes).optional().describe('labour time as entered, in minutes (else the time between clock-on and clock-off)'),
  })
  .superRefine((r, ctx) => {
    if (r.clockOnAt && r.clockOffAt && Date.parse(r.clockOffAt) < Date.parse(r.clockOnAt)) {
      ctx.addIssue({ code: 'custom', path: ['clockOffAt'], message: 'clock-off comes after clock-on' });
    }
    if (r.clockOnAt && r.clockOffAt && Date.parse(r.clockOffAt) - Date.parse(r.clockOnAt) > LIMITS.number.labourMinutes * 60_000) {
      ctx.addIssue({ code: 'custom', path: ['clockOffAt'], message: `at most ${LIMITS.number.labourMinutes / 60} hours after clock-on` });
    }
  });
export type RecordRepair = z.output<typeof RecordRepair>;
