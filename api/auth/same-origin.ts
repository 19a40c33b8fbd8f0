import type { RequestHandler } from 'express';
import { ForbiddenError } from '../http/http-error';

const SAFE_METHODS = new Set(['GET', 'HEAD', 'OPTIONS']);

/**
 * CSRF defence for cookie-authenticated writes, on top of SameSite=Strict cookies: a browser
 * always sends Origin (or Sec-Fetch-Site) on a cross-site POST, so a write whose Origin is not
 * this site's is refused. Requests without either header come from non-browser clients, which
 * carry no ambient cookies to abuse.
 */
export function requireSameOrigin(publicUrl: string): RequestHandler {
  const allowed = new URL(publicUrl).origin;
  return (req, _res, next) => {
    if (SAFE_METHODS.has(req.method)) return next();
    const origin = req.get('origin');
    const site = req.get('sec-fetch-site');
    const ownOrigin = `${req.protocol}://${req.get('host')}`;
    if (origin && origin !== allowed && origin !== ownOrigin) {
      throw new ForbiddenError(`Requests from ${origin} are not accepted`, 'cross_origin');
    }
    if (site === 'cross-site') throw new ForbiddenError('Cross-site requests are not accepted', 'cross_origin');
    next();
  };
}
