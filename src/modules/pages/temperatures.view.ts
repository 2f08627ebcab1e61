/**
 * The test screen's temperature panel, for thermistor circuits: the temperatures the technician knows (ambient,
 * cold soak) weigh the scan temperatures' plausibility, and a reading at the sensor's own pins is set against a
 * chart at the known temperature. A plain GET form: the page recomputes with what was given.
 */
import { CHART_TEMPERATURE_RANGE_C, compareWithChart, DEFAULT_CHART_TOLERANCE_PERCENT, DEFAULT_TEMPERATURE_SPREAD_C } from '../../engine/calc';
import { THERMISTOR_CURVES, thermistorCurve } from '../../engine/circuit';
import { AMBIENT_RANGE_C, type ScanConditions } from '../../engine/diagnosis';
import type { MeasurementRow } from '../measurements/measurements.repository';
import type { CircuitDiagnosis } from './bay.service';
import { html, type SafeHtml } from './html';
import { ICON } from './layout.view';
import { formatSi } from './words';

/** What the panel's form sent, checked: the engine's conditions, the chart and the known temperature, and what was refused. */
export interface TemperatureInput {
  conditions?: ScanConditions;
  chart?: string;
  knownC?: number;
  errors: string[];
}

const CURVE_WORDS: Record<string, string> = {
  generic_10k_steinhart_hart: '10 kΩ at 25 °C, Steinhart–Hart',
  generic_10k_beta_3950: '10 kΩ at 25 °C, β 3950 K',
  generic_10k_beta_3435: '10 kΩ at 25 °C, β 3435 K',
  generic_2k2_beta_3500: '2.2 kΩ at 25 °C, β 3500 K',
};

function number(text: unknown, what: string, range: { min: number; max: number }, errors: string[]): number | undefined {
  if (typeof text !== 'string' || text.trim() === '') return undefined;
  const n = Number(text.trim().replace('−', '-'));
  if (Number.isFinite(n) && n >= range.min && n <= range.max) return n;
  errors.push(`${what}: expected a number of °C from ${range.min} to ${range.max}, got "${text.slice(0, 20)}".`);
  return undefined;
}

/** Reads the panel's query fields: `ambientC`, `coldSoaked`, `chart`, `knownC`. */
export function temperatureInput(query: Record<string, unknown>): TemperatureInput {
  const errors: string[] = [];
  const ambientC = number(query.ambientC, 'Air temperature', AMBIENT_RANGE_C, errors);
  const coldSoaked = query.coldSoaked === 'true' ? true : undefined;
  const chart = typeof query.chart === 'string' && query.chart !== '' ? query.chart : undefined;
  if (chart !== undefined && !thermistorCurve(chart)) errors.push(`Chart: expected one of ${THERMISTOR_CURVES.map((c) => c.id).join(', ')}.`);
  const knownC = number(query.knownC, 'Sensor temperature', CHART_TEMPERATURE_RANGE_C, errors) ?? (coldSoaked ? ambientC : undefined);
  const conditions = ambientC === undefined && !coldSoaked ? undefined : { ...(ambientC === undefined ? {} : { ambientC }), ...(coldSoaked ? { coldSoaked } : {}) };
  return { conditions, chart: chart && thermistorCurve(chart) ? chart : undefined, knownC, errors };
}

/** The latest live ohms reading at the sensor's own pins. */
function latestPinsReading(readings: readonly MeasurementRow[]): MeasurementRow | undefined {
  return readings.filter((m) => m.location === 'sensor_pins' && m.quantity === 'ohms' && !m.supersededBy).sort((a, b) => b.takenAt.getTime() - a.takenAt.getTime())[0];
}

function chartResult(c: CircuitDiagnosis, input: TemperatureInput): SafeHtml {
  const reading = latestPinsReading(c.readings);
  if (!reading) return html`<p class="muted">No reading at the sensor's own pins yet: ohm the sensor unplugged, then compare it here.</p>`;
  const curve = input.chart ? thermistorCurve(input.chart) : undefined;
  if (!curve || input.knownC === undefined) return html`<p class="muted">Choose the sensor's chart and give the temperature it sits at to compare ${formatSi(reading.overload ? 'overload' : reading.valueSi, 'Ω')} with it.</p>`;
  const r = compareWithChart({ ohms: reading.overload ? 'overload' : (reading.valueSi as number), temperatureC: input.knownC, model: curve.model });
  if (!r.ok) return html`<p class="form-error" role="alert">${r.findings.map((f) => f.message).join(' ')}</p>`;
  const v = r.value;
  return html`<dl class="conditions chart-compare">
      <div class="condition"><dt>Chart at ${input.knownC} °C</dt><dd>${formatSi(v.expectedOhms, 'Ω')}</dd></div>
      <div class="condition"><dt>Within tolerance</dt><dd>${formatSi(v.lowOhms, 'Ω')} to ${formatSi(v.highOhms, 'Ω')}</dd></div>
      <div class="condition"><dt>Reading</dt><dd>${formatSi(reading.overload ? 'overload' : reading.valueSi, 'Ω')}</dd></div>
    </dl>
    <p class="${v.verdict === 'within' ? '' : 'notice'}">${v.verdict === 'within' ? ICON.check : ICON.flag} ${v.finding.message}</p>
    <p class="muted">Chart: ${curve.source}. Tolerance ±${DEFAULT_CHART_TOLERANCE_PERCENT} % and ±${DEFAULT_TEMPERATURE_SPREAD_C} °C on the temperature you know (common practice, no source).</p>`;
}

/** The panel; only thermistor circuits have one. */
export function temperaturePanel(c: CircuitDiagnosis, input: TemperatureInput): SafeHtml {
  if (c.circuit.kind !== 'two_wire_thermistor') return html``;
  const flagged = c.diagnosis.findings.filter((f) => f.code.startsWith('scan_temperature.'));
  const ambient = input.conditions?.ambientC;
  return html`<section class="panel" aria-labelledby="temps-h"><h2 id="temps-h">Temperatures you know</h2>
    ${input.errors.map((e) => html`<p class="form-error" role="alert">${e}</p>`)}
    ${flagged.map((f) => html`<p class="notice">${ICON.flag} ${f.message}</p>`)}
    <form method="get" class="form temps-form">
      <div class="field"><label for="ambient-c">Air around the vehicle, °C</label><input id="ambient-c" name="ambientC" inputmode="decimal" value="${ambient === undefined ? '' : String(ambient)}"></div>
      <label class="check"><input type="checkbox" name="coldSoaked" value="true" ${input.conditions?.coldSoaked ? 'checked' : ''}> Cold-soaked: the engine has stood overnight</label>
      <div class="field"><label for="chart-id">Sensor's chart</label><select id="chart-id" name="chart"><option value="">choose</option>
        ${THERMISTOR_CURVES.map((k) => html`<option value="${k.id}" ${k.id === input.chart ? 'selected' : ''}>${CURVE_WORDS[k.id] ?? k.id}</option>`)}</select></div>
      <div class="field"><label for="known-c">Sensor's temperature, °C (blank: the air, when cold-soaked)</label><input id="known-c" name="knownC" inputmode="decimal" value="${input.knownC === undefined ? '' : String(input.knownC)}"></div>
      <button class="button" type="submit">Check</button>
    </form>
    <h3>Sensor at its own pins against its chart</h3>
    ${chartResult(c, input)}
  </section>`;
}
