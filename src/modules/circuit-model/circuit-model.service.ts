import { Injectable } from '@nestjs/common';
import { InvalidInputException, type Finding } from '../../common/errors/domain.exception';
import {
  bandTable,
  faultsFor,
  HYPOTHESIS_IDS,
  predictReading,
  prepareReading,
  validateFaults,
  type CircuitSpec,
  type FaultSpec,
  type MeterSpec,
} from '../../engine/circuit';
import type { MeasurementRequest } from '../../engine/vocabulary';
import { identifyWires } from '../../engine/wires';
import { apiFindings, orInvalid } from '../calculators/engine-result';
import { MAX_SAMPLE_SOLVES, type BandsBody, type IdentifyWiresBody, type PredictionBody } from './circuit-model.dto';
import { resolveCircuit, resolveMeter } from './circuit-overrides';
import { percentilesView, readingView, rowFindings, unitSymbol } from './circuit-model.view';

/** One row to evaluate: the healthy circuit, a hypothesis of the fault trees, or a named set of the caller's faults. */
interface Scenario {
  id: string;
  source: 'good' | 'hypothesis' | 'fault_set';
  faults: FaultSpec[];
}

interface Setup {
  circuit: CircuitSpec;
  meter: MeterSpec;
  request: MeasurementRequest;
  scenarios: Scenario[];
}

@Injectable()
export class CircuitModelService {
  predict(body: PredictionBody) {
    const { circuit, meter, request, scenarios } = this.setUp(body);
    return {
      circuit,
      request,
      meterInputOhms: meter.inputOhms,
      rows: scenarios.map((s) => {
        const r = predictReading(circuit, s.faults, request, meter);
        const base = { id: s.id, source: s.source, faults: s.faults };
        return r.ok ? { ...base, reading: readingView(r.value, r.unit) } : { ...base, reading: null, findings: rowFindings(r.findings) };
      }),
    };
  }

  bands(body: BandsBody) {
    const { circuit, meter, request, scenarios } = this.setUp(body);
    if (body.samples * scenarios.length > MAX_SAMPLE_SOLVES) {
      const most = Math.floor(MAX_SAMPLE_SOLVES / scenarios.length);
      throw new InvalidInputException([
        {
          code: 'bands.too_many_samples',
          path: 'body.samples',
          message: `${scenarios.length} rows × ${body.samples} samples exceeds ${MAX_SAMPLE_SOLVES} per request; ask for at most ${most} samples or fewer hypotheses`,
        },
      ]);
    }
    const table = orInvalid(
      bandTable({
        circuit,
        request,
        meter,
        bands: body.bands,
        hypotheses: Object.fromEntries(scenarios.map((s) => [s.id, s.faults])),
        samples: body.samples,
        seed: body.seed,
        spreads: body.spreads,
      }),
    );
    const good = table.rows.find((r) => r.hypothesis === 'good')!;
    // The healthy row failing means the input is wrong (spreads, sampling), not that a fault hides the reading.
    if (!good.ok) throw new InvalidInputException(apiFindings('body', good.findings));
    const bySource = new Map(scenarios.map((s) => [s.id, s]));
    return {
      circuit,
      request,
      meterInputOhms: meter.inputOhms,
      samples: body.samples,
      seed: body.seed,
      unit: unitSymbol(good.unit),
      bands: body.bands,
      rows: table.rows.map((row) => {
        const s = bySource.get(row.hypothesis)!;
        const base = { id: s.id, source: s.source, faults: s.faults };
        if (!row.ok) return { ...base, percentiles: null, probabilities: null, findings: rowFindings(row.findings) };
        return { ...base, percentiles: percentilesView(row.percentiles), probabilities: row.probabilities };
      }),
    };
  }

  identifyWires(body: IdentifyWiresBody) {
    return orInvalid(identifyWires(body)).value;
  }

  /**
   * The circuit, meter and request, checked by the engine on the healthy circuit (a 400 when they are wrong), and
   * the rows: `good` first, then the hypotheses and fault sets asked for (or every hypothesis that applies).
   */
  private setUp(body: PredictionBody | BandsBody): Setup {
    const circuit = resolveCircuit(body.circuit);
    const meter = resolveMeter(body.meter);
    const request = body.request as MeasurementRequest;
    const good = predictReading(circuit, [], request, meter);
    if (!good.ok) throw new InvalidInputException(apiFindings('body', good.findings));

    const found: Finding[] = [];
    const scenarios: Scenario[] = [{ id: 'good', source: 'good', faults: [] }];
    const explicit = body.hypotheses !== undefined || body.faultSets !== undefined;
    const hypotheses = body.hypotheses ?? (explicit ? [] : HYPOTHESIS_IDS.filter((id) => this.problems(circuit, faultsFor(id), request, meter).length === 0));
    hypotheses.forEach((id, i) => {
      const faults = faultsFor(id);
      const problems = this.problems(circuit, faults, request, meter);
      if (problems.length) {
        found.push({ code: 'hypothesis.not_applicable', path: `body.hypotheses.${i}`, message: `${id} does not apply to this circuit: ${problems[0]!.message}` });
      }
      scenarios.push({ id, source: 'hypothesis', faults });
    });
    body.faultSets?.forEach((set, i) => {
      const faults = set.faults as FaultSpec[];
      const listed = validateFaults(faults, circuit, 'faults');
      found.push(...apiFindings(`body.faultSets.${i}`, listed.length ? listed : this.problems(circuit, faults, request, meter)));
      scenarios.push({ id: set.name, source: 'fault_set', faults });
    });
    if (found.length) throw new InvalidInputException(found);
    return { circuit, meter, request, scenarios };
  }

  /** Why faults cannot be put into this circuit (a reference fault on a two-wire circuit, a variant the sensor lacks). */
  private problems(circuit: CircuitSpec, faults: FaultSpec[], request: MeasurementRequest, meter: MeterSpec): Finding[] {
    const prepared = prepareReading(circuit, faults, request, meter);
    return prepared.ok ? [] : prepared.findings;
  }
}
