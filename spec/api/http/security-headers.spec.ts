import { createHash } from 'node:crypto';
import { mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, describe, expect, it } from 'vitest';
import { createApp } from '../../../api/app';
import { isSubresourcePath } from '../../../api/http/security-headers';
import { createTestContext, testConfig } from '../../support/test-app';

const LOADER = "\n  var scripts = [['main.js', 'module', false, false]];\n";
const CRITICAL_CSS = 'html{color:#123}';
const webDir = mkdtempSync(join(tmpdir(), 'descentry-web-'));
writeFileSync(
  join(webDir, 'index.html'),
  `<!doctype html><html><head><style>${CRITICAL_CSS}</style></head><body><app-root></app-root><script>${LOADER}</script></body></html>`,
);
writeFileSync(join(webDir, 'main.js'), 'console.log("app")');
const HASHED_SCRIPT = 'chunk-ABCD1234.js';
writeFileSync(join(webDir, HASHED_SCRIPT), 'console.log("chunk")');
const context = createTestContext({ WEB_DIR: webDir });

afterAll(async () => {
  await context.close();
  rmSync(webDir, { recursive: true, force: true });
});

describe('security headers (issue 11)', () => {
  it('serves the app with a policy that allows its own hashed loader and a fresh style nonce, and no framing', async () => {
    const first = await request(context.app).get('/routes/new');
    const second = await request(context.app).get('/routes/new');

    const policy = directives(first.headers['content-security-policy']);
    const nonce = /ngCspNonce="([^"]+)"/.exec(first.text)?.[1];
    expect(first.status).toBe(200);
    expect(policy['script-src']).toEqual(["'self'", `'sha256-${sha256(LOADER)}'`]);
    expect(policy['style-src']).toEqual(["'self'", `'nonce-${nonce}'`, `'sha256-${sha256(CRITICAL_CSS)}'`]);
    expect(policy['frame-ancestors']).toEqual(["'none'"]);
    expect(policy['object-src']).toEqual(["'none'"]);
    expect(policy['default-src']).toEqual(["'self'"]);
    expect(Object.values(policy).flat()).not.toContain("'unsafe-inline'");
    expect(/ngCspNonce="([^"]+)"/.exec(second.text)?.[1]).not.toBe(nonce);
    expect(first.headers['x-frame-options']).toBe('DENY');
    expect(first.headers['x-content-type-options']).toBe('nosniff');
    expect(first.headers['referrer-policy']).toBe('same-origin');
    expect(first.headers['strict-transport-security']).toBeUndefined();
  });

  it('never hands out index.html without its nonce', async () => {
    const direct = await request(context.app).get('/index.html');

    expect(direct.text).toMatch(/<app-root ngCspNonce="[^"]+">/);
  });

  it('puts the whole set on API answers and on files that are not content-hashed', async () => {
    const api = await request(context.app).get('/api/health');
    const asset = await request(context.app).get('/main.js');

    for (const response of [api, asset]) {
      expect(response.headers['content-security-policy']).toMatch(/frame-ancestors 'none'/);
      expect(response.headers['x-content-type-options']).toBe('nosniff');
    }
  });

  it('gives content-hashed build files only the headers that act on a subresource', async () => {
    const hashed = await request(context.app).get(`/${HASHED_SCRIPT}`);

    expect(hashed.status).toBe(200);
    expect(hashed.headers['x-content-type-options']).toBe('nosniff');
    expect(hashed.headers['cross-origin-resource-policy']).toBe('same-origin');
    for (const documentOnly of ['content-security-policy', 'x-frame-options', 'referrer-policy', 'cross-origin-opener-policy']) {
      expect(hashed.headers[documentOnly], documentOnly).toBeUndefined();
    }
  });

  it('counts hashed scripts, styles and fonts and map tiles as subresources, and nothing a browser could open as a page', () => {
    for (const path of [
      '/chunk-5ZW2BL6G.js',
      '/styles-SNL377KO.css',
      '/media/noto-sans-latin-400-normal-DUBPJEHV.woff2',
      '/api/tiles/terrain/12/2168/1446.png',
      '/api/tiles/base/10/542/361.pbf',
    ]) {
      expect(isSubresourcePath(path), path).toBe(true);
    }
    for (const path of [
      '/',
      '/routes/new',
      '/index.html',
      '/favicon.svg',
      '/media/logo-ABCD1234.svg',
      '/main.js',
      '/api/health',
      '/api/tiles/terrain/12/2168/1446.json',
      '/api/routes/x-ABCD1234.js',
    ]) {
      expect(isSubresourcePath(path), path).toBe(false);
    }
  });

  it('adds HSTS and upgrade-insecure-requests when the public address is HTTPS', async () => {
    const app = createApp({ ...context.deps, config: testConfig({ WEB_DIR: webDir, PUBLIC_URL: 'https://descentry.transit.example' }) });

    const response = await request(app).get('/');

    expect(response.headers['strict-transport-security']).toMatch(/max-age=15552000; includeSubDomains/);
    expect(response.headers['content-security-policy']).toMatch(/upgrade-insecure-requests/);
  });
});

// Helpers

function directives(header: string | undefined): Record<string, string[]> {
  return Object.fromEntries(
    (header ?? '')
      .split(';')
      .map((part) => part.trim().split(/\s+/))
      .filter((words) => words[0])
      .map(([name, ...values]) => [name!, values]),
  );
}

function sha256(text: string): string {
  return createHash('sha256').update(text).digest('base64');
}
