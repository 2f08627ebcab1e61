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
import { LIMITS } from '../common/limits';
import { CAUTION_CODES, CODE_CHECK_METHODS, DECISIONS, DTC_STATUSES, PROOF_FORMAT, VIN_CHECKS } from './view';

// Text the people of the shop wrote is bounded by the same limits as the API that took it (src/common/limits.ts);
// text derived from a fault tree or the engine is bounded by nothing but sense: the layout flows any length.
const text = (max = Number.MAX_SAFE_INTEGER) =>
  z.string().min(1).max(max).refine((s) => !hasLoneSurrogate(s), 'lone surrogate (not valid Unicode text)')
    .refine((s) => s.trim().length > 0, 'blank text');
const T = LIMITS.text;
const name = text(T.personName);
const derived = text();
const note = text(T.readingNote);
const id = z.string().min(1).regex(/^[A-Za-z0-9._:-]+$/, 'letters, digits and . _ : - only');
const digestHex = z.string().regex(/^[0-9a-f]{64}$/, '64 lower-case hexadecimal characters');
// ISO 8601 with an explicit offset, minute precision or finer.
const time = z.iso.datetime({ offset: true, local: false });
const finite = z.number().refine(Number.isFinite, 'finite number');

const person = z.strictObject({ name, id: z.string().min(1).max(64).optional() });

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
  reason: note,
});

const step = z.strictObject({
  id,
  seq: z.number().int().positive(),
  circuitId: id,
  title: derived,
  request,
  reading,
  expected: expected.nullable(),
  outcome: z.strictObject({ code: id, label: derived }),
  takenAt: time,
  takenBy: name,
  superseded: z.array(superseded),
  note: note.optional(),
});

const check = z.strictObject({
  id,
  seq: z.number().int().positive(),
  circuitId: id,
  repeatsStepId: id.nullable(),
  title: derived,
  request,
  before: reading.nullable(),
  after: reading,
  expected: expected.nullable(),
  pass: z.boolean().nullable(),
  provesFix: z.boolean(),
  takenAt: time,
  takenBy: name,
  superseded: z.array(superseded),
  note: note.optional(),
});

const troubleCode = z.strictObject({
  code: z.string().regex(/^[PCBU][0-3][0-9A-F]{3}$/, 'SAE J2012 form, e.g. P0122'),
  description: derived,
  status: z.enum(DTC_STATUSES),
});

const candidate = z.strictObject({ code: id, label: derived, probability: finite.refine((p) => p >= 0 && p <= 1, 'between 0 and 1') });

export const proofViewSchema = z.strictObject({
  format: z.literal(PROOF_FORMAT),
  shop: z.strictObject({
    name: text(T.shopName),
    addressLines: z.array(text(T.shopAddressLine)).max(4),
    phone: text(40).optional(),
    timeZone: z.string().min(1).max(64),
  }),
  repairOrder: z.strictObject({
    number: text(T.orderNumber),
    openedAt: time,
    repairedAt: time.nullable(),
    verifiedAt: time.nullable(),
  }),
  technician: person.nullable(),
  foreman: person.nullable(),
  vehicle: z.strictObject({
    vin: z.string().regex(/^[A-HJ-NPR-Z0-9]{17}$/, '17 characters: digits and upper-case letters except I, O, Q'),
    vinCheck: z.enum(VIN_CHECKS),
    year: z.number().int().min(1981).max(2100),
    make: text(T.vehicleMake),
    model: text(T.vehicleModel),
    engine: derived,
    odometer: z.strictObject({
      in: finite.refine((v) => v >= 0, 'not negative'),
      out: finite.refine((v) => v >= 0, 'not negative').nullable(),
      unit: z.enum(['km', 'mi']),
    }),
  }),
  concern: z.strictObject({ complaint: text(T.complaint), cause: text(T.cause), correction: text(T.correction) }),
  troubleCodes: z.strictObject({
    found: z.array(troubleCode).max(LIMITS.count.codes),
    afterRepair: z.strictObject({
      check: z
        .strictObject({
          method: z.enum(CODE_CHECK_METHODS),
          keyCycles: z.number().int().min(0).max(LIMITS.number.keyCycles).nullable(),
          checkedAt: time,
          note: text(T.codesAfterNote).optional(),
        })
        .nullable(),
      codes: z.array(troubleCode).max(LIMITS.count.codes),
    }),
  }),
  circuits: z.array(z.strictObject({ id, name: text(T.circuitLabel), kind: z.enum(CIRCUIT_UNDER_TEST_KINDS) })).min(1),
  diagnosis: z.array(step),
  causes: z.array(
    z.strictObject({
      circuitId: id,
      proven: z.boolean(),
      cause: candidate.nullable(),
      leading: z.array(candidate),
      decidingStepIds: z.array(id),
      advice: derived.optional(),
    }),
  ),
  repairs: z.array(
    z.strictObject({
      circuitId: id.nullable(),
      labour: z.strictObject({
        clockOnAt: time.nullable(),
        clockOffAt: time.nullable(),
        minutes: z.number().int().min(0).max(LIMITS.number.labourMinutes).nullable(),
      }),
      action: text(T.repairAction),
      location: text(T.repairLocation + 20),
      parts: z
        .array(z.strictObject({ number: text(T.partNumber).optional(), description: text(T.partName), quantity: z.number().positive().max(LIMITS.number.partQuantity) }))
        .max(LIMITS.count.partsPerRepair),
      by: name,
      at: time,
      note: text(T.repairNote).optional(),
    }),
  ),
  verification: z.array(check),
  signOff: z.strictObject({
    technicianSignedAt: time.nullable(),
    foremanSignedAt: time.nullable(),
    decisions: z.array(
      z.strictObject({ decision: z.enum(DECISIONS), by: name, at: time, comment: text(T.reviewComment).optional(), evidenceDigest: digestHex.optional() }),
    ),
  }),
  cautions: z.array(z.enum(CAUTION_CODES)).max(CAUTION_CODES.length),
});
