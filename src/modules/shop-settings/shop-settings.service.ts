import { Injectable } from '@nestjs/common';
import { DomainException, NotFoundException } from '../../common/errors/domain.exception';
import type { Actor } from '../identity/actor';
import type { UpdateShopSettings } from './shop-settings.dto';
import { ShopSettingsRepository, type ShopSettingsRow } from './shop-settings.repository';

export function shopSettingsView(s: ShopSettingsRow) {
  return { id: s.id, name: s.name, paperSize: s.paperSize as 'A4' | 'Letter', timeZone: s.timeZone, publicProofCheck: s.publicProofCheck };
}

@Injectable()
export class ShopSettingsService {
  constructor(private readonly shops: ShopSettingsRepository) {}

  /** The settings of the caller's shop (and of a shop by id, for documents and the public check). */
  async of(shopId: string): Promise<ShopSettingsRow> {
    const shop = await this.shops.find(shopId);
    if (!shop) throw new NotFoundException('shop', shopId);
    return shop;
  }

  async get(actor: Actor) {
    return shopSettingsView(await this.of(actor.shopId));
  }

  async update(actor: Actor, input: UpdateShopSettings) {
    if (actor.role === 'technician') {
      throw new DomainException('forbidden', 'shop.settings_foreman_only', 'Only a foreman or an admin changes the shop’s settings.');
    }
    const row = await this.shops.transaction((tx) => this.shops.update(tx, actor.shopId, input));
    return shopSettingsView(row);
  }
}
