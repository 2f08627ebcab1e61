import { Module } from '@nestjs/common';
import { DiagnosisModule } from '../diagnosis/diagnosis.module';
import { RepairOrdersModule } from '../repair-orders/repair-orders.module';
import { RepairsModule } from '../repairs/repairs.module';
import { ReviewsRepository } from '../reviews/reviews.repository';
import { ShopSettingsModule } from '../shop-settings/shop-settings.module';
import { EvidenceController } from './evidence.controller';
import { EvidenceService } from './evidence.service';
import { ProofGates } from './proof-gates';

/** The evidence a proof states, its digest and the gates on "verified" and "closed"; reviews use it, so it has its own reviews reader. */
@Module({
  imports: [RepairOrdersModule, RepairsModule, DiagnosisModule, ShopSettingsModule],
  controllers: [EvidenceController],
  providers: [EvidenceService, ProofGates, ReviewsRepository],
  exports: [EvidenceService],
})
export class EvidenceModule {}
