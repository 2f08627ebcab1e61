/**
 * Zod schemas for the domain's own formats, delegating the checks to the framework-free engine so that the
 * rule lives in one place and the HTTP layer only reports it (with the engine's message) at the right path.
 */
import { z } from 'zod';
import { LIMITS } from '../limits';
import { JumperSchema, MeasurementRequestSchema, measurementRequestFields, refineMeasurementRequest } from '../../engine/request-schema';
import { parseDtc } from '../../engine/codes';
import { textProblem, type TextKind } from '../../engine/text';
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

export const TroubleCodes = z.array(TroubleCode).max(LIMITS.count.codes, `at most ${LIMITS.count.codes} trouble codes`);

/**
 * Human text: NFC, trimmed, bounded, and checked by the engine's text rules (engine/text.ts). `multiline` (the
 * default: complaints, notes, comments) keeps line breaks and tabs; `line` and `name` refuse them, text-direction
 * controls and values of only invisible characters.
 */
function checkedText(max: number, kind: TextKind, required: boolean) {
  const base = z.string().normalize('NFC').trim();
  return (required ? base.min(1, 'must not be empty') : base).max(max, `at most ${max} characters`).superRefine((value, ctx) => {
    const problem = textProblem(value, kind);
    if (problem) ctx.addIssue({ code: 'custom', message: problem });
  });
}

export function text(max: number, kind: TextKind = 'multiline') {
  return checkedText(max, kind, true);
}

export function optionalText(max: number, kind: TextKind = 'multiline') {
  return checkedText(max, kind, false);
}

/** One line of text (a label, a make, a part name). */
export const lineText = (max: number) => text(max, 'line');
export const optionalLineText = (max: number) => optionalText(max, 'line');
/** A person's or a shop's name. */
export const nameText = (max: number) => text(max, 'name');

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

export { JumperSchema };

export const Paging = {
  page: z.coerce.number().int().min(1, 'pages count from 1').default(1),
  pageSize: z.coerce.number().int().min(1).max(200, 'at most 200 per page').default(50),
};

/**
 * A measurement request in the shared vocabulary (`MeasurementRequest` in engine/vocabulary.ts): where the leads go
 * and in which state the vehicle is, without a value. What the circuit model predicts and the fault trees ask for.
 */
/** The measurement request: one definition in the engine, shared with trees and the proof. */
export const MeasurementRequestFields = measurementRequestFields;
export const refineRequest = refineMeasurementRequest;
export { MeasurementRequestSchema };
export type MeasurementRequestInput = z.output<typeof MeasurementRequestSchema>;
