import { forwardRef, Module } from '@nestjs/common';
import { DiagnosisModule } from '../diagnosis/diagnosis.module';
import { RepairOrdersModule } from '../repair-orders/repair-orders.module';
import { MeasurementsController } from './measurements.controller';
import { MeasurementsRepository } from './measurements.repository';
import { MeasurementsService } from './measurements.service';

@Module({
  // Recording a reading can answer with the diagnosis after it; the diagnosis reads the stored readings.
  imports: [RepairOrdersModule, forwardRef(() => DiagnosisModule)],
  controllers: [MeasurementsController],
  providers: [MeasurementsRepository, MeasurementsService],
  exports: [MeasurementsRepository],
})
export class MeasurementsModule {}
