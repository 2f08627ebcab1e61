import { forwardRef, Module } from '@nestjs/common';
import { DiagnosisModule } from '../diagnosis/diagnosis.module';
import { RepairOrdersModule } from '../repair-orders/repair-orders.module';
import { MeasurementsController } from './measurements.controller';
import { MeasurementsRepository } from './measurements.repository';
import { MeasurementsService } from './measurements.service';
import { RateLimitsModule } from '../rate-limits/rate-limits.module';
import { ReadingRepository } from './reading.repository';

@Module({
  // Recording a reading can answer with the diagnosis after it; the diagnosis reads the stored readings.
  imports: [RepairOrdersModule, RateLimitsModule, forwardRef(() => DiagnosisModule)],
  controllers: [MeasurementsController],
  providers: [MeasurementsRepository, ReadingRepository, MeasurementsService],
  exports: [MeasurementsRepository],
})
export class MeasurementsModule {}
