import { Module } from '@nestjs/common';
import { APP_INTERCEPTOR } from '@nestjs/core';
import { IdempotencyInterceptor } from '../idempotency/idempotency.interceptor';
import { IdempotencyModule } from '../idempotency/idempotency.module';
import { RateLimitsInterceptor } from '../rate-limits/rate-limits.interceptor';
import { RateLimitsModule } from '../rate-limits/rate-limits.module';
import { RepairOrdersModule } from '../repair-orders/repair-orders.module';
import { AuditContextInterceptor } from './audit-context.interceptor';
import { AuditController } from './audit.controller';
import { AuditRepository } from './audit.repository';
import { AuditService } from './audit.service';

/**
 * The trail, and the order every request passes through on its way to a handler (outermost first): the caller
 * is put in the request context (for the trail), a retried write is answered from its stored response, and only
 * then is a request counted against its rate limit, so a tablet's retry is never throttled.
 */
@Module({
  imports: [IdempotencyModule, RateLimitsModule, RepairOrdersModule],
  controllers: [AuditController],
  providers: [
    AuditRepository,
    AuditService,
    { provide: APP_INTERCEPTOR, useClass: AuditContextInterceptor },
    { provide: APP_INTERCEPTOR, useExisting: IdempotencyInterceptor },
    { provide: APP_INTERCEPTOR, useExisting: RateLimitsInterceptor },
  ],
})
export class AuditModule {}
