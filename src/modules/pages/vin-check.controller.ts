import { Controller, Get, Param, Query } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { checkVin } from '../../engine/vin';

/**
 * The VIN rule of 49 CFR 565 as the new-repair-order page types it: the same `checkVin` the repair-order API
 * applies, so the page and the service never disagree.
 */
@ApiTags('vehicles')
@ApiSecurity('user')
@Controller('api/vins')
export class VinCheckController {
  @Get(':vin')
  @ApiOperation({
    summary: 'Check a VIN as typed (49 CFR 565): format, check digit at position 9, model-year candidates; nothing is stored',
    description: 'Answers 200 either way: { ok: true, vin, checkDigit, modelYearCandidates } or { ok: false, findings }. outsideNorthAmerica=true skips the check digit.',
  })
  check(@Param('vin') vin: string, @Query('outsideNorthAmerica') outside?: string) {
    return checkVin(String(vin).slice(0, 40), { outsideNorthAmerica: outside === 'true' });
  }
}
