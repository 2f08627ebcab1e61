/**
 * Zod schemas for the domain's own formats, delegating the checks to the framework-free engine so that the
 * rule lives in one place and the HTTP layer only reports it (with the engine's message) at the right path.
 */
import { z } from 'zod';
import { parseDtc } from '../../engine/codes';
import {
  CAVITY_ROLES,
  CIRCUIT_KINDS,
  CIRCUIT_UNDER_TEST_KINDS,
  CONNECTOR_STATES,
  ENGINE_STATES,
  KEY_STATES,
  LOCATIONS,
  PHASES,
  POINTS,
  QUANTITIES,
} from '../../engine/vocabulary';

export const TroubleCode = z.string().transform((text, ctx) => {
  const parsed = parseDtc(text);
  if (parsed.ok) return parsed.code;
  for (const f of parsed.findings) ctx.addIssue({ code: 'custom', message: f.message, params: { engineCode: f.code } });
  return z.NEVER;
});

export const TroubleCodes = z.array(TroubleCode).max(50, 'at most 50 trouble codes');

/** Human text: trimmed, not empty, bounded, and free of control characters other than line breaks and tabs. */
export function text(max: number) {
  return z
    .string()
    .trim()
    .min(1, 'must not be empty')
    .max(max, `at most ${max} characters`)
    .refine((s) => !/[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/.test(s), 'must not contain control characters');
}

export function optionalText(max: number) {
  return z
    .string()
    .trim()
    .max(max, `at most ${max} characters`)
    .refine((s) => !/[\u0000-\u0008\u000B\u000C\u000E-\u001F\u007F]/.test(s), 'must not contain control characters');
}

export const IsoTime = z.iso.datetime({ offset: true, message: 'an ISO 8601 date-time with zone, e.g. 2026-03-04T09:15:00Z' });

export const QuantityEnum = z.enum(QUANTITIES);
export const PointEnum = z.enum(POINTS);
export const LocationEnum = z.enum(LOCATIONS);
export const ConnectorEnum = z.enum(CONNECTOR_STATES);
export const KeyEnum = z.enum(KEY_STATES);
export const EngineEnum = z.enum(ENGINE_STATES);
export const PhaseEnum = z.enum(PHASES);
export const CircuitKindEnum = z.enum(CIRCUIT_KINDS);
export const CircuitUnderTestKindEnum = z.enum(CIRCUIT_UNDER_TEST_KINDS);
export const CavityRoleEnum = z.enum(CAVITY_ROLES);

export const JumperSchema = z.strictObject({
  from: PointEnum,
  to: PointEnum,
  via: z.discriminatedUnion('kind', [
    z.strictObject({ kind: z.literal('fused_jumper') }),
    z.strictObject({ kind: z.literal('resistor'), ohms: z.number().positive('a resistance above 0 Ω').max(1e9) }),
    z.strictObject({ kind: z.literal('voltage_source'), volts: z.number().min(-30).max(30, 'at most 30 V') }),
  ]),
});

export const Paging = {
  page: z.coerce.number().int().min(1, 'pages count from 1').default(1),
  pageSize: z.coerce.number().int().min(1).max(200, 'at most 200 per page').default(50),
};

/**
 * A measurement request in the shared vocabulary (`MeasurementRequest` in engine/vocabulary.ts): where the leads go
 * and in which state the vehicle is, without a value. What the circuit model predicts and the fault trees ask for.
 */
/** The fields of a measurement request: where the leads go and the vehicle's state (the shared vocabulary). */
export const MeasurementRequestFields = {
  quantity: QuantityEnum,
  at: PointEnum.describe('first (red) lead; for scan_value, the wire whose signal the parameter reports'),
  against: PointEnum.optional().describe('second (black) lead; omit for scan_value'),
  location: LocationEnum,
  connector: ConnectorEnum,
  key: KeyEnum,
  engine: EngineEnum,
  jumpers: z.array(JumperSchema).max(4, 'at most 4 jumpers').default([]),
  pid: z
    .string()
    .trim()
    .min(1)
    .max(32)
    .regex(/^[A-Za-z0-9 _.-]+$/, 'a PID such as "11" or a short parameter name')
    .optional()
    .describe('scan_value only: the parameter read, e.g. an SAE J1979 PID'),
  sensor: z
    .string()
    .trim()
    .min(1)
    .max(64)
    .regex(/^[A-Za-z0-9 _.-]+$/, 'a sensor name such as "MAP" or "all"')
    .optional()
    .describe('on a shared 5 V reference: which sensor the reading concerns, or "all"'),
};

type RequestShape = { quantity: string; at: string; against?: string; pid?: string };

/** Rules across the request's fields, shared by every schema that embeds a request. */
export function refineRequest(r: RequestShape, ctx: z.RefinementCtx): void {
  if (r.quantity === 'scan_value') {
    if (r.against) ctx.addIssue({ code: 'custom', path: ['against'], message: 'a scan_value is read from the scan tool: leave against out' });
    return;
  }
  const leads = 'one of reference, signal, ground, battery_negative, battery_positive, chassis_ground';
  if (!r.against) ctx.addIssue({ code: 'custom', path: ['against'], message: `a ${r.quantity} reading needs the second lead: against ${leads}` });
  if (r.against && r.at === r.against) ctx.addIssue({ code: 'custom', path: ['against'], message: 'the two leads must be on different points' });
  if (r.pid) ctx.addIssue({ code: 'custom', path: ['pid'], message: 'pid belongs to scan_value readings only' });
}

export const MeasurementRequestSchema = z.strictObject(MeasurementRequestFields).superRefine(refineRequest);
export type MeasurementRequestInput = z.output<typeof MeasurementRequestSchema>;
