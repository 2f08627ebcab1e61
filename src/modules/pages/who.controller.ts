import { Body, Controller, Get, Post, Query, Res, UseFilters } from '@nestjs/common';
import { ApiExcludeController } from '@nestjs/swagger';
import type { Response } from 'express';
import { z } from 'zod';
import { CurrentActor, type Actor } from '../identity/actor';
import { ACTOR_COOKIE, PublicRoute } from '../identity/actor.guard';
import { UsersRepository } from '../identity/users.repository';
import { html } from './html';
import { page } from './layout.view';
import { PagesErrorFilter } from './pages-error.filter';
import { PagesRepository } from './pages.repository';

const Choice = z.object({ user: z.uuid(), next: z.string().max(300).optional() });

/** Only same-site paths: never send the browser elsewhere after choosing. */
function safeNext(next: string | undefined): string | undefined {
  return next && /^\/(?!\/)[\w\-./?=&%]*$/.test(next) && !next.startsWith('/who') ? next : undefined;
}

export function homeFor(role: Actor['role']): string {
  return role === 'technician' ? '/bay' : '/board';
}

/**
 * "Who is at this tablet": a temporary stand-in until sign-in exists. It lists the active people of the shop and
 * remembers the choice in the same cookie the API accepts, so the pages' own calls to /api carry it.
 */
@ApiExcludeController()
@UseFilters(PagesErrorFilter)
@Controller()
export class WhoController {
  constructor(
    private readonly pages: PagesRepository,
    private readonly users: UsersRepository,
  ) {}

  @Get()
  home(@CurrentActor() actor: Actor, @Res() res: Response) {
    res.redirect(303, homeFor(actor.role));
  }

  @Get('who')
  @PublicRoute()
  async picker(@Query('next') next: string | undefined, @Res() res: Response) {
    const shops = await this.pages.activePeople();
    const target = safeNext(typeof next === 'string' ? next : undefined);
    const body = html`<h1>Who is at this tablet?</h1>
      <p class="lead">Tap your name. Everything you enter is recorded under it.</p>
      <p class="note">Until sign-in arrives, anyone at the tablet can pick any name: pick your own.</p>
      ${shops
        .filter((s) => s.users.length > 0)
        .map(
          (shop) => html`<section class="panel" aria-labelledby="shop-${shop.id}">
            <h2 id="shop-${shop.id}">${shop.name}</h2>
            <form method="post" action="/who" class="people">
              ${target ? html`<input type="hidden" name="next" value="${target}">` : ''}
              ${shop.users.map(
                (u) => html`<button class="person" type="submit" name="user" value="${u.id}">
                  <span class="person-name">${u.name}</span><span class="person-role">${u.role}</span></button>`,
              )}
            </form>
          </section>`,
        )}`;
    res.type('html').send(page({ title: 'Who is at this tablet', page: 'who' }, body).value);
  }

  @Post('who')
  @PublicRoute()
  async choose(@Body() body: unknown, @Res() res: Response) {
    const parsed = Choice.safeParse(body);
    const user = parsed.success ? await this.users.findActive(parsed.data.user) : null;
    if (!parsed.success || !user) {
      res.redirect(303, '/who');
      return;
    }
    // HttpOnly: the pages are rendered on the server and their scripts call same-origin /api, which sends it.
    res.cookie(ACTOR_COOKIE, user.id, { path: '/', sameSite: 'lax', httpOnly: true, maxAge: 14 * 24 * 3600_000 });
    res.redirect(303, safeNext(parsed.data.next) ?? homeFor(user.role));
  }
}
