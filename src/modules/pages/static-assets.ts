import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import express, { type RequestHandler } from 'express';

/** `public/` at the project root: the same folder from `src/modules/pages` (tests) and `dist/modules/pages`. */
export const PUBLIC_DIR = resolve(__dirname, '..', '..', '..', 'public');

/** CSS and ES modules under /assets, no build step. Revalidated on every load (ETag), so a deploy shows at once. */
export function staticAssets(): RequestHandler {
  if (!existsSync(PUBLIC_DIR)) throw new Error(`The page assets folder ${PUBLIC_DIR} is missing.`);
  const serve = express.static(PUBLIC_DIR, { index: false, fallthrough: true, maxAge: 0, dotfiles: 'ignore' });
  return (req, res, next) => {
    // Mounted or not, serve by the path after /assets.
    req.url = req.originalUrl.replace(/^\/assets/, '').split('?')[0] || '/';
    res.setHeader('X-Content-Type-Options', 'nosniff');
    serve(req, res, next);
  };
}
