import { Module } from '@nestjs/common';
import { DiagnosisModule } from '../diagnosis/diagnosis.module';
import { IdentityModule } from '../identity/identity.module';
import { RepairOrdersModule } from '../repair-orders/repair-orders.module';
import { RepairsModule } from '../repairs/repairs.module';
import { ReviewsModule } from '../reviews/reviews.module';
import { ShopSettingsModule } from '../shop-settings/shop-settings.module';
import { EvidenceModule } from './evidence.module';
import { ProofsController } from './proofs.controller';
import { PublicProofController } from './public-proof.controller';
import { ProofsRepository } from './proofs.repository';
import { ProofsService } from './proofs.service';

@Module({
  imports: [IdentityModule, RepairOrdersModule, RepairsModule, ReviewsModule, DiagnosisModule, EvidenceModule, ShopSettingsModule],
  controllers: [ProofsController, PublicProofController],
  providers: [ProofsRepository, ProofsService],
})
export class ProofsModule {}
