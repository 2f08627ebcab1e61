import { Module } from '@nestjs/common';
import { OrderNumberingController } from './order-numbering.controller';
import { OrderNumberingRepository } from './order-numbering.repository';
import { OrderNumberingService } from './order-numbering.service';

@Module({
  controllers: [OrderNumberingController],
  providers: [OrderNumberingRepository, OrderNumberingService],
  exports: [OrderNumberingService],
})
export class OrderNumberingModule {}
