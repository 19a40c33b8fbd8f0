import { createHash, randomBytes } from 'node:crypto';
import { readFileSync } from 'node:fs';
import type { RequestHandler, Response } from 'express';
import helmet from 'helmet';
import { HASHED_NAME } from './web-app';

/**
 * The built web app's index.html as the server hands it out. The Angular build runs with
 * `security.autoCsp`, so its only inline scripts are the loader it generates; their SHA-256
 * hashes (and the critical CSS it inlines) are computed here once, so the policy allows exactly
 * them and nothing else. Angular's own component styles are added at run time: each answer gets
 * a fresh nonce, placed on <app-root ngCspNonce> for Angular to put on every style it inserts.
 */
export class WebIndex {
  readonly scriptHashes: string[];
  readonly styleHashes: string[];

  constructor(private readonly html: string) {
    this.scriptHashes = inlineBlocks(html, 'script').map(sha256Source);
    this.styleHashes = inlineBlocks(html, 'style').map(sha256Source);
  }

  static load(path: string): WebIndex {
    return new WebIndex(readFileSync(path, 'utf8'));
  }

  /** The page for one answer, carrying that answer's nonce. */
  render(nonce: string): string {
    return this.html.replace(/<app-root(\s|>)/, `<app-root ngCspNonce="${nonce}"$1`);
  }
}

/** A fresh nonce for this answer (`res.locals.cspNonce`), used by the CSP and by WebIndex.render. */
export const cspNonce: RequestHandler = (_req, res, next) => {
  res.locals['cspNonce'] = randomBytes(18).toString('base64');
  next();
};

/**
 * Security headers on every answer (helmet): a Content-Security-Policy that allows only this
 * site's own scripts, styles, fonts, images and API (no inline script but the build's hashed
 * loader, no framing, no plugins), X-Content-Type-Options, Referrer-Policy, X-Frame-Options,
 * and HSTS when the public address is HTTPS. Hashed build files and map tiles
 * (`isSubresourcePath`) get only the headers that act on a subresource.
 */
export function securityHeaders(options: { publicUrl: string; index: WebIndex | null }): RequestHandler {
  const https = new URL(options.publicUrl).protocol === 'https:';
  const strictTransportSecurity = https ? { maxAge: 180 * 86_400, includeSubDomains: true } : false;
  // Scripts, styles, fonts and tiles: X-Content-Type-Options (a script or style is used only with
  // its declared type), Cross-Origin-Resource-Policy (no other site may embed them) and HSTS. The
  // document-only headers would add about 700 bytes to each of the ~90 files a map page loads.
  const subresourceHeaders = helmet({
    contentSecurityPolicy: false,
    crossOriginEmbedderPolicy: false,
    crossOriginOpenerPolicy: false,
    originAgentCluster: false,
    referrerPolicy: false,
    strictTransportSecurity,
    xDnsPrefetchControl: false,
    xDownloadOptions: false,
    xFrameOptions: false,
    xPermittedCrossDomainPolicies: false,
    xXssProtection: false,
  });
  const nonceSource = (_req: unknown, res: unknown) => `'nonce-${(res as Response).locals['cspNonce'] as string}'`;
  const documentHeaders = helmet({
    contentSecurityPolicy: {
      useDefaults: false,
      directives: {
        defaultSrc: ["'self'"],
        scriptSrc: ["'self'", ...(options.index?.scriptHashes ?? [])],
        styleSrc: ["'self'", nonceSource, ...(options.index?.styleHashes ?? [])],
        // Map tiles and chart images are this site's; Leaflet and the charts also draw data: URLs.
        imgSrc: ["'self'", 'data:', 'blob:'],
        fontSrc: ["'self'"],
        connectSrc: ["'self'"],
        objectSrc: ["'none'"],
        baseUri: ["'self'"],
        formAction: ["'self'"],
        frameAncestors: ["'none'"],
        ...(https ? { upgradeInsecureRequests: [] } : {}),
      },
    },
    strictTransportSecurity,
    referrerPolicy: { policy: 'same-origin' },
    xFrameOptions: { action: 'deny' },
    // The app loads nothing from other origins, so the default cross-origin isolation is fine.
    crossOriginEmbedderPolicy: false,
  });
  return (req, res, next) => (isSubresourcePath(req.path) ? subresourceHeaders(req, res, next) : documentHeaders(req, res, next));
}

const SUBRESOURCE_TYPE = /\.(js|css|woff2?|ttf|png|jpe?g)$/;
const TILE_PATH = /^\/api\/tiles\/(terrain|base)\/\d+\/\d+\/\d+\.(png|pbf)$/;

/**
 * Paths whose answers are only ever loaded by a page, never opened as one: the build's
 * content-hashed files (`/chunk-ABCD1234.js`, `/media/…-ABCD1234.woff2`) and map tiles (PNG and
 * vector tiles). A policy, framing and referrer rule only act on documents, so these answers
 * carry just what a subresource needs (see `securityHeaders`).
 */
export function isSubresourcePath(path: string): boolean {
  if (path.startsWith('/api/')) return TILE_PATH.test(path);
  return HASHED_NAME.test(path) && SUBRESOURCE_TYPE.test(path);
}

function inlineBlocks(html: string, tag: 'script' | 'style'): string[] {
  const pattern = new RegExp(`<${tag}(\\s[^>]*)?>([\\s\\S]*?)</${tag}>`, 'gi');
  const blocks: string[] = [];
  for (const match of html.matchAll(pattern)) {
    if (tag === 'script' && /\ssrc\s*=/i.test(match[1] ?? '')) continue;
    blocks.push(match[2] ?? '');
  }
  return blocks;
}

function sha256Source(text: string): string {
  return `'sha256-${createHash('sha256').update(text, 'utf8').digest('base64')}'`;
}
