import { Controller, Get, Inject } from '@nestjs/common';
import { ApiOperation, ApiTags } from '@nestjs/swagger';
import { DATABASE, type OpenDatabase } from '../../common/database/database.tokens';
import { PublicRoute } from '../identity/actor.guard';
import { Health, ZResponse } from '../../common/openapi/responses';

@ApiTags('service')
@Controller('api/health')
export class HealthController {
  constructor(@Inject(DATABASE) private readonly database: OpenDatabase) {}

  @Get()
  @ZResponse(Health)
  @PublicRoute()
  @ApiOperation({ summary: 'Database kind and migration state; 503 when the database does not answer' })
  async health() {
    const state = await this.database.migrationState();
    return {
      status: state.pending.length === 0 ? 'ok' : 'migrations_pending',
      database: { kind: this.database.kind, migrations: { applied: state.applied, pending: state.pending } },
    };
  }
}
