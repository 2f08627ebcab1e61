import { Module } from '@nestjs/common';
import { FaultTreeCatalog } from './fault-tree-catalog.service';
import { FaultTreesController } from './fault-trees.controller';
import { FaultTreesRepository } from './fault-trees.repository';

@Module({
  controllers: [FaultTreesController],
  providers: [FaultTreesRepository, FaultTreeCatalog],
  exports: [FaultTreeCatalog],
})
export class FaultTreesModule {}
