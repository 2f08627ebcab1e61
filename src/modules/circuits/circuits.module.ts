import { Module } from '@nestjs/common';
import { FaultTreesModule } from '../fault-trees/fault-trees.module';
import { RepairOrdersModule } from '../repair-orders/repair-orders.module';
import { CircuitsController } from './circuits.controller';
import { CircuitsRepository } from './circuits.repository';
import { CircuitsService } from './circuits.service';

@Module({
  imports: [RepairOrdersModule, FaultTreesModule],
  controllers: [CircuitsController],
  providers: [CircuitsRepository, CircuitsService],
  exports: [CircuitsRepository],
})
export class CircuitsModule {}
