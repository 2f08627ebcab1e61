import { Module } from '@nestjs/common';
import { RepairOrdersModule } from '../repair-orders/repair-orders.module';
import { MeasurementsController } from './measurements.controller';
import { MeasurementsRepository } from './measurements.repository';
import { MeasurementsService } from './measurements.service';

@Module({
  imports: [RepairOrdersModule],
  controllers: [MeasurementsController],
  providers: [MeasurementsRepository, MeasurementsService],
  exports: [MeasurementsRepository],
})
export class MeasurementsModule {}
