/**
 * Demo readings that make sense: the fault-tree engine proposes each test and the circuit model answers it for
 * the invented fault, exactly as a technician at a faulted car would see it.
 */
import { defaultCircuit, faultsFor, predictReading } from '../engine/circuit';
import { builtInTreeFor, diagnose, type Reading } from '../engine/diagnosis';
import type { CircuitKind, MeasurementRequest } from '../engine/vocabulary';

export interface SimulatedReading {
  request: MeasurementRequest;
  /** As typed: a number in `unit`, or "OL". */
  value: number | 'OL';
  unit: string;
}

const TYPED_UNIT = { V: 'V', ohm: 'Ω', A: 'A' } as const;

/** What the meter shows on the circuit with `hypothesis` ('good' after the repair), rounded as a meter shows it. */
export function meterShows(kind: CircuitKind, hypothesis: string, request: MeasurementRequest): SimulatedReading {
  const predicted = predictReading(defaultCircuit(kind), faultsFor(hypothesis) ?? [], request);
  if (!predicted.ok) throw new Error(`demo: cannot predict ${request.quantity} at ${request.at}: ${predicted.findings[0]?.message}`);
  if (predicted.overload || !Number.isFinite(predicted.value)) return { request, value: 'OL', unit: TYPED_UNIT[predicted.unit] };
  if (predicted.unit === 'ohm' && predicted.value >= 1000) return { request, value: Number((predicted.value / 1000).toFixed(1)), unit: 'kΩ' };
  return { request, value: Number(predicted.value.toFixed(predicted.unit === 'ohm' ? 1 : 2)), unit: TYPED_UNIT[predicted.unit] };
}

/** The readings the engine asks for, answered for `hypothesis`, until it concludes or `maxSteps` are taken. */
export async function diagnosisReadings(kind: CircuitKind, hypothesis: string, maxSteps = 20): Promise<SimulatedReading[]> {
  const tree = builtInTreeFor(kind)!;
  const taken: SimulatedReading[] = [];
  const engineReadings: Reading[] = [];
  for (let step = 0; step < maxSteps; step++) {
    const diagnosis = await diagnose(tree, engineReadings);
    if (diagnosis.status === 'concluded' || !diagnosis.nextTest) break;
    const shown = meterShows(kind, hypothesis, diagnosis.nextTest.request);
    taken.push(shown);
    const si = predictReading(defaultCircuit(kind), faultsFor(hypothesis) ?? [], shown.request);
    engineReadings.push({
      id: `demo-${step}`,
      request: shown.request,
      value: si.ok && Number.isFinite(si.value) ? si.value : 'overload',
      takenAt: new Date(Date.UTC(2026, 0, 1, 0, step)).toISOString(),
      phase: 'diagnosis',
    });
  }
  return taken;
}
