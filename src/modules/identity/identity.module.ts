import { Module } from '@nestjs/common';
import { APP_GUARD } from '@nestjs/core';
import { ActorGuard } from './actor.guard';
import { UsersController } from './users.controller';
import { UsersRepository } from './users.repository';

@Module({
  controllers: [UsersController],
  providers: [UsersRepository, { provide: APP_GUARD, useClass: ActorGuard }],
  exports: [UsersRepository],
})
export class IdentityModule {}
