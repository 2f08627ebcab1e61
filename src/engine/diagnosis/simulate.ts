/**
 * Simulated technicians for tests and benchmarks: draw a fault from the tree's priors, draw a concrete circuit
 * (part spreads, circuit variant), and answer each requested measurement with the circuit model's prediction plus
 * the meter's stated error. Deterministic per seed. Tooling around the engine, not part of a diagnosis.
 */
import { DEFAULT_METER, causeAlternatives, defaultCircuit, defaultSpreads, mulberry32, predictReading, scanReadout, type CircuitSpec, type DefaultCircuitOptions, type FaultSpec, type Random } from '../circuit';
import type { CircuitKind } from '../vocabulary';
import type { TreeRequest } from './request-key';
import type { Tree } from './tree-model';

export interface SimulatedCase {
  hypothesisId: string;
  variantId: string;
  circuit: CircuitSpec;
  faults: FaultSpec[];
  /** Seed for meter noise: the same (case, request, attempt) always reads the same. */
  noiseSeed: number;
}

const pick = <T extends { weight: number }>(items: readonly T[], random: Random): T => {
  let r = random() * items.reduce((a, i) => a + i.weight, 0);
  for (const item of items) if ((r -= item.weight) < 0) return item;
  return items.at(-1)!;
};

/** Draws a faulted circuit: the cause by prior (the "unknown" leak excluded), a variant by weight, parts within spreads. */
export function drawCase(tree: Tree, random: Random, force: { hypothesisId?: string; variantId?: string } = {}): SimulatedCase {
  const drawn = pick(tree.hypotheses.filter((h) => !h.unknown).map((h) => ({ ...h, weight: h.prior })), random);
  const hyp = force.hypothesisId ? tree.hypotheses.find((h) => h.id === force.hypothesisId)! : drawn;
  const variants = tree.document.derivation?.variants ?? [{ id: 'default', weight: 1, circuit: {} }];
  const drawnVariant = pick(variants, random);
  const variant = force.variantId ? variants.find((v) => v.id === force.variantId)! : drawnVariant;
  const kind = tree.circuitKind as CircuitKind;
  const nominal = defaultCircuit(kind, variant.circuit as DefaultCircuitOptions);
  const spreads = defaultSpreads(nominal);
  const u = (lo: number, hi: number) => lo + (hi - lo) * random();
  // A cause that stands for several forms (a dead or a weak supply, a solid or a partial short) draws one of them.
  const alt = pick(causeAlternatives(hyp.id, kind) ?? [{ weight: 1, faults: [] }], random);
  const options: DefaultCircuitOptions = { ...(variant.circuit as DefaultCircuitOptions), regulatorVolts: u(...(alt.spreads?.regulatorVolts ?? spreads.regulatorVolts)) };
  const circuit = defaultCircuit(kind, options);
  circuit.module.regulator = { ...circuit.module.regulator, ...alt.regulator };
  const held = alt.spreads?.moduleInputVolts;
  const faults = alt.faults.map((f) => (held && f.kind === 'module_internal' ? { ...f, volts: u(...held) } : f));
  circuit.wires = circuit.wires.map((w) => ({ ...w, ohms: u(...spreads.wireOhms) }));
  if (circuit.module.bias.kind !== 'none') circuit.module.bias = { ...circuit.module.bias, ohms: u(...spreads.biasOhms) };
  const dv = spreads.batteryVolts * (2 * random() - 1);
  circuit.battery = { ...circuit.battery, keyOffVolts: circuit.battery.keyOffVolts + dv, volts: Object.fromEntries(Object.entries(circuit.battery.volts).map(([k, v]) => [k, v + dv])) as CircuitSpec['battery']['volts'] };
  const sensor = circuit.sensor;
  if (sensor.kind === 'potentiometer') sensor.position = Math.min(0.98, Math.max(0.02, sensor.position + spreads.sensorTolerance * (2 * random() - 1)));
  if (sensor.kind === 'thermistor') sensor.temperatureC += 2 * (2 * random() - 1);
  return { hypothesisId: hyp.id, variantId: variant.id, circuit, faults, noiseSeed: Math.floor(random() * 2 ** 31) };
}

function hashString(s: string): number {
  let h = 2166136261;
  for (let i = 0; i < s.length; i++) h = Math.imul(h ^ s.charCodeAt(i), 16777619);
  return h >>> 0;
}

const MIN_RESOLUTION = { dc_volts: 1e-4, ohms: 0.1, amps: 1e-5 } as const;

/**
 * What the technician would read: the model's prediction plus meter error ±(percent + digits), drawn uniformly.
 * Scan values carry no meter error. Returns undefined when the model cannot predict (an ohms reading on a powered
 * circuit), which a technician would see as a meaningless, drifting display.
 */
export function simulateReading(c: SimulatedCase, request: TreeRequest, attempt = 0): number | 'overload' | undefined {
  const { sensor: _s, ...plain } = request;
  // A temperature PID as the module shows it, or another sensor's PID (src/engine/circuit/scan-readout.ts).
  const readout = request.quantity === 'scan_value' && request.pid !== 'signal_volts' ? scanReadout(request.pid, c.circuit.kind) : undefined;
  const u = () => 2 * mulberry32(c.noiseSeed ^ hashString(`readout:${JSON.stringify(plain)}`))() - 1;
  if (readout && !readout.own) return readout.value(Number.NaN, { circuit: c.circuit, draws: new Map(), u });
  const predicted = predictReading(c.circuit, c.faults, plain);
  if (!predicted.ok) return undefined;
  if (predicted.overload) return 'overload';
  if (readout) return readout.value(predicted.value, { circuit: c.circuit, draws: new Map(), u });
  if (request.quantity === 'scan_value') return Number(predicted.value.toFixed(3));
  const accuracy = DEFAULT_METER.accuracy[request.quantity];
  const v = predicted.value;
  const resolution = v === 0 ? MIN_RESOLUTION[request.quantity] : Math.max(MIN_RESOLUTION[request.quantity], 10 ** Math.ceil(Math.log10(Math.abs(v) / DEFAULT_METER.counts)));
  const random = mulberry32(c.noiseSeed ^ hashString(`${JSON.stringify(plain)}#${attempt}`));
  const noisy = v + ((accuracy.percent / 100) * Math.abs(v) + accuracy.digits * resolution) * (2 * random() - 1);
  return Number((Math.round(noisy / resolution) * resolution).toPrecision(6));
}

/**
 * A value for a request the model cannot predict (an ohmmeter on a powered wire): overload or something arbitrary,
 * half and half, the arbitrary value log-uniform from 0.1 Ω to 60 MΩ, as the derivation assumes.
 */
export function arbitraryReading(c: SimulatedCase, request: TreeRequest, attempt = 0): number | 'overload' {
  const random = mulberry32(c.noiseSeed ^ hashString(`arbitrary:${JSON.stringify(request)}#${attempt}`));
  if (random() < 0.5) return 'overload';
  return Number(Math.exp(Math.log(0.1) + random() * (Math.log(60e6) - Math.log(0.1))).toPrecision(4));
}
