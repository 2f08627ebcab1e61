import { Controller, Get, HttpCode, Post } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { Approval, RepairOrder, Verification, ZResponse } from '../../common/openapi/responses';
import { UuidParam, ZBody } from '../../common/validation/zod-input';
import { RecordCodesAfter } from './evidence.dto';
import { CurrentActor, type Actor } from '../identity/actor';
import { EvidenceService } from './evidence.service';

@ApiTags('proof of repair')
@ApiSecurity('user')
@Controller('api/repair-orders/:id')
export class EvidenceController {
  constructor(private readonly evidence: EvidenceService) {}

  @Get('approval')
  @ZResponse(Approval)
  @ApiOperation({ summary: 'Where the foreman’s approval stands: none, approved (of the evidence now), stale (the evidence changed since), returned or withdrawn' })
  approval(@CurrentActor() actor: Actor, @UuidParam('id') id: string) {
    return this.evidence.approval(actor, id);
  }

  @Post('codes-after')
  @ZResponse(RepairOrder)
  @HttpCode(200)
  @ApiOperation({ summary: 'Record the codes read after the repair and how they were read (cleared and key cycles, road test, re-scan): the proof states them only once recorded' })
  codesAfter(@CurrentActor() actor: Actor, @UuidParam('id') id: string, @ZBody(RecordCodesAfter) body: RecordCodesAfter) {
    return this.evidence.recordCodesAfter(actor, id, body);
  }

  @Get('verification')
  @ZResponse(Verification)
  @ApiOperation({ summary: 'The readings that decided each repaired circuit’s cause and are still to be taken again, healthy, and any code read after the repair that concerns a repaired circuit, before the order is verified' })
  async verification(@CurrentActor() actor: Actor, @UuidParam('id') id: string) {
    const toMeasure = await this.evidence.retests(actor, id);
    const codesReturned = await this.evidence.codesReturned(actor, id);
    return { complete: toMeasure.length === 0 && codesReturned.length === 0, toMeasure, codesReturned };
  }
}
