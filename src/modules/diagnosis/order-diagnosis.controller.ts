import { Controller, Get } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { UuidParam } from '../../common/validation/zod-input';
import { CurrentActor, type Actor } from '../identity/actor';
import { OrderDiagnosis, ZResponse } from '../../common/openapi/responses';
import { OrderDiagnosisService } from './order-diagnosis.service';

@ApiTags('diagnosis')
@ApiSecurity('user')
@Controller('api/repair-orders/:id/diagnosis')
export class OrderDiagnosisController {
  constructor(private readonly service: OrderDiagnosisService) {}

  @Get()
  @ZResponse(OrderDiagnosis)
  @ApiOperation({
    summary: 'The whole order: each circuit, the shared 5 V references, the leading causes across them and the next test for the order',
    description:
      'When circuits of a reference group point at their common reference together (or a sensor reference-voltage code backs one, or a ' +
      'shared-reference reading was taken), the group’s shared-reference diagnosis takes their place and its next test leads. Post that test’s ' +
      'reading as any other, against `nextTest.circuitId` with its `request` (its `sensor` is "all" when every sensor on the reference is unplugged).',
  })
  get(@CurrentActor() actor: Actor, @UuidParam('id') id: string) {
    return this.service.forOrder(actor, id);
  }
}
