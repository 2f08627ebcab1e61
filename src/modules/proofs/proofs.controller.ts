import { Body, Controller, Get, Header, HttpCode, Post, Req, Res, StreamableFile } from '@nestjs/common';
import { ApiBody, ApiConsumes, ApiOperation, ApiProduces, ApiSecurity, ApiTags } from '@nestjs/swagger';
import type { Request, Response } from 'express';
import { openApiSchema, UuidParam, ZodPipe } from '../../common/validation/zod-input';
import { CurrentActor, type Actor } from '../identity/actor';
import { verifyInput } from './proof-upload';
import { VerifyProof } from './proofs.dto';
import { ProofsService } from './proofs.service';
import { PdfResponse, ProofCheck, ZResponse } from '../../common/openapi/responses';

/** The origin the caller reached us at: where the printed address and the QR code point. */
export function publicBase(req: Request): string | undefined {
  const host = req.get('host');
  return host && /^[A-Za-z0-9.:[\]-]+$/.test(host) ? `${req.protocol}://${host}` : undefined;
}

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
    summary: 'The proof-of-repair PDF (repaired or later; 409 before), on the shop’s paper, with its SHA-256 evidence digest in the X-Proof-Digest header',
  })
  @Header('Cache-Control', 'no-store')
  async pdf(@CurrentActor() actor: Actor, @UuidParam('id') id: string, @Req() req: Request, @Res({ passthrough: true }) res: Response) {
    const { pdf, digest, number } = await this.proofs.pdf(actor, id, publicBase(req));
    res.setHeader('Content-Type', 'application/pdf');
    res.setHeader('Content-Disposition', `inline; filename="proof-of-repair-${number.replace(/[^A-Za-z0-9-]/g, '_')}.pdf"`);
    res.setHeader('X-Proof-Digest', digest);
    return new StreamableFile(pdf);
  }

  @Post('proofs/verify')
  @ZResponse(ProofCheck)
  @HttpCode(200)
  @ApiConsumes('application/json', 'application/pdf', 'multipart/form-data')
  @ApiOperation({
    summary: 'Does a proof (its PDF or its digest) still match the repair order’s evidence? If not, what changed since',
    description: 'Send JSON {digest} (the printed "sha256:…" form is accepted) or {pdfBase64}, the PDF itself as application/pdf, or a multipart/form-data upload with the PDF as a file.',
  })
  @ApiBody({ schema: openApiSchema(VerifyProof) })
  verify(@CurrentActor() actor: Actor, @Req() req: Request, @Body() body: unknown) {
    return this.proofs.verify(actor, verifyInput(body, req.get('content-type'), (v) => this.verifyBody.transform(v)));
  }
}
