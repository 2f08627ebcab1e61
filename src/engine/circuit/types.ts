/**
 * Tagged data describing a sensor circuit, its faults and the meter. Everything here is plain JSON so a circuit
 * can be stored, posted and compared; behaviour lives in registries keyed by `kind`.
 */
import type { CircuitKind, EngineState } from '../vocabulary';

/** The wires of the harness between module connector and sensor connector. */
export const WIRE_ROLES = ['reference', 'signal', 'ground'] as const;
export type WireRole = (typeof WIRE_ROLES)[number];

export interface WireSpec {
  role: WireRole;
  /** End-to-end resistance of the wire, Ω (a few tens of mΩ for a healthy wire). */
  ohms: number;
}

/** The module's signal-input bias: pull-up to its 5 V rail, pull-down to its ground, or none. */
export type BiasSpec = { kind: 'pull_up'; ohms: number } | { kind: 'pull_down'; ohms: number } | { kind: 'none' };

export interface BatterySpec {
  /** Terminal voltage by engine state with the key on; `keyOffVolts` with the key off. */
  keyOffVolts: number;
  volts: Record<EngineState, number>;
  internalOhms: number;
}

export interface RegulatorSpec {
  /** Regulated output with the key on, V. */
  volts: number;
  /** Thevenin output resistance while regulating, Ω. */
  outputOhms: number;
  /** With the key off the output is unpowered and sits on this resistance to module ground, Ω. */
  offOhms: number;
  /**
   * Below this battery voltage the regulator drops out: its output follows the battery less the headroom it needs
   * (`minInputVolts − volts`, 1 V for a 5 V output that needs 6 V). A failing supply that needs more headroom holds
   * 5 V at 12 V but falls while the engine cranks.
   */
  minInputVolts: number;
  /** Most current the 5 V output delivers; above it the output sags to hold this current, A (absent: no limit). */
  currentLimitAmps?: number;
}

export interface ModuleSpec {
  regulator: RegulatorSpec;
  bias: BiasSpec;
  /** Series resistance between the signal pin and the converter node the module reads, Ω. */
  inputFilterOhms: number;
  /** Module case/ground strap to battery negative, Ω. */
  groundOhms: number;
  /** Inside the module, between its ground and its sensor-ground pin, Ω. */
  sensorGroundOhms: number;
  /** What the module itself draws with the key on, through its own ground (a resistive ground shows as an offset), A. */
  supplyAmps?: number;
}

/** Three-wire position sensor: resistive track between reference and ground, wiper on the signal pin. */
export interface PotentiometerSpec {
  kind: 'potentiometer';
  trackOhms: number;
  /** Wiper position as a fraction of the track from the ground end (0…1). */
  position: number;
  wiperOhms: number;
  /** Wiper position with the input moved fully (pedal or throttle pressed); absent: 0.85 from a rest below mid-track, else 0.15. */
  fullTravelPosition?: number;
  /** Set by the model when the input is moved: where the wiper sits at rest (a stuck or worn sensor stays there). */
  restPosition?: number;
}

/** Linear three-wire pressure sensor: ratiometric output stage behind an output resistance. */
export interface PressureSpec {
  kind: 'pressure';
  pressureKpa: number;
  /** Two calibration points: output as a fraction of supply at two pressures. */
  calibration: { lowKpa: number; lowFraction: number; highKpa: number; highFraction: number };
  /** The supply current draw, modelled as this resistance from reference pin to ground pin, Ω. */
  supplyOhms: number;
  outputOhms: number;
  /** Manifold pressure with the engine running at idle (the input moved), kPa; absent: 35 kPa. */
  idleKpa?: number;
  /** Set by the model when the input is moved: the pressure at rest (a stuck sensor stays there). */
  restKpa?: number;
}

export type ThermistorModel =
  | { kind: 'steinhart_hart'; a: number; b: number; c: number }
  | { kind: 'beta'; r25Ohms: number; beta: number };

/** Two-wire NTC thermistor between signal and ground pins. */
export interface ThermistorSpec {
  kind: 'thermistor';
  model: ThermistorModel;
  temperatureC: number;
}

export type SensorSpec = PotentiometerSpec | PressureSpec | ThermistorSpec;
export type SensorKind = SensorSpec['kind'];

/** A whole sensor circuit: module, harness, connectors, battery and sensor. */
export interface CircuitSpec {
  kind: CircuitKind;
  battery: BatterySpec;
  module: ModuleSpec;
  wires: WireSpec[];
  /** Resistance of one mated terminal pair, Ω. */
  contactOhms: number;
  /** Engine/body ground (the chassis_ground point) to battery negative, Ω. */
  chassisGroundOhms: number;
  sensor: SensorSpec;
}

/** Faults as tagged data; each kind applies itself to the netlist (see faults.ts). */
export type FaultSpec =
  /** Wire broken at its middle; anything else on the wire (a short) sits on the sensor side of the break. */
  | { kind: 'open'; wire: WireRole }
  | { kind: 'short_to_ground'; wire: WireRole; ohms?: number }
  | { kind: 'short_to_voltage'; wire: WireRole; ohms?: number }
  | { kind: 'short_between'; wires: [WireRole, WireRole]; ohms?: number }
  | { kind: 'high_resistance'; wire: WireRole; ohms: number }
  /** `atRest` (stuck only): the output stays where the input sits at rest, whatever `value` says. */
  | { kind: 'sensor_internal'; variant: SensorInternalVariant; value?: number; atRest?: boolean }
  | { kind: 'module_internal'; variant: ModuleInternalVariant; ohms?: number; volts?: number }
  /** The module's own ground strap or splice resistive: its ground, and every reading against it, rises by I × R. */
  | { kind: 'module_ground_resistance'; ohms: number }
  /** A terminal of one wire at one connector with poor fit or corrosion: its contact resistance rises to `ohms`. */
  | { kind: 'poor_terminal'; connector: 'sensor_connector' | 'module_connector'; wire: WireRole; ohms: number };
export type FaultKind = FaultSpec['kind'];

/**
 * `open_track`: the track/element/output stage is open. `worn_spot` (potentiometer): the wiper lost contact at its
 * position (`value` = contact resistance, default 1 MΩ). `stuck`: the output no longer follows the measurand
 * (`value` = wiper position 0…1, default 0.5; output fraction 0…1, default 0.5; or thermistor temperature °C,
 * default 40; with `atRest`, where the input sits at rest, so it reads right until the input moves). `shorted` (pressure, thermistor): output/element shorted to the ground pin (`value` Ω, default 1).
 * `skewed`: reads in range but wrong by `value` (wiper position or output fraction +0.1, or thermistor +20 °C, by default).
 * A worn spot is where the wiper rests: with the input moved the wiper is on sound track again.
 */
export const SENSOR_INTERNAL_VARIANTS = ['open_track', 'worn_spot', 'stuck', 'shorted', 'skewed'] as const;
export type SensorInternalVariant = (typeof SENSOR_INTERNAL_VARIANTS)[number];

/**
 * `dead_regulator`: the 5 V output is at 0 V. `weak_regulator`: output resistance rises to `ohms` (default 500 Ω).
 * `dead_input`: the converter no longer sees the signal pin and reads module ground. `fixed_input`: the converter
 * reads a fixed `volts` (default 2.5 V) whatever the pin does.
 */
export const MODULE_INTERNAL_VARIANTS = ['dead_regulator', 'weak_regulator', 'dead_input', 'fixed_input'] as const;
export type ModuleInternalVariant = (typeof MODULE_INTERNAL_VARIANTS)[number];

/** ±(percent of reading + digits of the range's resolution), as meter makers state accuracy. */
export interface MeterAccuracy {
  percent: number;
  digits: number;
}

export interface MeterSpec {
  /** Input resistance on DC volts, Ω (10 MΩ default). */
  inputOhms: number;
  /** Shunt resistance on amps, Ω. */
  shuntOhms: number;
  /** Test current the ohmmeter injects, A. */
  ohmsTestAmps: number;
  /** Above this the ohmmeter shows overload (open), Ω. */
  maxOhms: number;
  /** Display counts (e.g. 6000): sets the resolution of the auto-ranged reading. */
  counts: number;
  accuracy: { dc_volts: MeterAccuracy; ohms: MeterAccuracy; amps: MeterAccuracy };
}

export type ReadingUnit = 'V' | 'ohm' | 'A';
