/**
 * A thermistor's resistance against its chart: given the ohms read at its pins and the temperature the technician
 * knows (the intake air, the ambient of a cold-soaked engine, a thermometer at the sensor), the chart's resistance
 * at that temperature and whether the reading lies inside the chart's tolerance, widened by how well the
 * temperature is known. An NTC's resistance falls as it warms, so the band runs from R(T + spread)·(1 − tolerance)
 * up to R(T − spread)·(1 + tolerance).
 */
import { checkRange, checkResistance, finding, type Finding, type Result } from './findings';
import { betaResistance, betaTemperature, steinhartHartResistance, steinhartHartTemperature } from './thermistor';

/** A chart as an equation: Steinhart–Hart coefficients or the beta form (the shapes of the circuit model's curves). */
export type ChartModel = { kind: 'steinhart_hart'; a: number; b: number; c: number } | { kind: 'beta'; r25Ohms: number; beta: number };

/** The chart's tolerance on resistance, % (common practice, no source: ±5 % for a sensor's published chart). */
export const DEFAULT_CHART_TOLERANCE_PERCENT = 5;
/** How well a technician knows the sensor's temperature, ±°C (common practice, no source). */
export const DEFAULT_TEMPERATURE_SPREAD_C = 3;
/** Temperatures a chart is asked about: the SAE J1979 PID 05/0F floor up to 150 °C, past any coolant's boil (common practice, no source for the top). */
export const CHART_TEMPERATURE_RANGE_C = { min: -40, max: 150 } as const;

export interface ChartComparisonInput {
  /** The reading at the sensor's pins, Ω, or "overload" (OL). */
  ohms: number | 'overload';
  temperatureC: number;
  model: ChartModel;
  tolerancePercent?: number;
  temperatureSpreadC?: number;
}

export type ChartVerdict = 'within' | 'below' | 'above';

export interface ChartComparison {
  expectedOhms: number;
  lowOhms: number;
  highOhms: number;
  verdict: ChartVerdict;
  /** The temperature the chart gives for the reading (none for OL or 0 Ω). */
  readingTemperatureC?: number;
  /** The comparison in plain words, as a finding (`chart.within`, `chart.below`, `chart.above`) on `ohms`. */
  finding: Finding;
}

const RESISTANCE: { [K in ChartModel['kind']]: (t: number, m: Extract<ChartModel, { kind: K }>) => Result<number> } = {
  steinhart_hart: steinhartHartResistance,
  beta: betaResistance,
};
const TEMPERATURE: { [K in ChartModel['kind']]: (ohms: number, m: Extract<ChartModel, { kind: K }>) => Result<number> } = {
  steinhart_hart: steinhartHartTemperature,
  beta: betaTemperature,
};
const resistanceAt = (t: number, m: ChartModel) => (RESISTANCE[m.kind] as (t: number, m: ChartModel) => Result<number>)(t, m);
const temperatureOf = (ohms: number, m: ChartModel) => (TEMPERATURE[m.kind] as (o: number, m: ChartModel) => Result<number>)(ohms, m);

const kilo = (ohms: number) => (ohms >= 1000 ? `${(ohms / 1000).toPrecision(3)} kΩ` : `${ohms.toPrecision(3)} Ω`);

const WORDS: Record<ChartVerdict, (c: { reading: string; band: string; t: number; readingT?: number }) => string> = {
  within: (c) => `${c.reading} lies inside the chart's ${c.band} at ${c.t} °C: the sensor follows its chart.`,
  below: (c) =>
    `${c.reading} is below the chart's ${c.band} at ${c.t} °C${c.readingT === undefined ? '' : ` (the chart puts it at ${c.readingT.toFixed(0)} °C)`}: the sensor reads hotter than it is, or is partly shorted.`,
  above: (c) =>
    `${c.reading} is above the chart's ${c.band} at ${c.t} °C${c.readingT === undefined ? '' : ` (the chart puts it at ${c.readingT.toFixed(0)} °C)`}: the sensor reads colder than it is, or is partly open.`,
};

/** The chart's resistance at the known temperature and whether the reading lies within its tolerance. */
export function compareWithChart(input: ChartComparisonInput): Result<ChartComparison> {
  const tolerance = input?.tolerancePercent ?? DEFAULT_CHART_TOLERANCE_PERCENT;
  const spread = input?.temperatureSpreadC ?? DEFAULT_TEMPERATURE_SPREAD_C;
  const found: Finding[] = [
    ...(input?.ohms === 'overload' ? [] : checkResistance(input?.ohms, 'ohms', 'The reading')),
    ...checkRange(input?.temperatureC, 'temperatureC', 'The known temperature (°C)', CHART_TEMPERATURE_RANGE_C.min, CHART_TEMPERATURE_RANGE_C.max),
    ...checkRange(tolerance, 'tolerancePercent', 'The chart tolerance (%)', 0, 50),
    ...checkRange(spread, 'temperatureSpreadC', 'The temperature spread (°C)', 0, 30),
  ];
  if (!input?.model || !Object.hasOwn(RESISTANCE, input.model.kind))
    found.push(finding('chart.unknown_model', 'model.kind', 'The chart must be "steinhart_hart" or "beta".'));
  if (found.length) return { ok: false, findings: found };
  const t = input.temperatureC;
  const expected = resistanceAt(t, input.model);
  const warm = resistanceAt(t + spread, input.model);
  const cold = resistanceAt(t - spread, input.model);
  for (const r of [expected, warm, cold]) if (!r.ok) return { ok: false, findings: r.findings.map((f) => ({ ...f, path: f.path.replace(/^coefficients/, 'model') })) };
  const [expectedOhms, lowOhms, highOhms] = [expected, warm, cold].map((r, i) => (r as { value: number }).value * (i === 1 ? 1 - tolerance / 100 : i === 2 ? 1 + tolerance / 100 : 1)) as [number, number, number];
  const ohms = input.ohms === 'overload' ? Infinity : input.ohms;
  const verdict: ChartVerdict = ohms < lowOhms ? 'below' : ohms > highOhms ? 'above' : 'within';
  const back = Number.isFinite(ohms) && ohms > 0 ? temperatureOf(ohms, input.model) : undefined;
  const readingTemperatureC = back?.ok ? back.value : undefined;
  const message = WORDS[verdict]({
    reading: Number.isFinite(ohms) ? kilo(ohms) : 'OL',
    band: `${kilo(lowOhms)} to ${kilo(highOhms)} (${kilo(expectedOhms)} ±${tolerance} %, ±${spread} °C)`,
    t,
    readingT: readingTemperatureC,
  });
  return { ok: true, value: { expectedOhms, lowOhms, highOhms, verdict, readingTemperatureC, finding: finding(`chart.${verdict}`, 'ohms', message) } };
}
