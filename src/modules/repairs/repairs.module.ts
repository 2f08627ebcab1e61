import { Module } from '@nestjs/common';
import { CircuitsModule } from '../circuits/circuits.module';
import { RepairOrdersModule } from '../repair-orders/repair-orders.module';
import { RepairsController } from './repairs.controller';
import { RepairsRepository } from './repairs.repository';
import { RepairsService } from './repairs.service';

@Module({
  imports: [RepairOrdersModule, CircuitsModule],
  controllers: [RepairsController],
  providers: [RepairsRepository, RepairsService],
  exports: [RepairsRepository, RepairsService],
})
export class RepairsModule {}
