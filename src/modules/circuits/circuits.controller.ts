import { Controller, Get, Post } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { UuidParam, ZBody } from '../../common/validation/zod-input';
import { CurrentActor, type Actor } from '../identity/actor';
import { CreateCircuit } from './circuits.dto';
import { CircuitsService } from './circuits.service';
import { Circuit, CircuitList, ZResponse } from '../../common/openapi/responses';

@ApiTags('circuits')
@ApiSecurity('user')
@Controller('api/repair-orders/:id/circuits')
export class CircuitsController {
  constructor(private readonly service: CircuitsService) {}

  @Post()
  @ZResponse(Circuit, 201)
  @ApiOperation({ summary: 'Add a circuit under test (three-wire 5 V sensor or two-wire thermistor) with its cavity map' })
  create(@CurrentActor() actor: Actor, @UuidParam('id') id: string, @ZBody(CreateCircuit) body: CreateCircuit) {
    return this.service.create(actor, id, body);
  }

  @Get()
  @ZResponse(CircuitList)
  @ApiOperation({ summary: 'Circuits of a repair order' })
  list(@CurrentActor() actor: Actor, @UuidParam('id') id: string) {
    return this.service.list(actor, id);
  }
}
