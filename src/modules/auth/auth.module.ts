import { Global, Module } from '@nestjs/common';
import { APP_GUARD } from '@nestjs/core';
import { ActorGuard } from '../identity/actor.guard';
import { AuthController } from './auth.controller';
import { AuthRepository } from './auth.repository';
import { AuthService } from './auth.service';
import { SessionCache } from './session-cache';

/** Sign-in, sign-out, and the guard that names the caller of every other route. */
@Global()
@Module({
  controllers: [AuthController],
  providers: [AuthRepository, AuthService, SessionCache, { provide: APP_GUARD, useClass: ActorGuard }],
  exports: [AuthService, AuthRepository],
})
export class AuthModule {}
