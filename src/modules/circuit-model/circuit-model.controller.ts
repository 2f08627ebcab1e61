import { Controller, HttpCode, Post } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { ZBody } from '../../common/validation/zod-input';
import { UNITS_CONVENTION } from '../calculators/quantities';
import { BandsBody, MAX_SAMPLE_SOLVES, MAX_SAMPLES, PredictionBody } from './circuit-model.dto';
import { CircuitModelService } from './circuit-model.service';
import { EngineAnswer, ZResponse } from '../../common/openapi/responses';

const CIRCUIT_NOTE =
  'The circuit is the default one of its kind (three_wire_5v: 5 V regulator behind 1 Ω, signal biased up through 250 kΩ, potentiometer at 0.15; two_wire_thermistor: 10 kΩ pull-up, generic 10 kΩ NTC at 20 °C) with any part overridden. ' +
  'Rows: good first, then each hypothesis or fault set; with neither, every hypothesis that applies to the circuit. ' +
  'Readings are in V, Ω or A (a scan_value is the volts the module converter sees); an ohms reading beyond the meter range is { value: null, overload: true }. ' +
  UNITS_CONVENTION;

@ApiTags('circuit model')
@ApiSecurity('user')
@Controller('api/circuit-model')
export class CircuitModelController {
  constructor(private readonly service: CircuitModelService) {}

  @Post('predictions')
  @ZResponse(EngineAnswer)
  @HttpCode(200)
  @ApiOperation({ summary: 'Predict the reading of a test on a circuit: the good circuit and one row per fault', description: CIRCUIT_NOTE })
  predict(@ZBody(PredictionBody) body: PredictionBody) {
    return this.service.predict(body);
  }

  @Post('bands')
  @ZResponse(EngineAnswer)
  @HttpCode(200)
  @ApiOperation({
    summary: 'Monte Carlo spread of a test’s reading, good and per fault: percentiles and the probability of each outcome band',
    description: `${CIRCUIT_NOTE} Deterministic for a seed (all rows share it). At most ${MAX_SAMPLES} samples per row and ${MAX_SAMPLE_SOLVES} samples × rows per request. Bands: min inclusive, max exclusive; "other" counts readings in no band.`,
  })
  bands(@ZBody(BandsBody) body: BandsBody) {
    return this.service.bands(body);
  }
}
