import { Controller, HttpCode, Post } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { ZBody } from '../../common/validation/zod-input';
import { BiasResistance, MeterLoading, Pressure, ReferenceLoad, ScanDecode, Thermistor, ThermistorChart, TroubleCode, VoltageDrop } from './calculators.dto';
import { CalculatorsService } from './calculators.service';
import { UNITS_CONVENTION } from './quantities';
import { EngineAnswer, ZResponse } from '../../common/openapi/responses';

@ApiTags('calculators')
@ApiSecurity('user')
@Controller('api/calculators')
export class CalculatorsController {
  constructor(private readonly service: CalculatorsService) {}

  @Post('bias-resistance')
  @ZResponse(EngineAnswer)
  @HttpCode(200)
  @ApiOperation({
    summary: 'Bias resistance of a signal input from its reading on a meter: R = R_meter·(V_open/V_read − 1)',
    description: `A 5 V biased input reading 4.87 V on a 10 MΩ meter is biased through about 267 kΩ. Give measuredOhms to compare with an ohms reading of the same path. ${UNITS_CONVENTION}`,
  })
  biasResistance(@ZBody(BiasResistance) body: BiasResistance) {
    return this.service.biasResistance(body);
  }

  @Post('meter-loading')
  @ZResponse(EngineAnswer)
  @HttpCode(200)
  @ApiOperation({
    summary: 'What a meter reads on a source behind a resistance: V·R_meter/(R_meter + R_source)',
    description: `5 V behind 1 MΩ reads 4.545 V on 10 MΩ; the regulated reference (about 1 Ω) does not sag measurably. ${UNITS_CONVENTION}`,
  })
  meterLoading(@ZBody(MeterLoading) body: MeterLoading) {
    return this.service.meterLoading(body);
  }

  @Post('reference-load')
  @ZResponse(EngineAnswer)
  @HttpCode(200)
  @ApiOperation({
    summary: 'Source resistance of the 5 V reference from a reading under a known load, its verdict, and whether it recovers once released',
    description: `Limits are configurable (default 5.00 ± 0.10 V, recovery to 4.8 V: common practice, no source). Never put battery voltage on a 5 V reference; use fused jumpers. ${UNITS_CONVENTION}`,
  })
  referenceLoad(@ZBody(ReferenceLoad) body: ReferenceLoad) {
    return this.service.referenceLoad(body);
  }

  @Post('voltage-drop')
  @ZResponse(EngineAnswer)
  @HttpCode(200)
  @ApiOperation({
    summary: 'Verdict on a voltage drop against a configurable limit (default 0.1 V for a sensor ground), and the wire resistance given the current',
    description: `Read a drop with the circuit working. Cranking or running: ventilate the exhaust, set the parking brake, keep hands and leads clear of belts and fans. ${UNITS_CONVENTION}`,
  })
  voltageDrop(@ZBody(VoltageDrop) body: VoltageDrop) {
    return this.service.voltageDrop(body);
  }

  @Post('thermistor')
  @ZResponse(EngineAnswer)
  @HttpCode(200)
  @ApiOperation({
    summary: 'NTC thermistor both ways (Steinhart–Hart 1968 or beta): temperature ↔ resistance, and the divider voltage with the module pull-up',
    description: `Give one of temperatureC, ohms, or volts (with divider). The divider is V = V_supply·R_t/(R_t + R_pull-up). ${UNITS_CONVENTION}`,
  })
  thermistor(@ZBody(Thermistor) body: Thermistor) {
    return this.service.thermistor(body);
  }

  @Post('thermistor-chart')
  @ZResponse(EngineAnswer)
  @HttpCode(200)
  @ApiOperation({
    summary: "A reading at the sensor's own pins against its chart at the temperature the technician knows",
    description: "The chart's resistance at that temperature, its band (R(T + spread)·(1 − tolerance) to R(T − spread)·(1 + tolerance), an NTC falling as it warms), whether the reading lies within, and the chart's temperature for the reading.",
  })
  thermistorChart(@ZBody(ThermistorChart) body: ThermistorChart) {
    return this.service.thermistorChart(body);
  }

  @Post('pressure')
  @ZResponse(EngineAnswer)
  @HttpCode(200)
  @ApiOperation({
    summary: 'Pressure: a linear sensor from two calibration points, gauge vacuum ↔ absolute under a barometer, and kPa ↔ inHg ↔ psi',
    description: `Any of the three sections, each answered under its own name. Conversions use NIST SP 811 appendix B (1 inHg = 3386.389 Pa, 1 psi = 6894.757 Pa). ${UNITS_CONVENTION}`,
  })
  pressure(@ZBody(Pressure) body: Pressure) {
    return this.service.pressure(body);
  }

  @Post('scan-decode')
  @ZResponse(EngineAnswer)
  @HttpCode(200)
  @ApiOperation({
    summary: 'Decode an SAE J1979 mode 01 value from its raw data bytes',
    description: 'Some modules refresh a value only once they see engine speed: with the key on and the engine stopped it can stay frozen; crank the engine (exhaust ventilated, parking brake on) to make it update.',
  })
  scanDecode(@ZBody(ScanDecode) body: ScanDecode) {
    return this.service.scanDecode(body);
  }

  @Post('trouble-code')
  @ZResponse(EngineAnswer)
  @HttpCode(200)
  @ApiOperation({
    summary: 'A trouble code from its two raw bytes or as typed (SAE J2012), with system, scope and the generic meaning where tabled',
    description: 'The manufacturer’s service information takes precedence over a generic meaning.',
  })
  troubleCode(@ZBody(TroubleCode) body: TroubleCode) {
    return this.service.troubleCode(body);
  }
}
