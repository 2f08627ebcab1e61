import { Controller, Get, Header, Query, UseFilters } from '@nestjs/common';
import { ApiExcludeController } from '@nestjs/swagger';
import { DomainException } from '../../common/errors/domain.exception';
import { UuidParam } from '../../common/validation/zod-input';
import { CurrentActor, type Actor } from '../identity/actor';
import { EvidenceService } from '../proofs/evidence.service';
import { BayService } from './bay.service';
import { AGE_CHOICES, BoardService } from './board.service';
import { boardPage, reviewPage } from './board.view';
import { PagesErrorFilter } from './pages-error.filter';

function foremanOnly(actor: Actor): void {
  if (actor.role === 'technician') {
    throw new DomainException('forbidden', 'board.foreman_only', 'The shop board is for the foreman. Your repair orders are under “My repair orders”.');
  }
}

/** The foreman's pages: the shop board and the review of one repair order. */
@ApiExcludeController()
@UseFilters(PagesErrorFilter)
@Controller('board')
export class BoardController {
  constructor(
    private readonly board: BoardService,
    private readonly bay: BayService,
    private readonly evidence: EvidenceService,
  ) {}

  @Get()
  @Header('Content-Type', 'text/html; charset=utf-8')
  @Header('Cache-Control', 'no-store')
  async list(@CurrentActor() actor: Actor, @Query('technician') technician: unknown, @Query('age') age: unknown) {
    foremanOnly(actor);
    const technicians = await this.board.technicians(actor);
    const filter = {
      technicianId: typeof technician === 'string' && technicians.some((t) => t.id === technician) ? technician : undefined,
      minAgeDays: AGE_CHOICES.find((a) => String(a.days) === age)?.days || undefined,
    };
    return boardPage(actor, await this.board.list(actor, filter), technicians, filter).value;
  }

  @Get('orders/:id')
  @Header('Content-Type', 'text/html; charset=utf-8')
  @Header('Cache-Control', 'no-store')
  async order(@CurrentActor() actor: Actor, @UuidParam('id') id: string) {
    // Existence first: an id of another shop is a 404 for everyone, never a 403 that confirms it exists.
    const data = await this.bay.order(actor, id);
    foremanOnly(actor);
    const [[item], technicians, approval] = await Promise.all([this.board.list(actor, { orderId: id }), this.board.technicians(actor), this.evidence.approval(actor, id)]);
    return reviewPage(actor, { ...data, approval }, item?.flags ?? [], technicians).value;
  }
}
