import { Controller, Get } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { UuidParam, ZQuery } from '../../common/validation/zod-input';
import { CurrentActor, type Actor } from '../identity/actor';
import { ListAuditEvents } from './audit.dto';
import { AuditService } from './audit.service';
import { AuditList, ZResponse } from '../../common/openapi/responses';

@ApiTags('audit trail')
@ApiSecurity('user')
@Controller('api/repair-orders')
export class AuditController {
  constructor(private readonly service: AuditService) {}

  @Get(':id/audit')
  @ZResponse(AuditList)
  @ApiOperation({
    summary: 'Every write on a repair order, oldest first: who, when, from which client, the row written and, for updates, each changed field before → after',
  })
  list(@CurrentActor() actor: Actor, @UuidParam('id') id: string, @ZQuery(ListAuditEvents) query: ListAuditEvents) {
    return this.service.forRepairOrder(actor, id, query);
  }
}
