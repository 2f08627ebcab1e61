import { Controller, Get, Param, Query } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { checkVin } from '../../engine/vin';
import { CurrentActor, type Actor } from '../identity/actor';
import { PagesRepository } from './pages.repository';
import { VinCheck, ZResponse } from '../../common/openapi/responses';

/**
 * The VIN rule of 49 CFR 565 as the new-repair-order page types it: the same `checkVin` the repair-order API
 * applies, so the page and the service never disagree.
 */
@ApiTags('vehicles')
@ApiSecurity('user')
@Controller('api/vins')
export class VinCheckController {
  constructor(private readonly pages: PagesRepository) {}

  @Get(':vin')
  @ZResponse(VinCheck)
  @ApiOperation({
    summary: 'Check a VIN as typed (49 CFR 565): format, check digit at position 9, model-year candidates; nothing is stored',
    description:
      'Answers 200 either way: { ok: true, vin, checkDigit, modelYearCandidates, onFile } or { ok: false, findings }. onFile: the vehicle this shop already has with that VIN (year, make, model), or null. outsideNorthAmerica=true skips the check digit.',
  })
  async check(@CurrentActor() actor: Actor, @Param('vin') vin: string, @Query('outsideNorthAmerica') outside?: string) {
    const checked = checkVin(String(vin).slice(0, 40), { outsideNorthAmerica: outside === 'true' });
    if (!checked.ok) return checked;
    return { ...checked, onFile: await this.pages.vehicleByVin(actor.shopId, checked.vin) };
  }
}
