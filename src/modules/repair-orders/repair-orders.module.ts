import { Module } from '@nestjs/common';
import { IdentityModule } from '../identity/identity.module';
import { OrderNumberingModule } from '../order-numbering/order-numbering.module';
import { RepairOrdersController } from './repair-orders.controller';
import { RepairOrdersRepository } from './repair-orders.repository';
import { RepairOrdersService } from './repair-orders.service';
import { StatusGates } from './status-gates';

@Module({
  imports: [IdentityModule, OrderNumberingModule],
  controllers: [RepairOrdersController],
  providers: [RepairOrdersRepository, RepairOrdersService, StatusGates],
  exports: [RepairOrdersRepository, RepairOrdersService, StatusGates],
})
export class RepairOrdersModule {}
