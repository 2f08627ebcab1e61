import { forwardRef, Module } from '@nestjs/common';
import { FaultTreesModule } from '../fault-trees/fault-trees.module';
import { MeasurementsModule } from '../measurements/measurements.module';
import { RepairOrdersModule } from '../repair-orders/repair-orders.module';
import { RepairsModule } from '../repairs/repairs.module';
import { DiagnosisController } from './diagnosis.controller';
import { DiagnosisService } from './diagnosis.service';
import { OrderDiagnosisController } from './order-diagnosis.controller';
import { OrderDiagnosisService } from './order-diagnosis.service';
import { ReferenceGroupsModule } from '../reference-groups/reference-groups.module';

@Module({
  imports: [RepairOrdersModule, forwardRef(() => MeasurementsModule), RepairsModule, FaultTreesModule, ReferenceGroupsModule],
  controllers: [DiagnosisController, OrderDiagnosisController],
  providers: [DiagnosisService, OrderDiagnosisService],
  exports: [DiagnosisService, OrderDiagnosisService],
})
export class DiagnosisModule {}
