/** Where a request carries its credential, and the cookies the pages use. */
import type { CookieOptions, Request, Response } from 'express';
import type { AppConfig } from '../../config/config';

/** The page session (HttpOnly: page scripts never see it). */
export const SESSION_COOKIE = 'tracebay_session';
/** The session's CSRF token, readable by the page scripts, which send it back in the X-CSRF-Token header. */
export const CSRF_COOKIE = 'tracebay_csrf';
/** Before sign-in: a random value the sign-in form must repeat (double-submit), against forged sign-ins. */
export const PRE_SESSION_COOKIE = 'tracebay_pre';
export const CSRF_HEADER = 'x-csrf-token';
/** Field name of the token in HTML forms. */
export const CSRF_FIELD = '_csrf';

export function readCookie(req: Request, name: string): string | undefined {
  for (const part of req.header('cookie')?.split(';') ?? []) {
    const [key, ...value] = part.trim().split('=');
    if (key === name) {
      try {
        return decodeURIComponent(value.join('='));
      } catch {
        return undefined;
      }
    }
  }
  return undefined;
}

export function bearerToken(req: Request): string | undefined {
  const match = /^Bearer ([A-Za-z0-9_-]{20,200})$/.exec(req.header('authorization') ?? '');
  return match?.[1];
}

/** Secure when the browser reached us over https (directly, or through a trusted proxy) or when configured so. */
export function cookieOptions(req: Request, config: AppConfig, extra: CookieOptions = {}): CookieOptions {
  return { path: '/', sameSite: 'lax', httpOnly: true, secure: config.secureCookies || req.secure, ...extra };
}

export function setSessionCookies(req: Request, res: Response, config: AppConfig, secret: string, csrf: string, expires: Date): void {
  res.cookie(SESSION_COOKIE, secret, cookieOptions(req, config, { expires }));
  res.cookie(CSRF_COOKIE, csrf, cookieOptions(req, config, { expires, httpOnly: false, sameSite: 'strict' }));
}

export function clearSessionCookies(req: Request, res: Response, config: AppConfig): void {
  const { expires: _e, maxAge: _m, ...options } = cookieOptions(req, config);
  res.clearCookie(SESSION_COOKIE, options);
  res.clearCookie(CSRF_COOKIE, { ...options, httpOnly: false, sameSite: 'strict' });
}
