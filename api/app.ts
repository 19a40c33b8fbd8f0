import { existsSync } from 'node:fs';
import { resolve } from 'node:path';
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
import { buildOpenApiDocument } from './openapi/openapi-document';
import { withDefaultServices } from './app-services';

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

  const api = Router();
  api.use(express.json({ limit: '5mb' }));
  api.use(cookieParser());
  api.use(requireSameOrigin(deps.config.PUBLIC_URL));
  api.use(authenticate(deps));
  api.use((_req, res, next) => {
    res.set('Cache-Control', 'no-store');
    next();
  });
  api.get('/api/openapi.json', (_req, res) => {
    res.json(openApiDocument);
  });
  const heavyRequests = new HeavyRequestLimiter(deps.config.HEAVY_REQUESTS_PER_PERSON);
  for (const definition of endpoints) mountEndpoint(api, definition, { heavyRequests });
  api.use('/api', apiNotFound);
  app.use(api);

  if (index) {
    // index.html itself is only ever answered with its nonce (below), never as a plain file.
    const assets = express.static(webDir, { index: false, maxAge: '1h' });
    app.use((req, res, next) => (req.path === '/index.html' ? next() : assets(req, res, next)));
    // The Angular router owns every other path.
    app.get('/{*splat}', (_req, res) => {
      res.set('Cache-Control', 'no-cache');
      res.type('html').send(index.render(res.locals['cspNonce'] as string));
    });
  }

  app.use(errorHandler);
  return app;
}
