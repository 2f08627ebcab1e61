import { Module } from '@nestjs/common';
import { RateLimitsInterceptor } from './rate-limits.interceptor';
import { RateLimitsRepository } from './rate-limits.repository';

@Module({ providers: [RateLimitsRepository, RateLimitsInterceptor], exports: [RateLimitsInterceptor] })
export class RateLimitsModule {}
