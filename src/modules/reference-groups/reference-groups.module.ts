import { Module } from '@nestjs/common';
import { RepairOrdersModule } from '../repair-orders/repair-orders.module';
import { ReferenceGroupsController } from './reference-groups.controller';
import { ReferenceGroupsRepository } from './reference-groups.repository';
import { ReferenceGroupsService } from './reference-groups.service';

@Module({
  imports: [RepairOrdersModule],
  controllers: [ReferenceGroupsController],
  providers: [ReferenceGroupsRepository, ReferenceGroupsService],
  exports: [ReferenceGroupsRepository],
})
export class ReferenceGroupsModule {}
