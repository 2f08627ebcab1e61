/** One plain sentence per cavity saying why it got its role, built from the readings it actually has. */
import { biasOhmsFromReading, sourceOhmsFromTwoLoads } from '../calc/meter-loading';
import { DEFAULT_METER_INPUT_OHMS, loadOf, type CavityReadings, type Role } from './roles';

const volts = (v: number) => `${v.toFixed(2)} V`;
const trim = (x: number) => String(Number(x.toPrecision(3)));
function ohms(r: number | 'open'): string {
  if (r === 'open') return 'open (overload)';
  if (r >= 1e6) return `${trim(r / 1e6)} MΩ`;
  if (r >= 1e3) return `${trim(r / 1e3)} kΩ`;
  return `${trim(r)} Ω`;
}
/** Below this drop a meter-loading estimate of the source resistance is mostly rounding, V. */
const MEANINGFUL_DROP = 0.05;

const keyOn = (c: CavityReadings) => (c.volts !== undefined ? `reads ${volts(c.volts)} key on` : 'has no key-on reading');
const keyOff = (c: CavityReadings) => (c.ohms !== undefined ? `, ${ohms(c.ohms)} to battery negative key off` : '');

/** Source resistance shown by the loaded reading, when the drop is large enough to mean something. */
function loadedSource(c: CavityReadings): number | undefined {
  if (c.volts === undefined || !c.loaded || c.volts - c.loaded.volts < MEANINGFUL_DROP) return undefined;
  const r = sourceOhmsFromTwoLoads({
    volts1: c.volts,
    load1Ohms: loadOf(c.meterOhms, undefined),
    volts2: c.loaded.volts,
    load2Ohms: loadOf(c.loaded.meterOhms, c.loaded.parallelOhms),
  });
  return r.ok ? r.value : undefined;
}

const REASONS: Record<Role, (c: CavityReadings, vreg: number) => string> = {
  reference: (c) => {
    const held = c.loaded ? ` and still ${volts(c.loaded.volts)} under the added load` : '';
    return `Cavity ${c.cavity} ${keyOn(c)}${held}${keyOff(c)}: a stiff, regulated 5 V source, the 5 V reference.`;
  },
  signal_pull_up(c, vreg) {
    const source = loadedSource(c);
    if (source !== undefined) {
      return `Cavity ${c.cavity} falls from ${volts(c.volts!)} to ${volts(c.loaded!.volts)} under the added load, a source of about ${ohms(source)}${keyOff(c)}: a signal input biased up to 5 V.`;
    }
    if (c.volts !== undefined && vreg - c.volts >= MEANINGFUL_DROP) {
      const meterOhms = loadOf(c.meterOhms, undefined);
      const bias = biasOhmsFromReading({ openVolts: vreg, readVolts: c.volts, meterOhms });
      const biasText = bias.ok && bias.value > 0 ? `, about ${ohms(bias.value)} of bias` : '';
      return `Cavity ${c.cavity} ${keyOn(c)}, pulled below the ${volts(vreg)} reference by the ${ohms(c.meterOhms ?? DEFAULT_METER_INPUT_OHMS)} meter${biasText}${keyOff(c)}: a signal input biased up to 5 V.`;
    }
    return `Cavity ${c.cavity} ${keyOn(c)}${keyOff(c)}, held near 5 V through the module's pull-up: a signal input biased up to 5 V.`;
  },
  signal_pull_down(c) {
    if (c.ohms === 'open') return `Cavity ${c.cavity} ${keyOn(c)}${keyOff(c)}: a signal input with no bias.`;
    if (c.ohms !== undefined) return `Cavity ${c.cavity} ${keyOn(c)}${keyOff(c)}, too much resistance for a ground: a signal input biased to ground.`;
    return `Cavity ${c.cavity} ${keyOn(c)}, as a signal input biased to ground (or unbiased) would; without an ohms reading it looks much like a ground.`;
  },
  ground: (c) =>
    c.ohms !== undefined
      ? `Cavity ${c.cavity} ${keyOn(c)}${keyOff(c)}, next to no resistance to battery negative: the sensor ground.`
      : `Cavity ${c.cavity} ${keyOn(c)}, as the sensor ground does; an ohms reading to battery negative would confirm it.`,
  not_identified: (c) => `Cavity ${c.cavity} ${keyOn(c)}${keyOff(c)}, which fits none of the roles well: not identified.`,
};

export function reasonFor(role: Role, c: CavityReadings, vreg: number): string {
  return REASONS[role](c, vreg);
}
