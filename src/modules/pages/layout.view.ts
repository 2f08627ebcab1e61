/** The page shell shared by every screen: head, the bar naming who is at the tablet, and the connection line. */
import type { Actor } from '../identity/actor';
import { html, raw, type Renderable, type SafeHtml } from './html';

/** Inline icons: always next to words, never the only sign of meaning. */
export const ICON = {
  caution: raw(
    '<svg class="icon" viewBox="0 0 24 24" aria-hidden="true" focusable="false"><path d="M12 2 1 21h22L12 2z" fill="currentColor"/><path d="M11 9h2v6h-2zm0 8h2v2h-2z" fill="#fff"/></svg>',
  ),
  flag: raw(
    '<svg class="icon" viewBox="0 0 24 24" aria-hidden="true" focusable="false"><path d="M5 2h2v20H5zM8 3h11l-3 4 3 4H8z" fill="currentColor"/></svg>',
  ),
  clock: raw(
    '<svg class="icon" viewBox="0 0 24 24" aria-hidden="true" focusable="false"><circle cx="12" cy="12" r="10" fill="none" stroke="currentColor" stroke-width="2.5"/><path d="M11 6h2v6l4 3-1 1.6-5-3.6z" fill="currentColor"/></svg>',
  ),
  cross: raw(
    '<svg class="icon" viewBox="0 0 24 24" aria-hidden="true" focusable="false"><path d="M4 6.5 6.5 4 12 9.5 17.5 4 20 6.5 14.5 12l5.5 5.5-2.5 2.5-5.5-5.5L6.5 20 4 17.5 9.5 12z" fill="currentColor"/></svg>',
  ),
  check: raw(
    '<svg class="icon" viewBox="0 0 24 24" aria-hidden="true" focusable="false"><path d="M9 16.2 4.8 12l-1.8 1.8L9 19.8 21 7.8 19.2 6z" fill="currentColor"/></svg>',
  ),
  pending: raw(
    '<svg class="icon" viewBox="0 0 24 24" aria-hidden="true" focusable="false"><path d="M12 3a9 9 0 1 0 9 9h-2.5A6.5 6.5 0 1 1 12 5.5z" fill="currentColor"/><path d="M12 7h2v6h-2z" fill="currentColor"/></svg>',
  ),
};

export interface PageOptions {
  title: string;
  actor?: Actor;
  /** ES modules under /assets/js to load. */
  scripts?: string[];
  /** Where "back" goes (shown before the title). */
  back?: { href: string; label: string };
  /** data-page attribute, read by the client modules and the tests. */
  page: string;
}

const ROLE_WORDS: Record<string, string> = { technician: 'technician', foreman: 'foreman', admin: 'admin' };

function nav(actor: Actor | undefined): SafeHtml {
  if (!actor) return html``;
  const lead = actor.role !== 'technician';
  return html`<nav class="top-nav" aria-label="Main">
    <a href="/bay" class="nav-link">My repair orders</a>
    ${lead ? html`<a href="/board" class="nav-link">Shop board</a>` : ''}
  </nav>`;
}

export function page(options: PageOptions, body: Renderable): SafeHtml {
  const { title, actor, scripts = [], back } = options;
  return html`<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="color-scheme" content="light">
<title>${title} · Tracebay</title>
<link rel="icon" href="data:,">
<link rel="stylesheet" href="/assets/css/tracebay.css">
${scripts.map((s) => html`<script type="module" src="/assets/js/${s}"></script>`)}
</head>
<body data-page="${options.page}">
<a class="skip" href="#main">Skip to the content</a>
<header class="bar">
  <a class="brand" href="/">Tracebay</a>
  ${nav(actor)}
  ${
    actor
      ? html`<div class="who"><span class="who-name">${actor.name}</span> <span class="who-role">${ROLE_WORDS[actor.role]}</span>
      <a class="button small ghost" href="/sign-out">Sign out</a></div>`
      : ''
  }
</header>
<div id="connection" class="connection" role="status" aria-live="polite" hidden></div>
<main id="main" tabindex="-1">
${back ? html`<p class="back"><a href="${back.href}">← ${back.label}</a></p>` : ''}
${body}
</main>
<script type="module" src="/assets/js/shell.js"></script>
</body>
</html>`;
}

/** An error or a not-found, in the page shell. */
export function errorPage(status: number, message: string, actor?: Actor): SafeHtml {
  const heading =
    status === 404 ? 'Not found' : status === 403 ? 'Not allowed' : status === 409 ? 'Not possible now' : status === 429 ? 'Too many tries' : 'Something went wrong';
  return page(
    { title: heading, actor, page: 'error' },
    html`<h1>${heading}</h1><p class="lead">${message}</p><p><a class="button" href="/">Back to the start</a></p>`,
  );
}
