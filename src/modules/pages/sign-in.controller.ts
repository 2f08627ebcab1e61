import { Body, Controller, Get, Inject, Post, Query, Req, Res, UseFilters } from '@nestjs/common';
import { ApiExcludeController } from '@nestjs/swagger';
import type { Request, Response } from 'express';
import { z } from 'zod';
import { APP_CONFIG, type AppConfig } from '../../config/config';
import { DomainException } from '../../common/errors/domain.exception';
import { AuthService } from '../auth/auth.service';
import { clearSessionCookies, cookieOptions, CSRF_FIELD, PRE_SESSION_COOKIE, readCookie, setSessionCookies } from '../auth/credentials';
import { csrfTokenFor, newSecret, sameToken } from '../auth/secrets';
import { CurrentActor, type Actor } from '../identity/actor';
import { PublicRoute, type RequestWithCredential } from '../identity/actor.guard';
import { html } from './html';
import { page } from './layout.view';
import { PagesErrorFilter } from './pages-error.filter';

const SignInForm = z.object({ email: z.string().max(254), password: z.string().max(1024), [CSRF_FIELD]: z.string().max(100), next: z.string().max(300).optional() });

/** Only same-site paths: never send the browser elsewhere after signing in. */
export function safeNext(next: unknown): string | undefined {
  return typeof next === 'string' && /^\/(?!\/)[\w\-./?=&%]*$/.test(next) && !next.startsWith('/sign-') ? next : undefined;
}

export function homeFor(role: Actor['role']): string {
  return role === 'technician' ? '/bay' : '/board';
}

function signInPage(preToken: string, next: string | undefined, error?: string) {
  return page(
    { title: 'Sign in', page: 'sign-in' },
    html`<h1>Sign in</h1>
      <p class="lead">Everything you enter is recorded under your name.</p>
      <form method="post" action="/sign-in" class="form panel" id="sign-in">
        ${error ? html`<p class="form-error" role="alert">${error}</p>` : ''}
        <input type="hidden" name="${CSRF_FIELD}" value="${preToken}">
        ${next ? html`<input type="hidden" name="next" value="${next}">` : ''}
        <div class="field"><label for="email">Email</label><input id="email" name="email" type="email" autocomplete="username" required></div>
        <div class="field"><label for="password">Password</label><input id="password" name="password" type="password" autocomplete="current-password" required></div>
        <p><button class="button primary big" type="submit">Sign in</button></p>
      </form>
      <p class="note">Forgot your password? The shop admin sets a new one.</p>`,
  );
}

/**
 * Sign-in and sign-out for the pages. The sign-in form is protected against forged sign-ins by a pre-session
 * double-submit value (cookie and hidden field must match); after sign-in the session cookie is HttpOnly and the
 * forms and page scripts carry the session's CSRF token.
 */
@ApiExcludeController()
@UseFilters(PagesErrorFilter)
@Controller()
export class SignInController {
  constructor(
    private readonly auth: AuthService,
    @Inject(APP_CONFIG) private readonly config: AppConfig,
  ) {}

  @Get()
  home(@CurrentActor() actor: Actor, @Res() res: Response) {
    res.redirect(303, homeFor(actor.role));
  }

  @Get('sign-in')
  @PublicRoute()
  form(@Query('next') next: unknown, @Req() req: Request, @Res() res: Response) {
    const pre = this.preToken(req, res);
    res.type('html').send(signInPage(pre, safeNext(next)).value);
  }

  @Post('sign-in')
  @PublicRoute()
  async signIn(@Body() body: unknown, @Req() req: Request, @Res() res: Response) {
    const parsed = SignInForm.safeParse(body ?? {});
    const next = safeNext(parsed.success ? parsed.data.next : undefined);
    if (!parsed.success || !sameToken(parsed.data[CSRF_FIELD], readCookie(req, PRE_SESSION_COOKIE) ?? '\0')) {
      res.status(403).type('html').send(signInPage(this.preToken(req, res), next, 'The sign-in form had expired. Please try again.').value);
      return;
    }
    try {
      const signed = await this.auth.signIn(parsed.data.email, parsed.data.password, 'page', req.header('user-agent') ?? '');
      setSessionCookies(req, res, this.config, signed.secret, csrfTokenFor(signed.secret), signed.expiresAt);
      res.clearCookie(PRE_SESSION_COOKIE, cookieOptions(req, this.config));
      res.redirect(303, next ?? homeFor(signed.actor.role));
    } catch (error) {
      if (!(error instanceof DomainException) || error.kind !== 'unauthenticated') throw error;
      res.status(401).type('html').send(signInPage(this.preToken(req, res), next, error.message).value);
    }
  }

  @Get('sign-out')
  signOutForm(@CurrentActor() actor: Actor, @Req() req: RequestWithCredential, @Res() res: Response) {
    const token = req.credential?.via === 'session' ? csrfTokenFor(req.credential.secret) : '';
    const body = html`<h1>Sign out</h1>
      <p class="lead">Signed in as ${actor.name}. Sign out so the next person at this tablet signs in under their own name.</p>
      <form method="post" action="/sign-out" id="sign-out"><input type="hidden" name="${CSRF_FIELD}" value="${token}">
        <button class="button primary big" type="submit">Sign out</button></form>`;
    res.type('html').send(page({ title: 'Sign out', page: 'sign-out', actor }, body).value);
  }

  @Post('sign-out')
  async signOut(@Req() req: RequestWithCredential, @Res() res: Response) {
    await this.auth.signOut(req.credential!.secret);
    clearSessionCookies(req, res, this.config);
    res.redirect(303, '/sign-in');
  }

  /** The pre-session value: kept while the browser has one, so two open sign-in tabs both work. */
  private preToken(req: Request, res: Response): string {
    const existing = readCookie(req, PRE_SESSION_COOKIE);
    if (existing && /^[A-Za-z0-9_-]{43}$/.test(existing)) return existing;
    const fresh = newSecret();
    res.cookie(PRE_SESSION_COOKIE, fresh, cookieOptions(req, this.config, { maxAge: 3_600_000 }));
    return fresh;
  }
}
