/**
 * Cavity roles as hypotheses. Each role predicts a cavity's readings at an unplugged sensor connector from the
 * circuit model's Thevenin equivalent seen from that cavity (see circuit/build.ts): the reference is the regulator
 * behind its small output resistance; a biased signal is the regulator (pull-up) or ground (pull-down) behind the
 * bias resistance; the sensor ground is ground behind a fraction of an ohm. Unknown part values are marginalised
 * over a grid (priors are common practice, no source); the regulator voltage is shared by all cavities and is
 * marginalised jointly in identify.ts.
 */
import type { CircuitKind } from '../vocabulary';
import { parallelOhms } from '../calc/meter-loading';

export const ROLES = ['reference', 'signal_pull_up', 'signal_pull_down', 'ground', 'not_identified'] as const;
export type Role = (typeof ROLES)[number];

/** What the technician measured on one cavity of the unplugged sensor connector (harness side). */
export interface CavityReadings {
  cavity: string;
  /** Volts to battery negative, key on. */
  volts?: number;
  /** Input resistance of the meter used for `volts`, Ω (default 10 MΩ). */
  meterOhms?: number;
  /** A second key-on reading of the same cavity under a different load: another meter and/or a known resistor across the leads. */
  loaded?: { volts: number; meterOhms?: number; parallelOhms?: number };
  /** Ohms to battery negative, key off; `'open'` when the meter shows overload. */
  ohms?: number | 'open';
}

/** One point of a role's parameter grid: a Thevenin source seen from the cavity, and its key-off resistance. */
interface Scenario {
  weight: number;
  /** True: the regulator drives it (volts = Vreg); false: it sits at 0 V. */
  driven: boolean;
  sourceOhms: number;
  keyOffOhms: number | 'open';
}

export const DEFAULT_METER_INPUT_OHMS = 10e6;
/** Key-on volts: spread of the model plus the meter's ±(0.5 % + 2 digits) and a typed reading's rounding. */
const voltsSigma = (predicted: number) => 0.02 + 0.005 * Math.abs(predicted);
/** Ohms, on a log scale: 10 % plus lead resistance and contact scatter for low values. */
const lnOhmsSigma = (predicted: number) => Math.hypot(0.1, 0.3 / (predicted + 0.3));
const P_OPEN_WHEN_CLOSED = 0.01;

function logGrid(lo: number, hi: number, points: number, weight = 1, keyOff?: (r: number) => number | 'open', driven = true): Scenario[] {
  return Array.from({ length: points }, (_, i) => {
    const r = lo * (hi / lo) ** (i / (points - 1));
    return { weight: weight / points, driven, sourceOhms: r, keyOffOhms: keyOff ? keyOff(r) : r };
  });
}

const gauss = (x: number, mu: number, sigma: number) => Math.exp(-0.5 * ((x - mu) / sigma) ** 2) / (sigma * Math.sqrt(2 * Math.PI));

function voltsLikelihood(observed: number, s: Scenario, vreg: number, loadOhms: number): number {
  const predicted = s.driven ? (vreg * loadOhms) / (loadOhms + s.sourceOhms) : 0;
  return gauss(observed, predicted, voltsSigma(predicted));
}

function ohmsLikelihood(observed: number | 'open', s: Scenario): number {
  if (s.keyOffOhms === 'open') return observed === 'open' ? 1 - P_OPEN_WHEN_CLOSED : P_OPEN_WHEN_CLOSED * flatOhmsDensity(observed);
  if (observed === 'open') return P_OPEN_WHEN_CLOSED;
  const predicted = s.keyOffOhms;
  return gauss(Math.log(Math.max(observed, 1e-3)), Math.log(predicted), lnOhmsSigma(predicted));
}

/** Flat densities of a cavity whose role we do not know: volts uniform on −1…15 V, ln Ω uniform on 0.01 Ω…100 MΩ. */
const FLAT_VOLTS = 1 / 16;
const P_OPEN_FLAT = 0.3;
function flatOhmsDensity(observed: number | 'open'): number {
  return observed === 'open' ? P_OPEN_FLAT : (1 - P_OPEN_FLAT) / Math.log(1e10);
}

export function loadOf(meterOhms: number | undefined, parallel: number | undefined): number {
  const meter = meterOhms ?? DEFAULT_METER_INPUT_OHMS;
  return parallel === undefined ? meter : parallelOhms(meter, parallel);
}

/** Likelihood of a cavity's readings given a scenario and the regulator voltage. */
function scenarioLikelihood(c: CavityReadings, s: Scenario, vreg: number): number {
  let l = 1;
  if (c.volts !== undefined) l *= voltsLikelihood(c.volts, s, vreg, loadOf(c.meterOhms, undefined));
  if (c.loaded) l *= voltsLikelihood(c.loaded.volts, s, vreg, loadOf(c.loaded.meterOhms, c.loaded.parallelOhms));
  if (c.ohms !== undefined) l *= ohmsLikelihood(c.ohms, s);
  return l;
}

export interface RoleBehaviour {
  /** Roles usable on a connector of this circuit kind. */
  appliesTo(kind: CircuitKind): boolean;
  /** Prior weight of giving a cavity this role (before readings). */
  prior: number;
  /** p(readings | role, Vreg), marginalised over the role's own part values. */
  likelihood(c: CavityReadings, vreg: number, kind: CircuitKind): number;
  /** Noise-free predicted readings (weighted) for planning the next reading. */
  scenarios(kind: CircuitKind): Scenario[];
}

function scenarioRole(appliesTo: (k: CircuitKind) => boolean, scenarios: (k: CircuitKind) => Scenario[]): RoleBehaviour {
  const cache = new Map<CircuitKind, Scenario[]>();
  const get = (k: CircuitKind) => cache.get(k) ?? (cache.set(k, scenarios(k)), cache.get(k)!);
  return {
    appliesTo,
    prior: 1,
    scenarios: get,
    likelihood: (c, vreg, k) => get(k).reduce((sum, s) => sum + s.weight * scenarioLikelihood(c, s, vreg), 0),
  };
}

const threeWire = (k: CircuitKind) => k === 'three_wire_5v';

export const ROLE_BEHAVIOURS: Record<Role, RoleBehaviour> = {
  // Regulator output 0.2–10 Ω; key off the unpowered output shows anything from tens of ohms to open.
  reference: scenarioRole(threeWire, () =>
    logGrid(0.2, 10, 4, 1, () => 0).flatMap((s) => [
      ...logGrid(10, 1e6, 8, s.weight * 0.9).map((k) => ({ ...s, weight: k.weight, keyOffOhms: k.sourceOhms })),
      { ...s, weight: s.weight * 0.1, keyOffOhms: 'open' as const },
    ]),
  ),
  // Bias 150–400 kΩ on a three-wire input (200–300 kΩ typical); 1–50 kΩ pull-up on a thermistor input.
  signal_pull_up: scenarioRole(
    () => true,
    (k) => (k === 'three_wire_5v' ? logGrid(150e3, 400e3, 24) : logGrid(1e3, 50e3, 24)),
  ),
  // A pull-down of 100 kΩ–1 MΩ, or no bias at all (open key off).
  signal_pull_down: scenarioRole(threeWire, () => [
    ...logGrid(100e3, 1e6, 16, 0.7, undefined, false),
    { weight: 0.3, driven: false, sourceOhms: 1e9, keyOffOhms: 'open' },
  ]),
  ground: scenarioRole(() => true, () => logGrid(0.02, 3, 8, 1, undefined, false)),
  not_identified: {
    appliesTo: () => true,
    prior: 0.05,
    scenarios: () => [],
    likelihood(c) {
      let l = 1;
      if (c.volts !== undefined) l *= FLAT_VOLTS;
      if (c.loaded) l *= FLAT_VOLTS;
      if (c.ohms !== undefined) l *= flatOhmsDensity(c.ohms);
      return l;
    },
  },
};

/** Noise-free readings a scenario predicts, for the next-reading planner. */
export function predictedReadings(s: Scenario, vreg: number, load: number): { volts: number; ohms: number | 'open' } {
  return { volts: s.driven ? (vreg * load) / (load + s.sourceOhms) : 0, ohms: s.keyOffOhms };
}
