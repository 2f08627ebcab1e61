/**
 * Response schemas for the OpenAPI document, one per kind of answer, and the `ZResponse` decorator that records them.
 * They name the fields a client relies on; answers may carry more (objects are open), so adding a field never
 * breaks them. The error body every endpoint can answer with is added to each operation in `create-app.ts`.
 */
import { ApiProduces, ApiResponse, type OpenAPIObject } from '@nestjs/swagger';
import { z, type ZodType } from 'zod';
import { openApiSchema } from '../validation/zod-input';

const id = z.uuid();
const time = z.iso.datetime({ offset: true });
const person = z.looseObject({ id, name: z.string() });
const finding = z.looseObject({ code: z.string(), path: z.string(), message: z.string() });
const list = <T extends ZodType>(item: T) => z.looseObject({ items: z.array(item) });
const paged = <T extends ZodType>(item: T) => z.looseObject({ items: z.array(item), page: z.number().int(), pageSize: z.number().int(), total: z.number().int() });

export const ErrorBody = z.strictObject({
  error: z.looseObject({
    code: z.string().describe('stable code, e.g. invalid_input, repair_order.not_found'),
    message: z.string().describe('in plain words, naming the field'),
    requestId: z.string().optional(),
    findings: z.array(finding).optional().describe('one per refused field: its path and what was expected'),
  }),
});

const request = z.looseObject({
  quantity: z.enum(['dc_volts', 'ohms', 'amps', 'scan_value']),
  at: z.string(),
  against: z.string().optional(),
  location: z.string(),
  connector: z.string(),
  key: z.string(),
  engine: z.string(),
  jumpers: z.array(z.looseObject({})),
});

export const RepairOrder = z.looseObject({
  id,
  number: z.string(),
  status: z.enum(['open', 'diagnosing', 'repaired', 'verified', 'closed']),
  version: z.number().int(),
  complaint: z.string(),
  codes: z.array(z.string()),
  odometerIn: z.number().int().nullable(),
  vehicle: z.looseObject({ id, vin: z.string(), checkDigit: z.string(), year: z.number().int(), make: z.string(), model: z.string() }),
  technician: person.nullable(),
  createdBy: person,
  dates: z.looseObject({ opened: time, repaired: time.nullable(), verified: time.nullable(), closed: time.nullable() }),
  circuits: z.array(z.looseObject({ id, label: z.string(), kind: z.string() })),
  warnings: z.array(finding).optional().describe('new orders only: the model year against the VIN and the vehicle on file'),
});
export const RepairOrderList = paged(z.looseObject({ id, number: z.string(), status: z.string() }));

export const Circuit = z.looseObject({ id, label: z.string(), sensor: z.string(), kind: z.string(), cavities: z.record(z.string(), z.string()).nullable() });
export const CircuitList = list(Circuit);

export const Measurement = z.looseObject({
  id,
  circuitId: id,
  request,
  value: z.looseObject({ entered: z.union([z.number(), z.literal('OL')]).nullable(), unit: z.string(), si: z.number().nullable(), siUnit: z.string(), overload: z.boolean() }),
  phase: z.enum(['diagnosis', 'verification']),
  takenAt: time,
  takenBy: person,
});
export const MeasurementList = list(Measurement);

const ranked = z.looseObject({ id: z.string(), label: z.string(), part: z.string(), probability: z.number().min(0).max(1) });
export const Diagnosis = z.looseObject({
  tree: z.looseObject({ id: z.string(), version: z.string(), title: z.string() }),
  status: z.enum(['testing', 'concluded', 'recheck', 'crank_and_reread', 'exhausted']),
  ranked: z.array(ranked),
  nextTest: z.looseObject({ id: z.string(), label: z.string(), request }).nullable(),
  path: z.array(z.looseObject({ readingId: z.string(), verdict: z.string() })),
  conclusion: z.looseObject({ hypothesisId: z.string(), label: z.string(), probability: z.number(), repair: z.looseObject({ part: z.string(), action: z.string() }) }).nullable(),
  codesWeighed: z.array(z.looseObject({ code: z.string(), meaning: z.string(), weighed: z.boolean(), effect: z.string(), window: z.string().optional() })).optional(),
  comparisons: z
    .array(z.looseObject({ testId: z.string(), testLabel: z.string(), unit: z.string(), difference: z.number().nullable(), verdict: z.enum(['counted', 'indeterminate', 'unpaired']), note: z.string() }))
    .optional()
    .describe('comparison tests: both readings (first − second), their difference and outcome, or what each still waits for'),
  findings: z.array(finding),
});
export const ReferenceGroup = z.looseObject({ id, repairOrderId: id, circuitIds: z.array(id), source: z.enum(['technician', 'wire_identification']), note: z.string(), createdBy: person, createdAt: time });
export const ReferenceGroupList = list(ReferenceGroup);
export const ReferenceGroupCleared = z.strictObject({ id, cleared: z.literal(true) });
const circuitSummary = z.looseObject({
  circuitId: id,
  label: z.string(),
  kind: z.string(),
  referenceGroupId: id.nullable(),
  status: z.enum(['testing', 'concluded', 'recheck', 'crank_and_reread', 'exhausted']),
  leading: ranked.nullable(),
  pointsAtReference: z.boolean(),
});
const orderCause = ranked.extend({ circuitId: id.nullable(), referenceGroupId: id.nullable() });
export const OrderDiagnosis = z.looseObject({
  repairOrderId: id,
  circuits: z.array(circuitSummary),
  referenceGroups: z.array(
    z.looseObject({
      id,
      circuitIds: z.array(id),
      active: z.boolean(),
      why: z.array(z.string()),
      diagnosis: Diagnosis,
    }),
  ),
  leadingCauses: z.array(orderCause),
  nextTest: z
    .looseObject({
      id: z.string(),
      label: z.string(),
      request,
      circuitId: id,
      referenceGroupId: id.nullable(),
      procedure: z.array(z.string()),
      cautions: z.array(z.object({ id: z.string(), text: z.string() })).describe("the test's cautions with those of the circuit's sensor and the vehicle (a high-voltage system first)"),
    })
    .nullable(),
  findings: z.array(finding),
});
export const MeasurementAnswer = z.union([
  Measurement,
  z.looseObject({ items: z.array(Measurement) }),
  z.looseObject({ diagnoses: z.array(Diagnosis.extend({ circuitId: id })) }),
]);

export const Repair = z.looseObject({ id, part: z.string(), action: z.string(), location: z.string(), parts: z.array(z.looseObject({ name: z.string(), quantity: z.number().int() })), by: person, at: time });
export const RepairList = list(Repair);
export const Review = z.looseObject({ id, decision: z.enum(['approved', 'returned', 'withdrawn']), comment: z.string(), by: person, at: time });
export const ReviewList = z.looseObject({ items: z.array(Review), latest: Review.nullable() });

const treeSummary = z.looseObject({ treeId: z.string(), version: z.string(), circuitKind: z.string(), label: z.string() });
export const FaultTree = treeSummary.extend({ id, document: z.looseObject({}) });
export const FaultTreeUpload = z.looseObject({ tree: z.looseObject({ id }), created: z.boolean(), warnings: z.array(finding) });
export const FaultTreeList = z.looseObject({ builtIn: z.array(treeSummary), shop: z.array(z.looseObject({})) });
export const AuditList = list(z.looseObject({ at: time, action: z.string() }));
export const ProofCheck = z.looseObject({
  digest: z.string().nullable().optional(),
  known: z.boolean().describe('whether this shop issued a document with this digest (or these bytes)'),
  matches: z.boolean().optional().describe('whether the repair order’s evidence still matches it'),
  message: z.string().optional(),
  changes: z.array(z.looseObject({ code: z.string(), message: z.string() })).optional(),
});

export const SignedIn = z.looseObject({ token: z.string().optional(), tokenType: z.literal('Bearer').optional(), expiresAt: time, user: z.looseObject({ userId: id, role: z.string() }) });
export const SignedOut = z.strictObject({ signedOut: z.literal(true) });
export const Me = z.looseObject({ user: z.looseObject({ userId: id, shopId: id, name: z.string(), role: z.string() }), shop: z.looseObject({ id, name: z.string() }).nullable() });
export const User = z.looseObject({ id, name: z.string(), email: z.string(), role: z.enum(['technician', 'foreman', 'admin']), active: z.boolean() });
export const UserList = list(User);
export const Health = z.looseObject({ status: z.enum(['ok', 'migrations_pending']), database: z.looseObject({ kind: z.string() }) });
export const VinCheck = z.union([
  z.looseObject({ ok: z.literal(true), vin: z.string(), checkDigit: z.enum(['valid', 'not_applicable']), modelYearCandidates: z.array(z.number().int()).optional(), onFile: z.looseObject({ year: z.number().int(), make: z.string(), model: z.string() }).nullable() }),
  z.looseObject({ ok: z.literal(false), findings: z.array(finding) }),
]);
/** A calculator's or the circuit model's answer: its figures, with the findings that qualify them. */
export const EngineAnswer = z.looseObject({ findings: z.array(finding).optional() });
export const WireRoles = z.looseObject({
  circuitKind: z.string(),
  cavities: z.array(z.looseObject({ cavity: z.string(), role: z.string(), probabilities: z.record(z.string(), z.number()), reason: z.string() })),
  next: z.looseObject({ instruction: z.string() }).nullable().optional(),
});

/** Records the JSON answer of a route (200 unless the route answers 201). */
export const ShopSettings = z.looseObject({ id, name: z.string(), paperSize: z.enum(['A4', 'Letter']), timeZone: z.string(), publicProofCheck: z.boolean() });
export const OrderNumbering = z.looseObject({ prefix: z.string(), width: z.number().int(), nextNumber: z.string() });
export const Approval = z.looseObject({
  state: z.enum(['none', 'approved', 'stale', 'returned', 'withdrawn']),
  decision: z.looseObject({ id, decision: z.string(), by: person, at: time, comment: z.string() }).nullable(),
  evidenceDigest: z.string().nullable(),
  currentEvidenceDigest: z.string(),
});
export const Verification = z.looseObject({
  complete: z.boolean(),
  toMeasure: z.array(z.looseObject({ circuitId: id, readingId: id, testId: z.string() })),
  codesReturned: z.array(z.looseObject({ code: z.string(), meaning: z.string(), circuitId: id, circuit: z.string() })),
});

export function ZResponse(schema: ZodType, status = 200, description = 'the answer'): MethodDecorator {
  return ApiResponse({ status, description, schema: openApiSchema(schema) as never });
}

/** A route that answers a PDF. */
export function PdfResponse(description: string): MethodDecorator {
  return (target, key, descriptor) => {
    ApiProduces('application/pdf')(target, key, descriptor);
    ApiResponse({ status: 200, description, content: { 'application/pdf': { schema: { type: 'string', format: 'binary' } } } })(target, key, descriptor);
  };
}

/** The error answer on every operation of the document (set where the document is built). */
export function withErrorResponses(document: OpenAPIObject): void {
  const schema = openApiSchema(ErrorBody);
  for (const item of Object.values(document.paths)) {
    for (const operation of Object.values(item as Record<string, { responses?: Record<string, unknown> }>)) {
      if (!operation || typeof operation !== 'object' || !('responses' in operation) || !operation.responses) continue;
      operation.responses.default ??= { description: 'refused or failed: the error code, a message in plain words and, for bad input, the findings', content: { 'application/json': { schema } } };
    }
  }
}
