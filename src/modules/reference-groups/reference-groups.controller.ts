import { Controller, Delete, Get, HttpCode, Post } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { UuidParam, ZBody } from '../../common/validation/zod-input';
import { CurrentActor, type Actor } from '../identity/actor';
import { CreateReferenceGroup } from './reference-groups.dto';
import { ReferenceGroupsService } from './reference-groups.service';
import { ReferenceGroup, ReferenceGroupCleared, ReferenceGroupList, ZResponse } from '../../common/openapi/responses';

@ApiTags('reference groups')
@ApiSecurity('user')
@Controller('api/repair-orders/:id/reference-groups')
export class ReferenceGroupsController {
  constructor(private readonly service: ReferenceGroupsService) {}

  @Post()
  @ZResponse(ReferenceGroup, 201)
  @ApiOperation({
    summary: 'Say which circuits share one module 5 V reference (two or more three-wire 5 V circuits of this order)',
    description: 'The order-wide diagnosis then weighs the shared reference of these circuits as one. A circuit is in one group at most.',
  })
  create(@CurrentActor() actor: Actor, @UuidParam('id') id: string, @ZBody(CreateReferenceGroup) body: CreateReferenceGroup) {
    return this.service.create(actor, id, body);
  }

  @Get()
  @ZResponse(ReferenceGroupList)
  @ApiOperation({ summary: 'Reference groups of a repair order (cleared ones left out)' })
  list(@CurrentActor() actor: Actor, @UuidParam('id') id: string) {
    return this.service.list(actor, id);
  }

  @Delete(':groupId')
  @HttpCode(200)
  @ZResponse(ReferenceGroupCleared)
  @ApiOperation({ summary: 'Clear a reference group (it stays in the trail; readings taken against it stay on their circuits)' })
  clear(@CurrentActor() actor: Actor, @UuidParam('id') id: string, @UuidParam('groupId') groupId: string) {
    return this.service.clear(actor, id, groupId);
  }
}
