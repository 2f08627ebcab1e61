import { Controller, Get, Post } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { UuidParam, ZBody } from '../../common/validation/zod-input';
import { CurrentActor, type Actor } from '../identity/actor';
import { RecordRepair } from './repairs.dto';
import { RepairsService } from './repairs.service';
import { Repair, RepairList, ZResponse } from '../../common/openapi/responses';

@ApiTags('repairs')
@ApiSecurity('user')
@Controller('api/repair-orders/:id/repairs')
export class RepairsController {
  constructor(private readonly service: RepairsService) {}

  @Post()
  @ZResponse(Repair, 201)
  @ApiOperation({ summary: 'Record the repair done (action, part of the circuit, where, parts used); marks a diagnosing order repaired' })
  record(@CurrentActor() actor: Actor, @UuidParam('id') id: string, @ZBody(RecordRepair) body: RecordRepair) {
    return this.service.record(actor, id, body);
  }

  @Get()
  @ZResponse(RepairList)
  @ApiOperation({ summary: 'Repairs recorded on a repair order, in order' })
  list(@CurrentActor() actor: Actor, @UuidParam('id') id: string) {
    return this.service.list(actor, id);
  }
}
