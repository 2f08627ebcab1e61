import { z } from 'zod';
import { LIMITS } from '../../common/limits';
import { optionalText } from '../../common/validation/domain-schemas';
import { SHARED_REFERENCE_SENSORS } from '../../engine/diagnosis';

export const REFERENCE_GROUP_SOURCES = ['technician', 'wire_identification'] as const;

export const CreateReferenceGroup = z
  .strictObject({
    circuitIds: z
      .array(z.uuid())
      .min(SHARED_REFERENCE_SENSORS.min, `at least ${SHARED_REFERENCE_SENSORS.min} circuits share a reference`)
      .max(SHARED_REFERENCE_SENSORS.max, `at most ${SHARED_REFERENCE_SENSORS.max} circuits on one reference`)
      .describe('the three-wire 5 V circuits fed by one module 5 V reference; the first is where "all unplugged" readings are taken'),
    source: z.enum(REFERENCE_GROUP_SOURCES).default('technician').describe('who says they share it: the technician, or wire identification'),
    note: optionalText(LIMITS.text.referenceGroupNote).default('').describe('e.g. "one reference pin feeds TP, MAP and FTP per the wiring diagram"'),
  })
  .superRefine((g, ctx) => {
    g.circuitIds.forEach((id, i) => {
      const first = g.circuitIds.indexOf(id);
      if (first < i) ctx.addIssue({ code: 'custom', path: ['circuitIds', i], message: `circuit ${id} is listed twice (also at circuitIds[${first}])` });
    });
  });
export type CreateReferenceGroup = z.output<typeof CreateReferenceGroup>;
