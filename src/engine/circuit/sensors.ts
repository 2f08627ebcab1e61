/**
 * Sensor behaviours keyed by sensor kind: how each puts itself into the netlist between its pins, how its internal
 * faults change it, how its tolerance is sampled and how its own spec is validated.
 */
import { steinhartHartResistance, betaResistance } from '../calc/thermistor';
import { checkFinite, checkRange, checkResistance, finding, joinPath, type Finding, type Result } from '../calc/findings';
import { Netlist } from './netlist';
import type { MeasurementRequest } from '../vocabulary';
import type { PotentiometerSpec, PressureSpec, SensorKind, SensorSpec, ThermistorSpec, FaultSpec, ThermistorModel } from './types';

/** Sensor pin nodes (sensor side of the sensor connector). */
export const SENSOR_PIN = { reference: 's_reference', signal: 's_signal', ground: 's_ground' } as const;

type InternalFault = Extract<FaultSpec, { kind: 'sensor_internal' }>;

export interface SensorBehaviour<S extends SensorSpec = SensorSpec> {
  validate(spec: S, path: string): Finding[];
  build(netlist: Netlist, spec: S): void;
  /** Applies an internal fault, or returns a finding when the variant means nothing for this sensor. */
  applyInternal(netlist: Netlist, spec: S, fault: InternalFault, path: string): Finding[];
  /**
   * The sensor with its input moved (see `SensorInput`), or a finding when this sensor's input cannot be moved under
   * the request's conditions (`path` is the request's `sensorInput`).
   */
  moved(spec: S, request: Pick<MeasurementRequest, 'engine'>, path: string): Result<S>;
  /** Draws the sensor's parameters for one Monte Carlo sample; `u()` is uniform on [−1, 1]. */
  sample(spec: S, tolerance: number, u: () => number, out: Map<string, number>): void;
}

/** Smallest resistance put into the netlist for a track end (a pot never reaches exactly 0 Ω). */
const MIN_SEGMENT_OHMS = 0.01;
const clamp = (x: number, lo: number, hi: number) => Math.min(hi, Math.max(lo, x));

function notApplicable(kind: SensorKind, fault: InternalFault, path: string): Finding[] {
  return [finding('fault.variant_not_applicable', joinPath(path, 'variant'), `A ${kind} sensor has no "${fault.variant}" fault.`)];
}

function setFixed(netlist: Netlist, id: string, value: number): void {
  const e = netlist.get(id);
  if (e) {
    e.value = value;
    delete e.param;
  }
}

function potSegments(track: number, position: number): [number, number] {
  return [Math.max(track * (1 - position), MIN_SEGMENT_OHMS), Math.max(track * position, MIN_SEGMENT_OHMS)];
}

/**
 * Where a wiper goes with the pedal or throttle pressed fully: the far end of the track from where it rests, 0.76 to
 * 0.96 of it (common practice, no source: a wide-open throttle reads about 3.8 to 4.8 V on a 5 V reference).
 */
const FULL_TRAVEL_FROM_LOW_REST = 0.86;
const FULL_TRAVEL_FROM_HIGH_REST = 0.14;
const FULL_TRAVEL_SPREAD = 0.1;
/** Manifold pressure at idle, kPa: 19 inHg of vacuum under a 101.3 kPa barometer (common practice, no source). */
export const IDLE_MANIFOLD_KPA = 35;

function setTrack(netlist: Netlist, track: number, position: number): void {
  const [high, low] = potSegments(track, position);
  setFixed(netlist, 'track_high', high);
  setFixed(netlist, 'track_low', low);
}

const potentiometer: SensorBehaviour<PotentiometerSpec> = {
  validate: (s, path) => [
    ...checkResistance(s.trackOhms, joinPath(path, 'trackOhms'), 'Track resistance', true),
    ...checkRange(s.position, joinPath(path, 'position'), 'Wiper position', 0, 1),
    ...checkResistance(s.wiperOhms, joinPath(path, 'wiperOhms'), 'Wiper resistance', true),
    ...(s.fullTravelPosition === undefined ? [] : checkRange(s.fullTravelPosition, joinPath(path, 'fullTravelPosition'), 'Full-travel wiper position', 0, 1)),
  ],
  moved: (s) => ({
    ok: true,
    value: { ...s, position: s.fullTravelPosition ?? (s.position <= 0.5 ? FULL_TRAVEL_FROM_LOW_REST : FULL_TRAVEL_FROM_HIGH_REST), restPosition: s.restPosition ?? s.position },
  }),
  build(netlist, s) {
    const [high, low] = potSegments(s.trackOhms, s.position);
    netlist.add({ id: 'track_high', kind: 'resistor', nodes: [SENSOR_PIN.reference, 'wiper'], value: high, param: { key: 'sensor.track_high.ohms', scale: 1 } });
    netlist.add({ id: 'track_low', kind: 'resistor', nodes: ['wiper', SENSOR_PIN.ground], value: low, param: { key: 'sensor.track_low.ohms', scale: 1 } });
    netlist.add({ id: 'wiper_r', kind: 'resistor', nodes: ['wiper', SENSOR_PIN.signal], value: s.wiperOhms });
  },
  applyInternal(netlist, s, fault, path) {
    const variants: Record<string, () => Finding[]> = {
      open_track: () => (netlist.remove('track_high'), []),
      worn_spot: () => {
        const found = fault.value === undefined ? [] : checkResistance(fault.value, joinPath(path, 'value'), 'Wiper contact resistance', true);
        // The worn spot is where the wiper rests; moved, it runs on sound track.
        if (!found.length && s.restPosition === undefined) setFixed(netlist, 'wiper_r', fault.value ?? 1e6);
        return found;
      },
      stuck: () => {
        if (fault.value !== undefined && !fault.atRest) {
          const found = checkRange(fault.value, joinPath(path, 'value'), 'Stuck wiper position', 0, 1);
          if (found.length) return found;
        }
        if (fault.atRest) {
          // Stuck where it rests: at rest the track keeps its spread, moved it stays at its rest position.
          if (s.restPosition !== undefined) setTrack(netlist, s.trackOhms, s.restPosition);
          return [];
        }
        setTrack(netlist, s.trackOhms, fault.value ?? 0.5);
        return [];
      },
      skewed: () => {
        const found = fault.value === undefined ? [] : checkRange(fault.value, joinPath(path, 'value'), 'Wiper position skew', -1, 1);
        if (found.length) return found;
        setTrack(netlist, s.trackOhms, clamp(s.position + (fault.value ?? 0.1), 0, 1));
        return [];
      },
    };
    return variants[fault.variant]?.() ?? notApplicable('potentiometer', fault, path);
  },
  sample(s, tolerance, u, out) {
    const track = s.trackOhms * (1 + 0.2 * u());
    // Pressed fully, where the pedal stops varies far more than where it rests.
    const spread = s.restPosition === undefined ? tolerance : Math.max(tolerance, FULL_TRAVEL_SPREAD);
    const [high, low] = potSegments(track, clamp(s.position + spread * u(), 0, 1));
    out.set('sensor.track_high.ohms', high);
    out.set('sensor.track_low.ohms', low);
  },
};

/** Output as a fraction of supply, from the two calibration points; the output stage saturates at 2 % and 98 %. */
export function pressureFraction(s: PressureSpec): number {
  const c = s.calibration;
  const f = c.lowFraction + ((s.pressureKpa - c.lowKpa) * (c.highFraction - c.lowFraction)) / (c.highKpa - c.lowKpa);
  return clamp(f, 0.02, 0.98);
}

const pressure: SensorBehaviour<PressureSpec> = {
  validate(s, path) {
    const c = s.calibration;
    const cp = joinPath(path, 'calibration');
    const found = [
      ...checkFinite(s.pressureKpa, joinPath(path, 'pressureKpa'), 'Pressure'),
      ...checkFinite(c?.lowKpa, joinPath(cp, 'lowKpa'), 'Low calibration pressure'),
      ...checkFinite(c?.highKpa, joinPath(cp, 'highKpa'), 'High calibration pressure'),
      ...checkRange(c?.lowFraction, joinPath(cp, 'lowFraction'), 'Low calibration fraction', 0, 1),
      ...checkRange(c?.highFraction, joinPath(cp, 'highFraction'), 'High calibration fraction', 0, 1),
      ...checkResistance(s.supplyOhms, joinPath(path, 'supplyOhms'), 'Supply resistance', true),
      ...checkResistance(s.outputOhms, joinPath(path, 'outputOhms'), 'Output resistance', true),
    ];
    if (s.idleKpa !== undefined) found.push(...checkFinite(s.idleKpa, joinPath(path, 'idleKpa'), 'Idle manifold pressure'));
    if (!found.length && c.lowKpa === c.highKpa) found.push(finding('sensor.calibration_points_coincide', joinPath(cp, 'highKpa'), 'The calibration pressures must differ.'));
    return found;
  },
  // Manifold pressure moves when the engine runs: at idle the manifold is under vacuum.
  moved: (s, request, path) =>
    request.engine === 'running'
      ? { ok: true, value: { ...s, pressureKpa: s.idleKpa ?? IDLE_MANIFOLD_KPA, restKpa: s.restKpa ?? s.pressureKpa } }
      : { ok: false, findings: [finding('request.input_needs_running_engine', path, 'A pressure sensor\'s input moves with the engine running at idle (manifold vacuum): set engine to running.')] },
  build(netlist, s) {
    netlist.add({ id: 'sensor_supply', kind: 'resistor', nodes: [SENSOR_PIN.reference, SENSOR_PIN.ground], value: s.supplyOhms });
    netlist.add({
      id: 'sensor_output',
      kind: 'vcvs',
      nodes: ['sensor_out', SENSOR_PIN.ground, SENSOR_PIN.reference, SENSOR_PIN.ground],
      value: pressureFraction(s),
      param: { key: 'sensor.fraction', scale: 1 },
    });
    netlist.add({ id: 'sensor_output_r', kind: 'resistor', nodes: ['sensor_out', SENSOR_PIN.signal], value: s.outputOhms });
  },
  applyInternal(netlist, _s, fault, path) {
    const variants: Record<string, () => Finding[]> = {
      open_track: () => (netlist.remove('sensor_output_r'), []),
      stuck: () => {
        if (fault.atRest) {
          if (_s.restKpa !== undefined) setFixed(netlist, 'sensor_output', pressureFraction({ ..._s, pressureKpa: _s.restKpa }));
          return [];
        }
        const found = fault.value === undefined ? [] : checkRange(fault.value, joinPath(path, 'value'), 'Stuck output fraction', 0, 1);
        if (!found.length) setFixed(netlist, 'sensor_output', fault.value ?? 0.5);
        return found;
      },
      skewed: () => {
        const found = fault.value === undefined ? [] : checkRange(fault.value, joinPath(path, 'value'), 'Output fraction skew', -1, 1);
        if (!found.length) setFixed(netlist, 'sensor_output', clamp(pressureFraction(_s) + (fault.value ?? 0.1), 0.02, 0.98));
        return found;
      },
      shorted: () => {
        netlist.remove('sensor_output_r');
        const found = fault.value === undefined ? [] : checkResistance(fault.value, joinPath(path, 'value'), 'Internal short resistance', true);
        if (found.length) return found;
        netlist.add({ id: 'sensor_output_shorted', kind: 'resistor', nodes: [SENSOR_PIN.signal, SENSOR_PIN.ground], value: fault.value ?? 1 });
        return [];
      },
    };
    return variants[fault.variant]?.() ?? notApplicable('pressure', fault, path);
  },
  sample(s, tolerance, u, out) {
    out.set('sensor.fraction', clamp(pressureFraction(s) * (1 + tolerance * u()), 0, 1));
  },
};

const THERMISTOR_MODELS: { [K in ThermistorModel['kind']]: (m: Extract<ThermistorModel, { kind: K }>, t: number) => Result<number> } = {
  steinhart_hart: (m, t) => steinhartHartResistance(t, m),
  beta: (m, t) => betaResistance(t, m),
};
const modelResistance = (model: ThermistorModel, t: number) =>
  (THERMISTOR_MODELS[model.kind] as (m: ThermistorModel, t: number) => Result<number>)(model, t);

/** Thermistor resistance at a temperature from its model (Steinhart–Hart or beta). */
export function thermistorOhms(model: ThermistorModel, temperatureC: number): number | undefined {
  const r = modelResistance(model, temperatureC);
  return r.ok ? r.value : undefined;
}

const thermistor: SensorBehaviour<ThermistorSpec> = {
  validate(s, path) {
    const found = checkFinite(s.temperatureC, joinPath(path, 'temperatureC'), 'Temperature');
    const model = s.model;
    if (!model || !Object.hasOwn(THERMISTOR_MODELS, model.kind)) {
      return [...found, finding('sensor.unknown_thermistor_model', joinPath(path, 'model', 'kind'), 'The thermistor model must be "steinhart_hart" or "beta".')];
    }
    const r = modelResistance(model, s.temperatureC);
    // The calculator names its inputs `temperatureC` and `coefficients.*`; here they live at `temperatureC`, `model.*`.
    if (!r.ok && !found.length) found.push(...r.findings.map((f) => ({ ...f, path: joinPath(path, f.path.replace(/^coefficients/, 'model')) })));
    return found;
  },
  moved: (_s, _r, path) => ({ ok: false, findings: [finding('request.input_not_movable', path, 'A thermistor senses temperature: there is no input to move; leave sensorInput out.')] }),
  build(netlist, s) {
    const ohms = thermistorOhms(s.model, s.temperatureC) ?? Number.NaN;
    netlist.add({ id: 'sensor_ntc', kind: 'resistor', nodes: [SENSOR_PIN.signal, SENSOR_PIN.ground], value: ohms, param: { key: 'sensor.ntc.ohms', scale: 1 } });
  },
  applyInternal(netlist, s, fault, path) {
    const variants: Record<string, () => Finding[]> = {
      open_track: () => (netlist.remove('sensor_ntc'), []),
      shorted: () => {
        const found = fault.value === undefined ? [] : checkResistance(fault.value, joinPath(path, 'value'), 'Internal short resistance', true);
        if (!found.length) setFixed(netlist, 'sensor_ntc', fault.value ?? 1);
        return found;
      },
      stuck: () => {
        const ohms = thermistorOhms(s.model, fault.value ?? 40);
        if (ohms === undefined) return [finding('fault.stuck_temperature_invalid', joinPath(path, 'value'), 'The stuck temperature is outside the thermistor model.')];
        setFixed(netlist, 'sensor_ntc', ohms);
        return [];
      },
      skewed: () => {
        const ohms = thermistorOhms(s.model, s.temperatureC + (fault.value ?? 20));
        if (ohms === undefined) return [finding('fault.skewed_temperature_invalid', joinPath(path, 'value'), 'The skewed temperature is outside the thermistor model.')];
        // Reads as a sensor `value` °C warmer, its part tolerance kept: the sampled resistance scaled by R(T + skew)/R(T).
        const e = netlist.get('sensor_ntc');
        const nominal = thermistorOhms(s.model, s.temperatureC);
        if (e?.param && nominal) [e.value, e.param.scale] = [ohms, ohms / nominal];
        else setFixed(netlist, 'sensor_ntc', ohms);
        return [];
      },
    };
    return variants[fault.variant]?.() ?? notApplicable('thermistor', fault, path);
  },
  sample(s, tolerance, u, out) {
    const ohms = thermistorOhms(s.model, s.temperatureC);
    if (ohms !== undefined) out.set('sensor.ntc.ohms', ohms * (1 + tolerance * u()));
  },
};

export const SENSOR_BEHAVIOURS: { [K in SensorKind]: SensorBehaviour<Extract<SensorSpec, { kind: K }>> } = {
  potentiometer,
  pressure,
  thermistor,
};

/** The behaviour of a sensor spec, typed loosely for shared code. */
export function sensorBehaviour(spec: SensorSpec): SensorBehaviour | undefined {
  return (SENSOR_BEHAVIOURS as Record<string, SensorBehaviour | undefined>)[spec?.kind];
}
