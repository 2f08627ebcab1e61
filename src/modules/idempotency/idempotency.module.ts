import { Module } from '@nestjs/common';
import { IdempotencyInterceptor } from './idempotency.interceptor';
import { IdempotencyRepository } from './idempotency.repository';

@Module({ providers: [IdempotencyRepository, IdempotencyInterceptor], exports: [IdempotencyInterceptor] })
export class IdempotencyModule {}
