/**
 * Shape of the view (zod). Strict objects: an unknown key would be digested but never printed, so it is refused.
 * No defaults or transforms: the parsed value is the input, so the digest of either is the same.
 */
import { z } from 'zod';
import { MeasurementRequestSchema } from '../engine/request-schema';
import {
  CIRCUIT_UNDER_TEST_KINDS, CONNECTOR_STATES, ENGINE_STATES, KEY_STATES, LOCATIONS, POINTS, QUANTITIES,
} from '../engine/vocabulary';
import { hasLoneSurrogate } from './digest';
import { CAUTION_CODES, DECISIONS, DTC_STATUSES, PROOF_FORMAT, VIN_CHECKS } from './view';

// Limits keep every table row shorter than a page, so rows never have to split.
const text = (max: number) =>
  z.string().min(1).max(max).refine((s) => !hasLoneSurrogate(s), 'lone surrogate (not valid Unicode text)')
    .refine((s) => s.trim().length > 0, 'blank text');
const name = text(120);
const shortText = text(200);
const note = text(1500);
const longText = text(4000);
const id = z.string().min(1).max(80).regex(/^[A-Za-z0-9._:-]+$/, 'letters, digits and . _ : - only');
// ISO 8601 with an explicit offset, minute precision or finer.
const time = z.iso.datetime({ offset: true, local: false });
const finite = z.number().refine(Number.isFinite, 'finite number');

const person = z.strictObject({ name, id: z.string().min(1).max(40).optional() });

const reading = z.strictObject({
  entered: text(40),
  value: finite.nullable(),
  unit: z.string().min(1).max(12),
  si: finite.nullable(),
  siUnit: z.string().min(1).max(12),
});

const expected = z.strictObject({
  min: finite.nullable(),
  max: finite.nullable(),
  unit: z.string().min(1).max(12),
});

const request = MeasurementRequestSchema;

const superseded = z.strictObject({
  reading,
  takenAt: time,
  takenBy: name,
  correctedAt: time,
  correctedBy: name,
  reason: shortText,
});

const step = z.strictObject({
  id,
  seq: z.number().int().positive(),
  circuitId: id,
  title: shortText,
  request,
  reading,
  expected: expected.nullable(),
  outcome: z.strictObject({ code: id, label: shortText }),
  takenAt: time,
  takenBy: name,
  superseded: z.array(superseded).max(6),
  note: note.optional(),
});

const check = z.strictObject({
  id,
  seq: z.number().int().positive(),
  circuitId: id,
  repeatsStepId: id,
  title: shortText,
  request,
  before: reading,
  after: reading,
  expected,
  pass: z.boolean(),
  takenAt: time,
  takenBy: name,
  superseded: z.array(superseded).max(6),
  note: note.optional(),
});

const troubleCode = z.strictObject({
  code: z.string().regex(/^[PCBU][0-3][0-9A-F]{3}$/, 'SAE J2012 form, e.g. P0122'),
  description: shortText,
  status: z.enum(DTC_STATUSES),
});

export const proofViewSchema = z.strictObject({
  format: z.literal(PROOF_FORMAT),
  shop: z.strictObject({ name, addressLines: z.array(shortText).min(1).max(4), phone: text(40).optional() }),
  repairOrder: z.strictObject({
    number: text(40),
    openedAt: time,
    repairedAt: time.nullable(),
    verifiedAt: time.nullable(),
  }),
  technician: person,
  foreman: person,
  vehicle: z.strictObject({
    vin: z.string().regex(/^[A-HJ-NPR-Z0-9]{17}$/, '17 characters: digits and upper-case letters except I, O, Q'),
    vinCheck: z.enum(VIN_CHECKS),
    year: z.number().int().min(1981).max(2100),
    make: name,
    model: name,
    engine: shortText,
    odometer: z.strictObject({ value: finite.refine((v) => v >= 0, 'not negative'), unit: z.enum(['km', 'mi']) }),
  }),
  concern: z.strictObject({ complaint: longText, cause: longText, correction: longText }),
  troubleCodes: z.strictObject({ found: z.array(troubleCode).max(40), afterRepair: z.array(troubleCode).max(40) }),
  circuits: z.array(z.strictObject({ id, name: shortText, kind: z.enum(CIRCUIT_UNDER_TEST_KINDS) })).min(1).max(20),
  diagnosis: z.array(step).max(600),
  rootCause: z
    .strictObject({
      code: id,
      label: shortText,
      probability: finite.refine((p) => p >= 0 && p <= 1, 'between 0 and 1'),
      circuitId: id,
      decidingStepIds: z.array(id).min(1).max(20),
      explanation: note.optional(),
    })
    .nullable(),
  repairs: z
    .array(
      z.strictObject({
        action: shortText,
        location: shortText,
        parts: z.array(z.strictObject({ number: text(40).optional(), description: shortText, quantity: z.number().positive().max(1000) })).max(10),
        by: name,
        at: time,
        note: note.optional(),
      }),
    )
    .max(40),
  verification: z.array(check).max(600),
  signOff: z.strictObject({
    technicianSignedAt: time.nullable(),
    foremanSignedAt: time.nullable(),
    decisions: z
      .array(z.strictObject({ decision: z.enum(DECISIONS), by: name, at: time, comment: note.optional() }))
      .max(20),
  }),
  cautions: z.array(z.enum(CAUTION_CODES)).max(CAUTION_CODES.length),
});
