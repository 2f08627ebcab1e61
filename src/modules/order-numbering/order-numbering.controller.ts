import { Controller, Get, Put } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { OrderNumbering, ZResponse } from '../../common/openapi/responses';
import { ZBody } from '../../common/validation/zod-input';
import { CurrentActor, type Actor } from '../identity/actor';
import { SetOrderNumbering } from './order-numbering.dto';
import { OrderNumberingService } from './order-numbering.service';

@ApiTags('shop')
@ApiSecurity('user')
@Controller('api/shop/order-numbering')
export class OrderNumberingController {
  constructor(private readonly service: OrderNumberingService) {}

  @Get()
  @ZResponse(OrderNumbering)
  @ApiOperation({ summary: 'How the shop numbers new repair orders: prefix, width, and the next number' })
  get(@CurrentActor() actor: Actor) {
    return this.service.get(actor);
  }

  @Put()
  @ZResponse(OrderNumbering)
  @ApiOperation({
    summary: 'Foreman or admin: set the prefix and width of automatic repair-order numbers (and optionally the next number)',
    description: 'Automatic numbers have their own sequence per shop; a number typed on an order never moves it (a typed number that the sequence reaches is skipped).',
  })
  set(@CurrentActor() actor: Actor, @ZBody(SetOrderNumbering) body: SetOrderNumbering) {
    return this.service.set(actor, body);
  }
}
