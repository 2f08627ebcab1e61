import { Module } from '@nestjs/common';
import { ShopSettingsController } from './shop-settings.controller';
import { ShopSettingsRepository } from './shop-settings.repository';
import { ShopSettingsService } from './shop-settings.service';

@Module({
  controllers: [ShopSettingsController],
  providers: [ShopSettingsRepository, ShopSettingsService],
  exports: [ShopSettingsService],
})
export class ShopSettingsModule {}
