import { Controller, HttpCode, Inject, Post, Req, Res } from '@nestjs/common';
import { ApiOperation, ApiSecurity, ApiTags } from '@nestjs/swagger';
import type { Request, Response } from 'express';
import { APP_CONFIG, type AppConfig } from '../../config/config';
import { ZBody } from '../../common/validation/zod-input';
import { PublicRoute, type RequestWithCredential } from '../identity/actor.guard';
import { SignInBody } from './auth.dto';
import { AuthService } from './auth.service';
import { clearSessionCookies, setSessionCookies } from './credentials';
import { csrfTokenFor } from './secrets';
import { SignedIn, SignedOut, ZResponse } from '../../common/openapi/responses';

@ApiTags('sign-in')
@Controller('api/auth')
export class AuthController {
  constructor(
    private readonly auth: AuthService,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  @Post('sign-in')
  @ZResponse(SignedIn)
  @PublicRoute()
  @HttpCode(200)
  @ApiOperation({
    summary: 'Sign in with email and password: a bearer token for API clients, or the pages’ session cookie ("as": "session")',
    description: 'Every failure answers the same 401, whether the email exists or the account is locked (10 failures in a row lock it for 15 minutes).',
  })
  async signIn(@ZBody(SignInBody) body: SignInBody, @Req() req: Request, @Res({ passthrough: true }) res: Response) {
    const kind = body.as === 'session' ? 'page' : 'api';
    const signed = await this.auth.signIn(body.email, body.password, kind, req.header('user-agent') ?? '');
    if (kind === 'page') {
      const csrfToken = csrfTokenFor(signed.secret);
      setSessionCookies(req, res, this.config, signed.secret, csrfToken, signed.expiresAt);
      return { user: signed.actor, expiresAt: signed.expiresAt.toISOString(), csrfToken };
    }
    return { token: signed.secret, tokenType: 'Bearer', expiresAt: signed.expiresAt.toISOString(), user: signed.actor };
  }

  @Post('sign-out')
  @ZResponse(SignedOut)
  @HttpCode(200)
  @ApiSecurity('user')
  @ApiOperation({ summary: 'Sign out: the token or session used for this call stops working at once, on every instance' })
  async signOut(@Req() req: RequestWithCredential, @Res({ passthrough: true }) res: Response) {
    await this.auth.signOut(req.credential!.secret);
    if (req.credential!.via === 'session') clearSessionCookies(req, res, this.config);
    return { signedOut: true };
  }
}
