import { Controller, Get, Header, Query, UseFilters } from '@nestjs/common';
import { ApiExcludeController } from '@nestjs/swagger';
import { UuidParam } from '../../common/validation/zod-input';
import { CurrentActor, type Actor } from '../identity/actor';
import { EvidenceService } from '../proofs/evidence.service';
import { BayService } from './bay.service';
import { bayHomePage, newOrderPage } from './bay-home.view';
import { orderPage, wiresPage, type Prefill } from './bay-order.view';
import { PagesErrorFilter } from './pages-error.filter';
import { testScreenPage } from './test-screen.view';
import { temperatureInput } from './temperatures.view';

const UUID = /^[0-9a-f]{8}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{4}-[0-9a-f]{12}$/i;

/** "A:reference,B:signal" from the wire helper → cavity rows to prefill (anything malformed is dropped). */
function prefillFrom(kind: unknown, cavities: unknown): Prefill {
  const rows = typeof cavities === 'string' ? cavities.split(',').slice(0, 8).map((p) => p.split(':') as [string, string]) : [];
  return {
    kind: typeof kind === 'string' ? kind : undefined,
    cavities: rows.filter(([n, r]) => /^[A-Za-z0-9]{1,8}$/.test(n ?? '') && ['reference', 'signal', 'ground', 'unknown'].includes(r ?? '')),
  };
}

/** The technician's pages (the bay tablet). */
@ApiExcludeController()
@UseFilters(PagesErrorFilter)
@Controller('bay')
export class BayController {
  constructor(
    private readonly bay: BayService,
    private readonly evidence: EvidenceService,
  ) {}

  @Get()
  @Header('Content-Type', 'text/html; charset=utf-8')
  @Header('Cache-Control', 'no-store')
  async home(@CurrentActor() actor: Actor) {
    return bayHomePage(actor, await this.bay.home(actor)).value;
  }

  @Get('new')
  @Header('Content-Type', 'text/html; charset=utf-8')
  newOrder(@CurrentActor() actor: Actor) {
    return newOrderPage(actor).value;
  }

  @Get('orders/:id')
  @Header('Content-Type', 'text/html; charset=utf-8')
  @Header('Cache-Control', 'no-store')
  async order(@CurrentActor() actor: Actor, @UuidParam('id') id: string, @Query('kind') kind: unknown, @Query('cavities') cavities: unknown) {
    const data = await this.bay.order(actor, id);
    const [approval, toMeasure] = await Promise.all([this.evidence.approval(actor, id), data.order.status === 'repaired' ? this.evidence.retests(actor, id) : []]);
    return orderPage(actor, { ...data, approval, toMeasure }, prefillFrom(kind, cavities)).value;
  }

  @Get('orders/:id/wires')
  @Header('Content-Type', 'text/html; charset=utf-8')
  async wires(@CurrentActor() actor: Actor, @UuidParam('id') id: string) {
    const order = await this.bay.header(actor, id);
    return wiresPage(actor, order).value;
  }

  @Get('orders/:id/circuits/:circuitId')
  @Header('Content-Type', 'text/html; charset=utf-8')
  @Header('Cache-Control', 'no-store')
  async test(
    @CurrentActor() actor: Actor,
    @UuidParam('id') id: string,
    @UuidParam('circuitId') circuitId: string,
    @Query('correct') correct: unknown,
    @Query('verify') verify: unknown,
    @Query() query: Record<string, unknown>,
  ) {
    const order = await this.bay.header(actor, id);
    const temperatures = temperatureInput(query);
    const circuit = await this.bay.circuit(actor, order, circuitId, undefined, temperatures.conditions);
    const entry = this.bay.entryFor(order, circuit, {
      correct: typeof correct === 'string' && UUID.test(correct) ? correct : undefined,
      verify: typeof verify === 'string' && /^\d{1,3}$/.test(verify) ? Number(verify) : undefined,
    });
    return testScreenPage(actor, order, circuit, entry, temperatures).value;
  }
}
