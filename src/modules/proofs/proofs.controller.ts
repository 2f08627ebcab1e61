import { Body, Controller, Get, Header, HttpCode, Post, Req, Res, StreamableFile } from '@nestjs/common';
import { ApiBody, ApiOperation, ApiProduces, ApiSecurity, ApiTags } from '@nestjs/swagger';
import type { Request, Response } from 'express';
import { openApiSchema, UuidParam, ZodPipe } from '../../common/validation/zod-input';
import { CurrentActor, type Actor } from '../identity/actor';
import { VerifyProof } from './proofs.dto';
import { ProofsService } from './proofs.service';
import { PdfResponse, ProofCheck, ZResponse } from '../../common/openapi/responses';

@ApiTags('proof of repair')
@ApiSecurity('user')
@Controller('api')
export class ProofsController {
  private readonly verifyBody = new ZodPipe(VerifyProof, 'body');

  constructor(private readonly proofs: ProofsService) {}

  @Get('repair-orders/:id/proof.pdf')
  @PdfResponse('the proof of repair, a PDF with its evidence digest')
  @ApiProduces('application/pdf')
  @ApiOperation({
    summary: 'The proof-of-repair PDF (repaired or later; 409 before), with its SHA-256 evidence digest in the X-Proof-Digest header',
  })
  @Header('Cache-Control', 'no-store')
  async pdf(@CurrentActor() actor: Actor, @UuidParam('id') id: string, @Res({ passthrough: true }) res: Response) {
    const { pdf, digest, number } = await this.proofs.pdf(actor, id);
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `inline; filename="proof-of-repair-${number.replace(/[^A-Za-z0-9-]/g, '_')}.pdf"`);
    res.setHeader('X-Proof-Digest', digest);
    return new StreamableFile(pdf);
  }

  @Post('proofs/verify')
  @ZResponse(ProofCheck)
  @HttpCode(200)
  @ApiOperation({
    summary: 'Does a proof (its PDF or its digest) still match the repair order’s evidence? If not, what changed since',
    description: 'Send JSON {digest} or {pdfBase64}, or the PDF itself with Content-Type application/pdf.',
  })
  @ApiBody({ schema: openApiSchema(VerifyProof) })
  verify(@CurrentActor() actor: Actor, @Req() req: Request, @Body() body: unknown) {
    const input = Buffer.isBuffer(body) ? body : this.verifyBody.transform(req.is('application/pdf') ? {} : body);
    return this.proofs.verify(actor, input);
  }
}
