import { Module } from '@nestjs/common';
import { EvidenceModule } from '../proofs/evidence.module';
import { RepairOrdersModule } from '../repair-orders/repair-orders.module';
import { ReviewsController } from './reviews.controller';
import { ReviewsRepository } from './reviews.repository';
import { ReviewsService } from './reviews.service';

@Module({
  imports: [RepairOrdersModule, EvidenceModule],
  controllers: [ReviewsController],
  providers: [ReviewsRepository, ReviewsService],
  exports: [ReviewsRepository, ReviewsService],
})
export class ReviewsModule {}
