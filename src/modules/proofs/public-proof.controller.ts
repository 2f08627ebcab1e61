import { Controller, Get, Param, Req, Res } from '@nestjs/common';
import { ApiExcludeController } from '@nestjs/swagger';
import type { Request, Response } from 'express';
import { PublicRoute } from '../identity/actor.guard';
import { publicProofPage } from './public-proof.view';
import { ProofsService } from './proofs.service';

/** The address printed on every proof and carried by its QR code: a check anyone can make without an account. */
// A page like the bay pages, kept out of the API document (README: proof of repair).
@ApiExcludeController()
@Controller('proofs')
export class PublicProofController {
  constructor(private readonly proofs: ProofsService) {}

  @Get(':digest')
  @PublicRoute()
  async check(@Param('digest') digest: string, @Req() req: Request, @Res() res: Response) {
    const answer = await this.proofs.publicCheck(digest);
    res.setHeader('Cache-Control', 'no-store');
    res.status(answer.known ? 200 : 404);
    if (req.accepts(['html', 'json']) === 'json') res.json(answer);
    else res.type('html').send(publicProofPage(answer));
  }
}
