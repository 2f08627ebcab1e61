import { forwardRef, Module } from '@nestjs/common';
import { FaultTreesModule } from '../fault-trees/fault-trees.module';
import { MeasurementsModule } from '../measurements/measurements.module';
import { RepairOrdersModule } from '../repair-orders/repair-orders.module';
import { RepairsModule } from '../repairs/repairs.module';
import { DiagnosisController } from './diagnosis.controller';
import { DiagnosisService } from './diagnosis.service';

@Module({
  imports: [RepairOrdersModule, forwardRef(() => MeasurementsModule), RepairsModule, FaultTreesModule],
  controllers: [DiagnosisController],
  providers: [DiagnosisService],
  exports: [DiagnosisService],
})
export class DiagnosisModule {}
