import { Controller, Get, Patch } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import { ShopSettings, ZResponse } from '../../common/openapi/responses';
import { ZBody } from '../../common/validation/zod-input';
import { CurrentActor, type Actor } from '../identity/actor';
import { UpdateShopSettings } from './shop-settings.dto';
import { ShopSettingsService } from './shop-settings.service';

@ApiTags('shop settings')
@ApiSecurity('user')
@Controller('api/shop')
export class ShopSettingsController {
  constructor(private readonly settings: ShopSettingsService) {}

  @Get()
  @ZResponse(ShopSettings)
  @ApiOperation({ summary: 'The shop’s settings: paper size and time zone of its documents, and whether proofs can be checked without an account' })
  get(@CurrentActor() actor: Actor) {
    return this.settings.get(actor);
  }

  @Patch()
  @ZResponse(ShopSettings)
  @ApiOperation({ summary: 'Change the shop’s settings (foreman or admin)' })
  update(@CurrentActor() actor: Actor, @ZBody(UpdateShopSettings) body: UpdateShopSettings) {
    return this.settings.update(actor, body);
  }
}
