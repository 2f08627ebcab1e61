import { Module, RequestMethod, type MiddlewareConsumer, type NestModule } from '@nestjs/common';
import { urlencoded } from 'express';
import { EvidenceModule } from '../proofs/evidence.module';
import { DiagnosisModule } from '../diagnosis/diagnosis.module';
import { IdentityModule } from '../identity/identity.module';
import { RepairOrdersModule } from '../repair-orders/repair-orders.module';
import { RepairsModule } from '../repairs/repairs.module';
import { ReviewsModule } from '../reviews/reviews.module';
import { CircuitsModule } from '../circuits/circuits.module';
import { BayController } from './bay.controller';
import { BayService } from './bay.service';
import { BoardController } from './board.controller';
import { BoardService } from './board.service';
import { PagesRepository } from './pages.repository';
import { staticAssets } from './static-assets';
import { VinCheckController } from './vin-check.controller';
import { SignInController } from './sign-in.controller';
import { registerNotFoundPage } from '../../common/errors/not-found-page';
import type { RequestWithActor } from '../identity/actor';
import { errorPage } from './layout.view';

/**
 * The pages for the bay tablet and the foreman, rendered on the server, with their static assets. They read and
 * write through the feature modules' own services.
 */
@Module({
  imports: [IdentityModule, RepairOrdersModule, CircuitsModule, RepairsModule, ReviewsModule, DiagnosisModule, EvidenceModule],
  controllers: [SignInController, BayController, BoardController, VinCheckController],
  providers: [PagesRepository, BayService, BoardService],
})
export class PagesModule implements NestModule {
  constructor() {
    registerNotFoundPage((request) => errorPage(404, `There is no page at ${request.path}. Check the address, or start again from your repair orders.`, (request as RequestWithActor).actor).value);
  }

  configure(consumer: MiddlewareConsumer): void {
    consumer.apply(staticAssets()).forRoutes({ path: 'assets/*path', method: RequestMethod.GET });
    // Sign-in and sign-out post as plain HTML forms.
    consumer
      .apply(urlencoded({ extended: false, limit: '4kb' }))
      .forRoutes({ path: 'sign-in', method: RequestMethod.POST }, { path: 'sign-out', method: RequestMethod.POST });
  }
}
