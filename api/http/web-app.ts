import type { ServerResponse } from 'node:http';
import { basename, extname } from 'node:path';
import compression from 'compression';
import { Router } from 'express';
import expressStaticGzip from 'express-static-gzip';
import { HttpError } from './http-error';
import type { WebIndex } from './security-headers';

/** A year, s: the longest max-age browsers honour (RFC 9111 recommends no more than one year). */
const IMMUTABLE_MAX_AGE_S = 31_536_000;
/**
 * Files the Angular build names after their content (`main-ABCD1234.js`, `chunk-…`, `styles-…`,
 * `media/…-ABCD1234.woff2`): their bytes never change under that name, so browsers keep them.
 */
export const HASHED_NAME = /-[A-Z0-9]{8}\.[a-z0-9]+$/;
/** Extensions that are files, never pages of the app: a missing one is a 404, not index.html. */
const ASSET_EXTENSIONS = new Set([
  '.js',
  '.mjs',
  '.css',
  '.map',
  '.woff',
  '.woff2',
  '.ttf',
  '.png',
  '.jpg',
  '.svg',
  '.ico',
  '.json',
  '.webmanifest',
  '.txt',
]);

export const STATIC_CACHE_CONTROL = {
  hashed: `public, max-age=${IMMUTABLE_MAX_AGE_S}, immutable`,
  /** Everything else may be kept but is revalidated (ETag / Last-Modified) before each use. */
  other: 'no-cache',
} as const;

/**
 * The built web app: static files with the compressed copies written at build time
 * (scripts/precompress-web.mjs; brotli, else gzip, by Accept-Encoding, with Vary), hashed files
 * cached for a year, and index.html rendered per answer for every path the Angular router owns
 * (revalidated each time, compressed on the fly: it carries that answer's CSP nonce).
 * None of this passes through the API's JSON, cookie, origin or session handling.
 */
export function webApp(webDir: string, index: WebIndex): Router {
  const router = Router();
  const files = expressStaticGzip(webDir, {
    enableBrotli: true,
    orderPreference: ['br', 'gzip'],
    index: false,
    serveStatic: {
      index: false,
      // serve-static would set max-age itself; the header is set here instead. `path` is the file
      // sent, so a precompressed copy's name ends in .br or .gz.
      cacheControl: false,
      setHeaders: (res: ServerResponse, path: string) => {
        res.setHeader(
          'Cache-Control',
          HASHED_NAME.test(basename(path).replace(/\.(br|gz)$/, '')) ? STATIC_CACHE_CONTROL.hashed : STATIC_CACHE_CONTROL.other,
        );
      },
    },
  });
  // index.html itself is only ever answered with its nonce (below), never as a plain file.
  router.use((req, res, next) => (req.path === '/index.html' ? next() : files(req, res, next)));
  router.use((req, _res, next) => {
    if (ASSET_EXTENSIONS.has(extname(req.path).toLowerCase())) {
      next(new HttpError(404, 'not_found', `No file ${req.path}`));
      return;
    }
    next();
  });
  // The Angular router owns every other path.
  router.get('/{*splat}', compression(), (_req, res) => {
    res.set('Cache-Control', STATIC_CACHE_CONTROL.other);
    res.type('html').send(index.render(res.locals['cspNonce'] as string));
  });
  return router;
}
