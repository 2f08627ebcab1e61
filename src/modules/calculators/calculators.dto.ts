import { z } from 'zod';
import { DEFAULT_GROUND_DROP_LIMIT_VOLTS, DEFAULT_REFERENCE_LIMITS } from '../../engine/calc';
import { GENERIC_10K_STEINHART_HART, THERMISTOR_CURVES } from '../../engine/circuit';
import { DEFAULT_METER_OHMS } from '../../engine/vocabulary';
import { kpa, ohms, positiveOhms, volts } from './quantities';

const meterOhms = positiveOhms('Meter input resistance on DC volts').default(DEFAULT_METER_OHMS).describe('meter input resistance, Ω (default 10 MΩ)');

export const BiasResistance = z.strictObject({
  openVolts: volts('What the input shows unloaded: the 5 V rail it is biased to').default(5),
  readVolts: volts('What the meter shows on the biased input'),
  meterOhms,
  measuredOhms: ohms('An ohms reading of the same path, to compare').optional(),
});
export type BiasResistance = z.output<typeof BiasResistance>;

export const MeterLoading = z.strictObject({
  sourceVolts: volts('Open-circuit voltage of the source'),
  sourceOhms: ohms('Source (Thevenin) resistance'),
  meterOhms,
});
export type MeterLoading = z.output<typeof MeterLoading>;

const ReferenceLimits = z
  .strictObject({
    nominalVolts: volts('Nominal reference').default(DEFAULT_REFERENCE_LIMITS.nominalVolts),
    toleranceVolts: z.number().min(0, 'a tolerance of 0 V or more').max(5).default(DEFAULT_REFERENCE_LIMITS.toleranceVolts),
    recoveryVolts: volts('A released reference must come back to at least').default(DEFAULT_REFERENCE_LIMITS.recoveryVolts),
  })
  .describe('common practice, no published source: 5.00 ± 0.10 V, recovery to 4.8 V');

export const ReferenceLoad = z.strictObject({
  openVolts: volts('The reference unloaded (meter only)'),
  loadedVolts: volts('The reference under the known load'),
  loadOhms: positiveOhms('The known load: meter input, resistor, or an ammeter shunt'),
  releasedVolts: volts('The reference after the load is taken off').optional(),
  limits: ReferenceLimits.default({ ...DEFAULT_REFERENCE_LIMITS }),
});
export type ReferenceLoad = z.output<typeof ReferenceLoad>;

export const VoltageDrop = z.strictObject({
  dropVolts: volts('Voltage drop measured along the wire while it carries current'),
  limitVolts: z.number().positive('a drop limit above 0 V').max(100).default(DEFAULT_GROUND_DROP_LIMIT_VOLTS).describe('pass when |drop| ≤ limit, V (default 0.1 V, common practice, no source)'),
  amps: z.number().min(-1000).max(1000).refine((a) => a !== 0, 'a current other than 0 A').optional().describe('the current the wire carried, A: gives the wire resistance'),
});
export type VoltageDrop = z.output<typeof VoltageDrop>;

const ThermistorModel = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('steinhart_hart'), a: z.number(), b: z.number(), c: z.number() }).describe('Steinhart–Hart 1/T = A + B·ln R + C·(ln R)³, T in K'),
  z.strictObject({ kind: z.literal('beta'), r25Ohms: positiveOhms('Resistance at 25 °C'), beta: z.number().describe('beta, K') }).describe('R = R25·exp(β·(1/T − 1/298.15 K))'),
]);

export const Thermistor = z
  .strictObject({
    model: ThermistorModel.default({ ...GENERIC_10K_STEINHART_HART }).describe('default: the widely published generic 10 kΩ Steinhart–Hart set'),
    temperatureC: z.number().optional().describe('give one of temperatureC, ohms or volts'),
    ohms: z.number().optional().describe('thermistor resistance, Ω'),
    volts: z.number().optional().describe('the voltage at the module input (needs divider)'),
    divider: z
      .strictObject({ supplyVolts: volts('Module supply behind the pull-up').default(5), pullUpOhms: positiveOhms('Module pull-up') })
      .optional()
      .describe('the module pull-up: adds the divider voltage to the answer'),
  })
  .superRefine((t, ctx) => {
    const given = (['temperatureC', 'ohms', 'volts'] as const).filter((k) => t[k] !== undefined);
    if (given.length !== 1) {
      ctx.addIssue({ code: 'custom', path: given.length ? [given[1]!] : [], message: 'give exactly one of temperatureC, ohms or volts' });
    }
    if (t.volts !== undefined && !t.divider) ctx.addIssue({ code: 'custom', path: ['divider'], message: 'a voltage needs the divider it was read on: divider.pullUpOhms' });
  });
export type Thermistor = z.output<typeof Thermistor>;

const CHART_IDS = THERMISTOR_CURVES.map((c) => c.id) as [string, ...string[]];

export const ThermistorChart = z
  .strictObject({
    chart: z.enum(CHART_IDS).optional().describe('a catalogued chart (src/engine/circuit/thermistor-curves.ts); or give model'),
    model: ThermistorModel.optional().describe("the sensor's chart as an equation; or give chart"),
    ohms: z.union([z.number(), z.literal('overload')]).describe("the reading at the sensor's own pins, Ω, or \"overload\" (OL)"),
    temperatureC: z.number().describe('the temperature the sensor sits at, as the technician knows it (air, cold-soaked engine, thermometer)'),
    tolerancePercent: z.number().optional().describe("the chart's tolerance, % (default 5: common practice, no source)"),
    temperatureSpreadC: z.number().optional().describe('how well the temperature is known, ±°C (default 3: common practice, no source)'),
  })
  .superRefine((t, ctx) => {
    if ((t.chart === undefined) === (t.model === undefined)) ctx.addIssue({ code: 'custom', path: ['chart'], message: 'give exactly one of chart or model' });
  });
export type ThermistorChart = z.output<typeof ThermistorChart>;

const CalibrationPoint = z.strictObject({ volts: volts('Sensor output'), kpa: kpa('Pressure') });

export const Pressure = z
  .strictObject({
    sensor: z
      .strictObject({
        points: z.tuple([CalibrationPoint, CalibrationPoint]).describe('two calibration points of a linear sensor'),
        volts: volts('A sensor output to turn into kPa').optional(),
        kpa: kpa('A pressure to turn into the sensor output').optional(),
      })
      .refine((s) => s.volts === undefined || s.kpa === undefined, { message: 'give volts or kpa, not both', path: ['kpa'] })
      .optional(),
    vacuum: z
      .strictObject({
        baroKpa: kpa('Barometric pressure (scan PID 33, or a barometer)'),
        vacuumInHg: z.number().optional().describe('gauge vacuum, inHg'),
        absoluteKpa: kpa('Absolute pressure').optional(),
      })
      .refine((v) => (v.vacuumInHg === undefined) !== (v.absoluteKpa === undefined), { message: 'give exactly one of vacuumInHg or absoluteKpa', path: ['vacuumInHg'] })
      .optional(),
    convert: z
      .strictObject({ value: z.number(), unit: z.string().max(16).describe('Pa, kPa, inHg or psi (as typed: "in hg", "PSI" …)') })
      .optional()
      .describe('a pressure in any of Pa, kPa, inHg, psi, into all of them (NIST SP 811 appendix B)'),
  })
  .refine((p) => p.sensor || p.vacuum || p.convert, { message: 'give at least one of sensor, vacuum or convert' });
export type Pressure = z.output<typeof Pressure>;

const Bytes = z.union([z.string().max(64), z.array(z.number()).max(16)]).describe('hex text such as "1A F8", or a list of numbers 0–255');

export const ScanDecode = z.strictObject({
  pid: z.union([z.string().max(8), z.number()]).describe('SAE J1979 mode 01 PID as hex text ("0C") or a number (12)'),
  bytes: Bytes.describe('the data bytes after the mode and PID echo'),
});
export type ScanDecode = z.output<typeof ScanDecode>;

export const TroubleCode = z
  .strictObject({
    bytes: Bytes.optional().describe('the two raw bytes of a stored code, e.g. "C1 58"'),
    code: z.string().max(16).optional().describe('a code as typed, e.g. "p0122"'),
  })
  .refine((t) => (t.bytes === undefined) !== (t.code === undefined), { message: 'give exactly one of bytes or code', path: ['code'] });
export type TroubleCode = z.output<typeof TroubleCode>;
