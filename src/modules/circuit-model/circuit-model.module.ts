import { Module } from '@nestjs/common';
import { CircuitModelController } from './circuit-model.controller';
import { CircuitModelService } from './circuit-model.service';
import { WireIdentificationController } from './wire-identification.controller';

@Module({
  controllers: [CircuitModelController, WireIdentificationController],
  providers: [CircuitModelService],
})
export class CircuitModelModule {}
