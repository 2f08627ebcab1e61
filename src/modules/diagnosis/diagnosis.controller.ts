import { Controller, Get } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { UuidParam, ZQuery } from '../../common/validation/zod-input';
import { conditionsOf, DiagnosisQuery } from './diagnosis.dto';
import { CurrentActor, type Actor } from '../identity/actor';
import { DiagnosisService } from './diagnosis.service';
import { apiDiagnosisView } from './diagnosis.view';
import { Diagnosis, ZResponse } from '../../common/openapi/responses';

@ApiTags('diagnosis')
@ApiSecurity('user')
@Controller('api/repair-orders/:id/circuits/:circuitId/diagnosis')
export class DiagnosisController {
  constructor(private readonly service: DiagnosisService) {}

  @Get()
  @ZResponse(Diagnosis)
  @ApiOperation({
    summary: 'What the readings so far say: ranked causes, the next test (post its `request` back with the value), the path, and the conclusion',
    description:
      'Recomputed on every call from the stored readings and repairs with the fault-tree version the circuit started with; deterministic, never stored. ' +
      'With `ambientC` (and `coldSoaked`), a key-on scan temperature (PID 05 or 0F) implausible for those conditions is named in `findings` and in its reading\'s note in `path`.',
  })
  async get(@CurrentActor() actor: Actor, @UuidParam('id') id: string, @UuidParam('circuitId') circuitId: string, @ZQuery(DiagnosisQuery) query: DiagnosisQuery) {
    const { tree, diagnosis, context } = await this.service.forCircuit(actor, id, circuitId, { conditions: conditionsOf(query) });
    return apiDiagnosisView(tree, diagnosis, context);
  }
}
