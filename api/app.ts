import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
import { constants as zlibConstants } from 'node:zlib';
import compression from 'compression';
import cookieParser from 'cookie-parser';
import express, { Router, type Express } from 'express';
import type { AppDeps } from './app-deps';
import { authenticate } from './auth/authenticate';
import { requireSameOrigin } from './auth/same-origin';
import { allEndpoints } from './endpoints';
import { mountEndpoint } from './http/endpoint';
import { HeavyRequestLimiter } from './http/heavy-requests';
import { WebIndex, cspNonce, securityHeaders } from './http/security-headers';
import { apiNotFound, errorHandler } from './http/error-handler';
import { webApp } from './http/web-app';
import { buildOpenApiDocument } from './openapi/openapi-document';
import { withDefaultServices } from './app-services';
import { runtimeOf } from './app-runtime';

/** Where the API router is mounted; every endpoint's documented path starts with it. */
const API_PREFIX = '/api';
/** Smallest API answer worth compressing, bytes (the compression middleware's default, 1 kB). */
const COMPRESS_ABOVE_BYTES = 1024;

/**
 * Builds the Express application without listening, so tests drive it in-process with
 * supertest and `main.ts` decides where it listens.
 */
export function createApp(givenDeps: AppDeps): Express {
  const deps = withDefaultServices(givenDeps);
  const app = express();
  app.disable('x-powered-by');
  // API answers are never cached (no-store), so hashing each body for an ETag would only cost the
  // event loop time (megabytes for a long preview). Tiles set their own ETag; static files too.
  app.set('etag', false);
  const webDir = resolve(deps.config.WEB_DIR);
  const index = deps.config.WEB_DIR && existsSync(resolve(webDir, 'index.html')) ? WebIndex.load(resolve(webDir, 'index.html')) : null;
  app.use(cspNonce, securityHeaders({ publicUrl: deps.config.PUBLIC_URL, index }));
  // X-Forwarded-For and -Proto are believed only from the proxies TRUST_PROXY names (none by default).
  app.set('trust proxy', deps.config.TRUST_PROXY);

  const endpoints = allEndpoints(deps);
  const openApiDocument = buildOpenApiDocument(endpoints);

  // Only /api passes through JSON and cookie parsing, the origin check, the session lookup and
  // no-store: the web app's files are served beside it (webApp) without any of that.
  const api = Router();
  // Every write empties the cache of list answers, in this process at once and in the others
  // through the database's announcements (api/http/answer-cache.ts).
  const answerCache = runtimeOf(deps).answerCache;
  api.use(answerCache.trackWrites());
  // Answers above 1 KiB (the middleware's default) are compressed when the client accepts it;
  // images and other compressed formats are left alone (compressible types only). The fastest
  // levels: on the fly, CPU time matters more than the last few per cent (a 20 km preview's
  // JSON shrinks about 4× even so), and zlib works on libuv's threads, off the event loop.
  api.use(
    compression({
      threshold: COMPRESS_ABOVE_BYTES,
      level: zlibConstants.Z_BEST_SPEED,
      brotli: { params: { [zlibConstants.BROTLI_PARAM_QUALITY]: 1 } },
    }),
  );
  api.use(express.json({ limit: '5mb' }));
  api.use(cookieParser());
  api.use(requireSameOrigin(deps.config.PUBLIC_URL));
  api.use(authenticate(deps));
  api.use((_req, res, next) => {
    res.set('Cache-Control', 'no-store');
    next();
  });
  api.get('/openapi.json', (_req, res) => {
    res.json(openApiDocument);
  });
  const heavyRequests = new HeavyRequestLimiter(deps.config.HEAVY_REQUESTS_PER_PERSON);
  const builtAnswers = runtimeOf(deps).builtAnswers;
  for (const definition of endpoints) mountEndpoint(api, definition, { heavyRequests, answerCache, builtAnswers, mountedAt: API_PREFIX });
  api.use(apiNotFound);
  app.use(API_PREFIX, api);

  if (index) app.use(webApp(webDir, index));

  app.use(errorHandler);
  return app;
}
