import { z } from 'zod';
import { optionalText, text } from '../../common/validation/domain-schemas';
import { typedInteger } from '../../common/validation/typed-number';

export const CIRCUIT_PARTS = ['reference', 'signal', 'ground', 'sensor', 'module', 'connector', 'other'] as const;

export const RecordRepair = z.strictObject({
  circuitId: z.uuid().optional().describe('the circuit repaired, when the repair was on one'),
  part: z.enum(CIRCUIT_PARTS).describe('which part of the circuit: readings taken before the repair on this part stop counting'),
  action: text(500).describe('what was done, e.g. "Spliced the signal wire with a sealed crimp sleeve"'),
  location: optionalText(300).default('').describe('where on the circuit, e.g. "signal wire 15 cm from the sensor connector"'),
  parts: z
    .array(
      z.strictObject({
        name: text(120),
        number: optionalText(60).optional(),
        quantity: typedInteger(1, 999, '2').default(1),
      }),
    )
    .max(30, 'at most 30 parts')
    .default([]),
  note: optionalText(2000).default(''),
});
export type RecordRepair = z.output<typeof RecordRepair>;
