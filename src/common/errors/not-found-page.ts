/**
 * A mistyped page address (not under /api) asked for by a browser gets an HTML "Not found" page instead of the
 * API's JSON. The pages module registers how to draw it, so this layer needs no page code.
 */
import type { Request } from 'express';

type Render = (request: Request) => string;
let render: Render | null = null;

export function registerNotFoundPage(draw: Render): void {
  render = draw;
}

/** The page for this request, or null when the answer should stay JSON (API paths, clients not asking for HTML). */
export function notFoundPage(request: Request): string | null {
  if (!render || request.path === '/api' || request.path.startsWith('/api/')) return null;
  return request.accepts(['json', 'html']) === 'html' ? render(request) : null;
}
