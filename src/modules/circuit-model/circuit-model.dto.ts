import { z } from 'zod';
import { CircuitKindEnum, MeasurementRequestSchema } from '../../common/validation/domain-schemas';
import {
  CIRCUIT_LAYOUTS,
  HYPOTHESIS_IDS,
  MODULE_INTERNAL_VARIANTS,
  SENSOR_INTERNAL_VARIANTS,
  WIRE_ROLES,
  type HypothesisId,
} from '../../engine/circuit';
import { ohms, positiveOhms, volts } from '../calculators/quantities';

const WireRoleEnum = z.enum(WIRE_ROLES);

const ThermistorModel = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('steinhart_hart'), a: z.number(), b: z.number(), c: z.number() }).describe('Steinhart–Hart 1/T = A + B·ln R + C·(ln R)³, T in K'),
  z.strictObject({ kind: z.literal('beta'), r25Ohms: positiveOhms('Resistance at 25 °C'), beta: z.number().positive('beta in kelvin, above 0') }),
]);

const SensorOverrides = z.discriminatedUnion('kind', [
  z.strictObject({
    kind: z.literal('potentiometer'),
    trackOhms: positiveOhms('Track resistance').optional(),
    position: z.number().min(0, 'a wiper position from 0 (ground end)').max(1, 'to 1 (reference end)').optional(),
    wiperOhms: positiveOhms('Wiper resistance').optional(),
  }),
  z.strictObject({
    kind: z.literal('pressure'),
    pressureKpa: z.number().optional().describe('absolute pressure the sensor sees, kPa'),
    calibration: z
      .strictObject({ lowKpa: z.number(), lowFraction: z.number().min(0).max(1), highKpa: z.number(), highFraction: z.number().min(0).max(1) })
      .optional()
      .describe('output as a fraction of the 5 V supply at two pressures'),
    supplyOhms: positiveOhms('Supply draw as a resistance').optional(),
    outputOhms: positiveOhms('Output resistance').optional(),
  }),
  z.strictObject({
    kind: z.literal('thermistor'),
    model: ThermistorModel.optional(),
    temperatureC: z.number().gt(-273.15, 'a temperature above absolute zero (−273.15 °C)').optional(),
  }),
]);

const BiasSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('pull_up'), ohms: positiveOhms('Bias resistance') }),
  z.strictObject({ kind: z.literal('pull_down'), ohms: positiveOhms('Bias resistance') }),
  z.strictObject({ kind: z.literal('none') }),
]);

/**
 * The default circuit of `kind` with any part overridden; the shape is the engine's `CircuitSpec`. Objects merge
 * field by field; `wires` replaces the whole list; a tagged part (bias, sensor, thermistor model) of another kind
 * replaces the default one.
 */
export const CircuitOverrides = z
  .strictObject({
    kind: CircuitKindEnum,
    battery: z
      .strictObject({
        keyOffVolts: volts('Battery, key off').optional(),
        volts: z.strictObject({ off: volts('Battery, engine off').optional(), cranking: volts('Battery, cranking').optional(), running: volts('Battery, running').optional() }).optional(),
        internalOhms: positiveOhms('Battery internal resistance').optional(),
      })
      .optional(),
    module: z
      .strictObject({
        regulator: z
          .strictObject({
            volts: volts('Regulated output').optional(),
            outputOhms: positiveOhms('Regulator output resistance').optional(),
            offOhms: positiveOhms('Regulator output to ground, key off').optional(),
            minInputVolts: volts('Regulator drop-out input').optional(),
          })
          .optional(),
        bias: BiasSchema.optional().describe('signal-input bias; for a thermistor circuit the pull-up'),
        inputFilterOhms: positiveOhms('Input filter resistance').optional(),
        groundOhms: positiveOhms('Module ground resistance').optional(),
        sensorGroundOhms: positiveOhms('Sensor-ground resistance inside the module').optional(),
      })
      .optional(),
    wires: z
      .array(z.strictObject({ role: WireRoleEnum, ohms: ohms('Wire resistance') }))
      .max(8)
      .optional()
      .describe('the whole harness: each wire of the kind exactly once (three_wire_5v: reference, signal, ground; two_wire_thermistor: signal, ground)'),
    contactOhms: positiveOhms('Contact resistance').optional(),
    chassisGroundOhms: positiveOhms('Chassis ground resistance').optional(),
    sensor: SensorOverrides.optional().describe('three_wire_5v: potentiometer (default) or pressure; two_wire_thermistor: thermistor'),
  })
  .superRefine((c, ctx) => {
    const allowed = CIRCUIT_LAYOUTS[c.kind].sensors;
    if (c.sensor && !allowed.includes(c.sensor.kind)) {
      ctx.addIssue({ code: 'custom', path: ['sensor', 'kind'], message: `a ${c.kind} circuit carries ${allowed.join(' or ')}, not ${c.sensor.kind}` });
    }
  });
export type CircuitOverrides = z.output<typeof CircuitOverrides>;

const FaultSchema = z.discriminatedUnion('kind', [
  z.strictObject({ kind: z.literal('open'), wire: WireRoleEnum }),
  z.strictObject({ kind: z.literal('short_to_ground'), wire: WireRoleEnum, ohms: positiveOhms('Short resistance').optional() }),
  z.strictObject({ kind: z.literal('short_to_voltage'), wire: WireRoleEnum, ohms: positiveOhms('Short resistance').optional() }),
  z.strictObject({ kind: z.literal('short_between'), wires: z.tuple([WireRoleEnum, WireRoleEnum]), ohms: positiveOhms('Short resistance').optional() }),
  z.strictObject({ kind: z.literal('high_resistance'), wire: WireRoleEnum, ohms: positiveOhms('Added series resistance') }),
  z.strictObject({ kind: z.literal('sensor_internal'), variant: z.enum(SENSOR_INTERNAL_VARIANTS), value: z.number().optional() }),
  z.strictObject({ kind: z.literal('module_internal'), variant: z.enum(MODULE_INTERNAL_VARIANTS), ohms: positiveOhms('Fault resistance').optional() }),
]);

const Accuracy = z.strictObject({ percent: z.number().min(0).max(100), digits: z.number().min(0).max(1000) });

export const MeterOverrides = z
  .strictObject({
    inputOhms: positiveOhms('Meter input resistance on DC volts').optional(),
    shuntOhms: positiveOhms('Meter shunt resistance on amps').optional(),
    ohmsTestAmps: z.number().positive('an ohms test current above 0 A').max(1).optional(),
    maxOhms: positiveOhms('Top of the ohms range').optional(),
    counts: z.number().int().min(1).max(1_000_000).optional(),
    accuracy: z.strictObject({ dc_volts: Accuracy.optional(), ohms: Accuracy.optional(), amps: Accuracy.optional() }).optional(),
  })
  .describe('overrides of the default meter: 10 MΩ input, 6000 counts, ±(0.5 % + 2 digits) on volts');

export const HypothesisEnum = z.enum(HYPOTHESIS_IDS as [HypothesisId, ...HypothesisId[]]);

const FaultSet = z.strictObject({
  name: z
    .string()
    .regex(/^[a-z][a-z0-9_]{0,39}$/, 'a name of lower-case letters, digits and "_", starting with a letter (at most 40)')
    .refine((n) => n !== 'good', '"good" names the healthy circuit'),
  faults: z.array(FaultSchema).min(1, 'at least one fault').max(6, 'at most 6 faults at once'),
});

const choice = {
  circuit: CircuitOverrides,
  request: MeasurementRequestSchema,
  meter: MeterOverrides.optional(),
  hypotheses: z
    .array(HypothesisEnum)
    .max(HYPOTHESIS_IDS.length)
    .optional()
    .describe('root-cause hypothesis ids; with neither hypotheses nor faultSets, every hypothesis that applies to the circuit'),
  faultSets: z.array(FaultSet).max(20, 'at most 20 fault sets').optional().describe('faults of your own, each set under a name'),
};

function uniqueNames(v: { hypotheses?: string[]; faultSets?: Array<{ name: string }> }, ctx: z.RefinementCtx): void {
  const seen = new Set<string>();
  v.hypotheses?.forEach((id, i) => {
    if (seen.has(id)) ctx.addIssue({ code: 'custom', path: ['hypotheses', i], message: `hypothesis ${id} is listed twice` });
    seen.add(id);
  });
  v.faultSets?.forEach((set, i) => {
    if (seen.has(set.name)) ctx.addIssue({ code: 'custom', path: ['faultSets', i, 'name'], message: `the name ${set.name} is already used` });
    seen.add(set.name);
  });
}

export const PredictionBody = z.strictObject(choice).superRefine(uniqueNames);
export type PredictionBody = z.output<typeof PredictionBody>;

/** At most this many samples per row; the rows together are capped by MAX_SAMPLE_SOLVES. */
export const MAX_SAMPLES = 20_000;
/** Samples × rows per request (about a second of solving), so that one request cannot hold up the server. */
export const MAX_SAMPLE_SOLVES = 100_000;

const Range = z.tuple([z.number(), z.number()]).refine(([lo, hi]) => lo <= hi, 'a range [min, max] with min ≤ max');

export const BandsBody = z
  .strictObject({
    ...choice,
    bands: z
      .array(
        z.strictObject({
          id: z.string().regex(/^[a-z][a-z0-9_]{0,39}$/, 'a band id of lower-case letters, digits and "_"').refine((id) => id !== 'other', '"other" counts the readings in no band'),
          min: z.number().optional().describe('inclusive, in the reading unit'),
          max: z.number().optional().describe('exclusive, in the reading unit; an open top band also catches an overload'),
        }),
      )
      .min(1, 'at least one band')
      .max(12, 'at most 12 bands'),
    samples: z.number().int().min(1).max(MAX_SAMPLES, `at most ${MAX_SAMPLES} samples per row`).default(2000),
    seed: z.number().int().min(0).max(0xffffffff, 'a 32-bit unsigned seed').default(1).describe('the same seed gives the same answer'),
    spreads: z
      .strictObject({
        wireOhms: Range.optional().describe('each wire, Ω'),
        biasOhms: Range.optional().describe('bias or pull-up, Ω'),
        regulatorVolts: Range.optional(),
        batteryVolts: z.number().min(0).max(5).optional().describe('± V around nominal'),
        sensorTolerance: z.number().min(0).max(0.5).optional().describe('± fraction of span'),
        meterError: z.boolean().optional().describe("add the meter's stated error"),
      })
      .optional()
      .describe('part spreads, each drawn uniformly; defaults: wires 0.05–0.3 Ω, bias ±20 % (thermistor pull-up ±1 %), regulator ±0.1 V, battery ±0.2 V, sensor ±2 %, meter error on'),
  })
  .superRefine(uniqueNames)
  .superRefine((v, ctx) => {
    const seen = new Set<string>();
    v.bands.forEach((b, i) => {
      if (seen.has(b.id)) ctx.addIssue({ code: 'custom', path: ['bands', i, 'id'], message: `band ${b.id} is listed twice` });
      seen.add(b.id);
      if (b.min !== undefined && b.max !== undefined && b.min >= b.max) ctx.addIssue({ code: 'custom', path: ['bands', i, 'max'], message: 'max must exceed min' });
    });
  });
export type BandsBody = z.output<typeof BandsBody>;

const CavityName = z
  .string()
  .trim()
  .min(1, 'a cavity name such as "A" or "3"')
  .max(8, 'a cavity name of at most 8 characters')
  .regex(/^[A-Za-z0-9]+$/, 'letters and digits only, e.g. "A" or "3"');

export const IdentifyWiresBody = z
  .strictObject({
    circuitKind: CircuitKindEnum.optional().describe('by default two cavities mean a thermistor, more a three-wire 5 V sensor'),
    cavities: z
      .array(
        z.strictObject({
          cavity: CavityName,
          volts: volts('Key on, connector unplugged, cavity to battery negative').optional(),
          meterOhms: positiveOhms('Input resistance of the meter used for volts (default 10 MΩ)').optional(),
          loaded: z
            .strictObject({
              volts: volts('The same reading under a different load'),
              meterOhms: positiveOhms('Input resistance of the meter used').optional(),
              parallelOhms: positiveOhms('Resistor put across the meter leads').optional(),
            })
            .optional(),
          ohms: z
            .union([ohms('Key off, cavity to battery negative'), z.literal('open')])
            .optional()
            .describe('key off, cavity to battery negative, Ω; "open" when the meter shows overload'),
        }),
      )
      .min(1, 'at least one cavity')
      .max(8, 'at most 8 cavities'),
  });
export type IdentifyWiresBody = z.output<typeof IdentifyWiresBody>;
