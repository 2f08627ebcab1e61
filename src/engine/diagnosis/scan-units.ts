/**
 * Scan values arrive in the unit the scan tool shows; a scan test compares them in the unit it declares (volts at
 * the module's converter). Conversions used, each published:
 * - `%` of the converter's full scale, as SAE J1979 scales a position PID (e.g. PID 0x11: 100·A/255 %): V = % × 5.00 / 100.
 * - `°C` on a thermistor circuit: the sensor's resistance from its curve (Steinhart & Hart, Deep-Sea Research 15,
 *   1968) and the divider with the module's pull-up: V = 5 · Rt / (Rt + Rp) (computed).
 * Anything else is refused, naming the unit the test expects.
 */
import { adcReading, defaultCircuit, MODULE_ADC, thermistorOhms } from '../circuit';
import { requestKey, type TreeRequest } from './request-key';
import type { Test, Tree } from './tree-model';

export type Conversion = { ok: true; value: number; note?: string } | { ok: false; message: string };

const identity = new Set(['V']);

export function scanToTestUnit(tree: Tree, test: Test, value: number, unit: string | undefined): Conversion {
  const expected = test.unit ?? 'V';
  // Two temperature PIDs are compared as the scan tool shows them: in °C, never converted.
  if (expected === '°C')
    return unit === '°C' || unit === undefined ? { ok: true, value } : { ok: false, message: `this comparison subtracts two temperature PIDs in °C; a value in ${unit ?? 'V'} cannot be one of them: read the parameter in °C` };
  if (unit === undefined || identity.has(unit) || unit === expected) return { ok: true, value };
  if (unit === 'mV') return { ok: true, value: value / 1000 };
  if (unit === '%') return { ok: true, value: (value / 100) * MODULE_ADC.fullScaleVolts, note: `${value} % of the converter's 5.00 V full scale (SAE J1979 position scaling)` };
  if (unit === '°C' && tree.circuitKind === 'two_wire_thermistor') {
    const circuit = defaultCircuit('two_wire_thermistor');
    const sensor = circuit.sensor;
    const pullUp = circuit.module.bias.kind === 'pull_up' ? circuit.module.bias.ohms : undefined;
    const rt = sensor.kind === 'thermistor' ? thermistorOhms(sensor.model, value) : undefined;
    if (rt !== undefined && pullUp !== undefined) {
      const volts = adcReading((circuit.module.regulator.volts * rt) / (rt + pullUp));
      return { ok: true, value: volts, note: `${value} °C through the thermistor curve and the ${pullUp / 1000} kΩ pull-up: ${volts.toFixed(3)} V` };
    }
  }
  const accepted = tree.circuitKind === 'two_wire_thermistor' ? 'V, mV, % or °C' : 'V, mV or %';
  return { ok: false, message: `this scan test compares the value in ${expected}; a value in ${unit} has no published conversion here: read the parameter in ${accepted}` };
}

/**
 * Why a scan value in `unit` cannot answer the tree's test for `request` (a message naming the unit expected), or
 * undefined when it can (or the request answers no scan test of the tree, so any unit is kept as recorded).
 */
export function scanUnitRefusal(tree: Tree, request: TreeRequest, unit: string, value = 0): string | undefined {
  if (request.quantity !== 'scan_value') return undefined;
  const key = requestKey(request);
  const test = tree.testByRequest.get(key) ?? tree.halvesByRequest.get(key)?.[0]?.test;
  if (!test) return undefined;
  const c = scanToTestUnit(tree, test, value, unit);
  return c.ok ? undefined : c.message;
}
