/**
 * The measurement request as a validation schema (zod): the one definition used by fault-tree documents, the
 * proof view and the HTTP API, so a test's `request` and a posted reading are checked by the same rules.
 */
import { z } from 'zod';
import { sensorPinsProblems, type SensorPinsShape } from './sensor-pins';
import { CONNECTOR_STATES, ENGINE_STATES, KEY_STATES, LOCATIONS, POINTS, QUANTITIES, SENSOR_INPUTS } from './vocabulary';

export const PointSchema = z.enum(POINTS);

export const JumperSchema = z.strictObject({
  from: PointSchema,
  to: PointSchema,
  via: z.discriminatedUnion('kind', [
    z.strictObject({ kind: z.literal('fused_jumper') }),
    z.strictObject({ kind: z.literal('resistor'), ohms: z.number().positive('a resistance above 0 Ω').max(1e9) }),
    z.strictObject({ kind: z.literal('voltage_source'), volts: z.number().min(-30).max(30, 'at most 30 V') }),
  ]),
});

const label = (what: string, example: string) =>
  z
    .string()
    .trim()
    .min(1)
    .max(64)
    .regex(/^[A-Za-z0-9 _.()/-]+$/, `${what} such as ${example}: letters, digits, spaces and _ . ( ) / -`);

/** The fields of a request, to embed in larger objects (a reading adds its value to them). */
export const measurementRequestFields = {
  quantity: z.enum(QUANTITIES),
  at: PointSchema.describe('first (red) lead; for scan_value, the wire whose signal the parameter reports'),
  against: PointSchema.optional().describe('second (black) lead; omit for scan_value'),
  location: z
    .enum(LOCATIONS)
    .describe("the connector the first lead (and any jumper) is on, harness side; sensor_pins: the sensor's own terminals, sensor unplugged (ohms only)"),
  connector: z.enum(CONNECTOR_STATES).describe('state of the connector at location (for sensor_pins, the sensor connector: unplugged)'),
  againstLocation: z
    .enum(LOCATIONS)
    .optional()
    .describe('a lead at each end: the connector the second lead is on when not at location (a wire lead only); omit for the same connector'),
  otherConnector: z.enum(CONNECTOR_STATES).optional().describe('state of the other connector (not at location); omit for plugged'),
  key: z.enum(KEY_STATES),
  engine: z.enum(ENGINE_STATES),
  sensorInput: z
    .enum(SENSOR_INPUTS, { error: 'sensorInput is at_rest or moved (throttle or pedal pressed fully and held; a pressure sensor: engine running at idle)' })
    .optional()
    .describe('the sensor\'s input while reading: moved = throttle or pedal pressed fully and held (key on, engine off), or for a pressure sensor the engine running at idle; omit for at rest'),
  jumpers: z.array(JumperSchema).max(4, 'at most 4 jumpers').default([]),
  pid: label('a PID', '"11" or a short parameter name').max(32).optional().describe('scan_value only: the parameter read, e.g. an SAE J1979 PID'),
  sensor: label('a sensor name', '"MAP" or "all"').optional().describe('on a shared 5 V reference: which sensor the reading concerns, or "all"'),
};

type RequestShape = SensorPinsShape & { pid?: string; key: string; engine: string; sensorInput?: string };

const FIXED_POINTS = ['battery_negative', 'battery_positive', 'chassis_ground'];

/** The stable code of a rule broken across fields, read by `issueCode` (zod's own code is only "custom"). */
function rule(ctx: z.RefinementCtx, code: string, field: string, message: string): void {
  ctx.addIssue({ code: 'custom', path: [field], message, params: { code } });
}

/** Rules across the fields: leads for meter readings, a named parameter for scan values, a possible vehicle state. */
export function refineMeasurementRequest(r: RequestShape, ctx: z.RefinementCtx): void {
  for (const p of sensorPinsProblems(r)) rule(ctx, p.code, p.field, p.message);
  if (r.key === 'off' && r.engine !== 'off') rule(ctx, 'request.engine_without_key', 'engine', `the engine cannot be ${r.engine} with the key off`);
  // A throttle held fully open while cranking is many modules' signal to cut fuel (clearing a flooded engine).
  if (r.sensorInput === 'moved' && r.engine === 'cranking')
    rule(ctx, 'request.input_moved_while_cranking', 'sensorInput', 'the input is moved with the key on and the engine off (throttle or pedal), or at idle (pressure): not while cranking');
  // An ohmmeter reads its own test current; on a powered circuit the number means nothing (and can harm the meter).
  if (r.quantity === 'ohms' && r.key === 'on') rule(ctx, 'request.ohms_powered', 'key', 'an ohms reading is taken with the key off, on an unpowered circuit');
  if (r.quantity === 'scan_value') {
    if (!r.pid) rule(ctx, 'request.pid_missing', 'pid', 'a scan_value names the parameter read (pid), e.g. an SAE J1979 PID such as "11"');
    if (r.against) rule(ctx, 'request.against_on_scan', 'against', 'a scan_value is read from the scan tool: leave against out');
    if (r.againstLocation) rule(ctx, 'request.against_location_on_scan', 'againstLocation', 'a scan_value has no second lead: leave againstLocation out');
    return;
  }
  if (r.againstLocation && r.against && FIXED_POINTS.includes(r.against))
    rule(ctx, 'request.against_location_on_fixed_point', 'againstLocation', `the second lead is on ${r.against}, which has no connector: leave againstLocation out`);
  const leads = 'one of reference, signal, ground, battery_negative, battery_positive, chassis_ground';
  if (!r.against) rule(ctx, 'request.against_missing', 'against', `a ${r.quantity} reading needs the second lead: against ${leads}`);
  if (r.against && r.at === r.against && (r.againstLocation ?? r.location) === r.location)
    rule(ctx, 'request.same_point', 'against', 'the two leads must be on different points (or on the two ends of one wire: set againstLocation)');
  if (r.pid) rule(ctx, 'request.pid_on_meter', 'pid', 'pid belongs to scan_value readings only');
}

/** A zod issue's code: the rule's own code where one was given, else zod's. */
export function issueCode(issue: z.core.$ZodIssue): string {
  const own = (issue as { params?: { code?: unknown } }).params?.code;
  return typeof own === 'string' ? own : issue.code;
}

export const MeasurementRequestSchema = z.strictObject(measurementRequestFields).superRefine(refineMeasurementRequest);
