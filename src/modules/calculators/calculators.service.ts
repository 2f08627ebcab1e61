import { Injectable } from '@nestjs/common';
import { InvalidInputException } from '../../common/errors/domain.exception';
import {
  absoluteKpaToVacuumInHg,
  betaResistance,
  betaTemperature,
  biasOhmsFromReading,
  compareWithChart,
  linearSensor,
  meterReading,
  referenceUnderLoad,
  referenceVerdict,
  resistanceFromDrop,
  resistancesAgree,
  steinhartHartResistance,
  steinhartHartTemperature,
  thermistorDividerVolts,
  thermistorOhmsFromDivider,
  vacuumInHgToAbsoluteKpa,
  voltageDropVerdict,
  type Result,
} from '../../engine/calc';
import { decodeDtcBytes, encodeDtc, genericMeaning, parseDtc, scopeOf, systemOf } from '../../engine/codes';
import { decodePid, pidDefinition } from '../../engine/scan';
import { fromSi, parseUnit, siUnitOf, toSi } from '../../engine/units';
import type { BiasResistance, MeterLoading, Pressure, ReferenceLoad, ScanDecode, Thermistor, ThermistorChart, TroubleCode, VoltageDrop } from './calculators.dto';
import { thermistorCurve } from '../../engine/circuit';
import { orInvalid } from './engine-result';

type Model = Thermistor['model'];

/** Each thermistor model converts both ways itself. */
const THERMISTOR_MODELS: { [K in Model['kind']]: { ohmsAt(t: number, m: Extract<Model, { kind: K }>): Result<number>; temperatureAt(r: number, m: Extract<Model, { kind: K }>): Result<number> } } = {
  steinhart_hart: { ohmsAt: steinhartHartResistance, temperatureAt: steinhartHartTemperature },
  beta: { ohmsAt: betaResistance, temperatureAt: betaTemperature },
};

const hex = (bytes: readonly number[]) => bytes.map((b) => b.toString(16).toUpperCase().padStart(2, '0')).join(' ');

@Injectable()
export class CalculatorsService {
  biasResistance(body: BiasResistance) {
    const bias = orInvalid(biasOhmsFromReading(body)).value;
    const compared = body.measuredOhms === undefined ? undefined : orInvalid(resistancesAgree(bias, body.measuredOhms), 'body', { b: 'measuredOhms' }).value;
    return { ...body, biasOhms: bias, ...(compared ? { agreesWithMeasured: compared.agree, relativeDifference: compared.relativeDifference } : {}) };
  }

  meterLoading(body: MeterLoading) {
    return { ...body, readingVolts: orInvalid(meterReading(body)).value };
  }

  referenceLoad(body: ReferenceLoad) {
    const { limits, ...readings } = body;
    const loaded = orInvalid(referenceUnderLoad(readings, limits)).value;
    return { ...body, sourceOhms: loaded.sourceOhms, openVerdict: orInvalid(referenceVerdict(body.openVolts, limits), 'body', { volts: 'openVolts' }).value, ...(loaded.recovery ? { recovery: loaded.recovery } : {}) };
  }

  voltageDrop(body: VoltageDrop) {
    const verdict = orInvalid(voltageDropVerdict(body.dropVolts, body.limitVolts)).value;
    const wireOhms = body.amps === undefined ? undefined : orInvalid(resistanceFromDrop(body.dropVolts, body.amps)).value;
    return { ...body, verdict, ...(wireOhms === undefined ? {} : { wireOhms }) };
  }

  thermistor(body: Thermistor) {
    const model = THERMISTOR_MODELS[body.model.kind] as { ohmsAt(t: number, m: Model): Result<number>; temperatureAt(r: number, m: Model): Result<number> };
    const rename = { coefficients: 'model', supplyVolts: 'divider.supplyVolts', pullUpOhms: 'divider.pullUpOhms' };
    let ohms: number;
    let temperatureC: number;
    if (body.temperatureC !== undefined) {
      temperatureC = body.temperatureC;
      ohms = orInvalid(model.ohmsAt(temperatureC, body.model), 'body', rename).value;
    } else {
      ohms = body.ohms ?? orInvalid(thermistorOhmsFromDivider({ ...body.divider!, volts: body.volts! }), 'body', rename).value;
      temperatureC = orInvalid(model.temperatureAt(ohms, body.model), 'body', rename).value;
    }
    const divider = body.divider && {
      ...body.divider,
      volts: orInvalid(thermistorDividerVolts({ ...body.divider, thermistorOhms: ohms }), 'body', { ...rename, thermistorOhms: 'ohms' }).value,
    };
    return { model: body.model, temperatureC, ohms, ...(divider ? { divider } : {}) };
  }

  /** A pins reading against a chart: the chart's resistance at the known temperature, its band and the verdict. */
  thermistorChart(body: ThermistorChart) {
    const model = body.model ?? thermistorCurve(body.chart!)!.model;
    const { chart, ...rest } = body;
    const compared = orInvalid(compareWithChart({ ...rest, model }), 'body').value;
    return { ...(chart ? { chart } : {}), model, temperatureC: body.temperatureC, ohms: body.ohms, ...compared };
  }

  pressure(body: Pressure) {
    return {
      ...(body.sensor ? { sensor: this.sensor(body.sensor) } : {}),
      ...(body.vacuum ? { vacuum: this.vacuum(body.vacuum) } : {}),
      ...(body.convert ? { convert: this.convert(body.convert) } : {}),
    };
  }

  scanDecode(body: ScanDecode) {
    const decoded = orInvalid(decodePid(body.pid, body.bytes));
    const definition = pidDefinition(decoded.pid)!;
    const { ok: _ok, ...answer } = decoded;
    return { ...answer, ...(definition.j1930 ? { j1930: definition.j1930 } : {}), range: definition.range };
  }

  troubleCode(body: TroubleCode) {
    const code = body.bytes !== undefined ? orInvalid(decodeDtcBytes(body.bytes)).code : orInvalid(parseDtc(body.code!)).code;
    if (code === null) return { code: null, note: 'both bytes 0: no code stored (padding in the response)' };
    return {
      code,
      bytes: hex(orInvalid(encodeDtc(code)).bytes),
      system: systemOf(code)!,
      scope: scopeOf(code)!,
      genericMeaning: genericMeaning(code) ?? null,
    };
  }

  private sensor(s: NonNullable<Pressure['sensor']>) {
    const line = orInvalid(linearSensor(s.points), 'body.sensor').value;
    return {
      points: s.points,
      voltsPerKpa: line.voltsPerKpa,
      ...(s.volts !== undefined ? { volts: s.volts, kpa: line.kpaAt(s.volts) } : {}),
      ...(s.kpa !== undefined ? { kpa: s.kpa, volts: line.voltsAt(s.kpa) } : {}),
    };
  }

  private vacuum(v: NonNullable<Pressure['vacuum']>) {
    if (v.vacuumInHg !== undefined) {
      return { baroKpa: v.baroKpa, vacuumInHg: v.vacuumInHg, absoluteKpa: orInvalid(vacuumInHgToAbsoluteKpa(v.vacuumInHg, v.baroKpa), 'body.vacuum').value };
    }
    return { baroKpa: v.baroKpa, absoluteKpa: v.absoluteKpa!, vacuumInHg: orInvalid(absoluteKpaToVacuumInHg(v.absoluteKpa!, v.baroKpa), 'body.vacuum').value };
  }

  private convert(c: NonNullable<Pressure['convert']>) {
    const unit = orInvalid(parseUnit(c.unit, 'unit'), 'body.convert').unit;
    if (siUnitOf(unit) !== 'Pa') {
      throw new InvalidInputException([{ code: 'units.not_a_pressure', path: 'body.convert.unit', message: `${unit} is not a pressure unit; expected Pa, kPa, inHg or psi` }]);
    }
    const pa = toSi(c.value, unit).value;
    return { value: c.value, unit, pa, kpa: fromSi(pa, 'kPa'), inHg: fromSi(pa, 'inHg'), psi: fromSi(pa, 'psi') };
  }
}
