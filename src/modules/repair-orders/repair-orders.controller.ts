import { Controller, Get, HttpCode, Patch, Post } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { UuidParam, ZBody, ZQuery } from '../../common/validation/zod-input';
import { CurrentActor, type Actor } from '../identity/actor';
import { ChangeStatus, CreateRepairOrder, ListRepairOrders, UpdateRepairOrder } from './repair-orders.dto';
import { RepairOrdersService } from './repair-orders.service';
import { RepairOrder, RepairOrderList, ZResponse } from '../../common/openapi/responses';

@ApiTags('repair orders')
@ApiSecurity('user')
@Controller('api/repair-orders')
export class RepairOrdersController {
  constructor(private readonly service: RepairOrdersService) {}

  @Get()
  @ZResponse(RepairOrderList)
  @ApiOperation({ summary: 'List repair orders of the shop, newest change first' })
  list(@CurrentActor() actor: Actor, @ZQuery(ListRepairOrders) query: ListRepairOrders) {
    return this.service.list(actor, query);
  }

  @Post()
  @ZResponse(RepairOrder, 201)
  @ApiOperation({ summary: 'Open a repair order, with a new vehicle (VIN checked per 49 CFR 565) or one on file' })
  create(@CurrentActor() actor: Actor, @ZBody(CreateRepairOrder) body: CreateRepairOrder) {
    return this.service.create(actor, body);
  }

  @Get(':id')
  @ZResponse(RepairOrder)
  @ApiOperation({ summary: 'One repair order with its vehicle, circuits and status history' })
  get(@CurrentActor() actor: Actor, @UuidParam('id') id: string) {
    return this.service.get(actor, id);
  }

  @Patch(':id')
  @ZResponse(RepairOrder)
  @ApiOperation({ summary: 'Change complaint, cause, correction, codes or technician (send the version you read)' })
  update(@CurrentActor() actor: Actor, @UuidParam('id') id: string, @ZBody(UpdateRepairOrder) body: UpdateRepairOrder) {
    return this.service.update(actor, id, body);
  }

  @Post(':id/status')
  @ZResponse(RepairOrder)
  @HttpCode(200)
  @ApiOperation({ summary: 'Move the repair order along open → diagnosing → repaired → verified → closed, or reopen with a reason' })
  changeStatus(@CurrentActor() actor: Actor, @UuidParam('id') id: string, @ZBody(ChangeStatus) body: ChangeStatus) {
    return this.service.changeStatus(actor, id, body);
  }
}
