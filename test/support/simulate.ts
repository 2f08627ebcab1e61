/** Readings a technician would type on a faulted circuit: the circuit model's predictions, driven through the API. */
import { expect } from 'vitest';
import { causeAlternatives, defaultCircuit, predictReading } from '../../src/engine/circuit';
import type { MeasurementRequest } from '../../src/engine/vocabulary';
import type { TestApi } from './http';

const UNIT: Record<string, string> = { V: 'V', ohm: 'ohm', A: 'A' };

/** The faults a cause stands for: its likeliest form (a failed supply: dead; a short: solid). */
function faultsOf(hypothesis: string) {
  const forms = causeAlternatives(hypothesis);
  return forms ? forms.reduce((a, b) => (b.weight > a.weight ? b : a)).faults : [];
}

/** `hypothesis` 'good' gives the healthy circuit (after the repair). */
export function simulatedReading(hypothesis: string, request: MeasurementRequest): { value: number | 'OL'; unit: string } {
  const faults = hypothesis === 'good' ? [] : faultsOf(hypothesis);
  const predicted = predictReading(defaultCircuit('three_wire_5v'), faults, request);
  // An ohmmeter on a circuit that is powered anyway (a wire shorted to battery voltage) has its test current
  // swamped and shows overload; the technician types what it shows (common practice, no source).
  if (!predicted.ok && predicted.findings.some((f) => f.code === 'measurement.ohms_on_powered_circuit')) return { value: 'OL', unit: 'ohm' };
  if (!predicted.ok) throw new Error(`circuit model cannot predict ${JSON.stringify(request)}: ${predicted.findings[0]?.message}`);
  if (predicted.overload || !Number.isFinite(predicted.value)) return { value: 'OL', unit: UNIT[predicted.unit]! };
  return { value: Number(predicted.value.toFixed(predicted.unit === 'ohm' ? 1 : 3)), unit: UNIT[predicted.unit]! };
}

/** Answers each proposed test with the fault's readings until the diagnosis concludes; returns the last diagnosis. */
export async function diagnoseToEnd(api: TestApi, user: string, repairOrderId: string, circuitId: string, hypothesis: string) {
  const path = `/api/repair-orders/${repairOrderId}/circuits/${circuitId}/diagnosis`;
  let diagnosis = (await api.call('GET', path, { user })).body;
  for (let step = 0; step < 25 && diagnosis.nextTest && diagnosis.status !== 'concluded'; step++) {
    const request = diagnosis.nextTest.request as MeasurementRequest;
    const posted = await api.call('POST', `/api/repair-orders/${repairOrderId}/measurements`, {
      user,
      body: { circuitId, ...request, ...simulatedReading(hypothesis, request), ...(diagnosis.nextTest.recheckOf ? { supersedes: diagnosis.nextTest.recheckOf } : {}) },
    });
    expect(posted.status, JSON.stringify(posted.body)).toBe(201);
    diagnosis = (await api.call('GET', path, { user })).body;
  }
  return diagnosis;
}
