import type { NextFunction, Request, Response } from 'express';

/**
 * API answers carry people's names, vehicles and readings: no browser or proxy may keep a copy (a shared bay
 * tablet's cache outlives the sign-in). The documentation's static files are left cacheable.
 */
export function noStoreOnApi(req: Request, res: Response, next: NextFunction): void {
  if (req.path.startsWith('/api/') && !req.path.startsWith('/api/docs')) res.setHeader('Cache-Control', 'no-store');
  next();
}
