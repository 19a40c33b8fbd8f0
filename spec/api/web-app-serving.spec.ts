import { spawnSync } from 'node:child_process';
import { get, type IncomingHttpHeaders, type Server } from 'node:http';
import type { AddressInfo } from 'node:net';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { brotliDecompressSync, gunzipSync } from 'node:zlib';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, type TestContext } from '../support/test-app';

interface RawAnswer {
  status: number;
  headers: IncomingHttpHeaders;
  body: Buffer;
}

/** A GET over a real socket, body as it came over the wire (supertest would decode it itself). */
function rawGet(server: Server, path: string, acceptEncoding: string): Promise<RawAnswer> {
  const { port } = server.address() as AddressInfo;
  return new Promise((resolve, reject) => {
    get({ host: '127.0.0.1', port, path, headers: { 'Accept-Encoding': acceptEncoding } }, (res) => {
      const chunks: Buffer[] = [];
      res.on('data', (chunk: Buffer) => chunks.push(chunk));
      res.on('end', () => resolve({ status: res.statusCode!, headers: res.headers, body: Buffer.concat(chunks) }));
    }).on('error', reject);
  });
}

/** A script large enough to be worth compressing, like the app's real bundles. */
const BUNDLE = Array.from({ length: 400 }, (_, i) => `export const figure${i} = "descent ${i}";`).join('\n');

/**
 * The built web app served by the API, installed the way a checkout under a hidden folder is
 * (every path in the web root's parents may contain a dot-directory), precompressed by the same
 * script the build runs.
 */
describe('serving the built web app', () => {
  let parent: string;
  let context: TestContext;
  let server: Server;

  beforeAll(() => {
    parent = mkdtempSync(join(tmpdir(), 'descentry-web-'));
    const webDir = join(parent, '.hidden', 'checkout', 'dist', 'web', 'browser');
    mkdirSync(join(webDir, 'media'), { recursive: true });
    // An index.html above the compression threshold, as the real one is.
    const filler = `<!-- ${'x'.repeat(3000)} -->`;
    writeFileSync(join(webDir, 'index.html'), `<!doctype html><title>Descentry</title>${filler}<app-root></app-root>`);
    writeFileSync(join(webDir, 'main-ABCD1234.js'), BUNDLE);
    writeFileSync(join(webDir, 'media', 'noto-sans-latin-400-normal-QWER5678.woff2'), Buffer.from([0x77, 0x4f, 0x46, 0x32, 1, 2, 3]));
    writeFileSync(join(webDir, 'favicon.ico'), Buffer.alloc(200, 1));
    const build = spawnSync(process.execPath, ['scripts/precompress-web.mjs', webDir], { encoding: 'utf8' });
    if (build.status !== 0) throw new Error(build.stderr);
    context = createTestContext({ WEB_DIR: webDir });
    server = context.app.listen(0, '127.0.0.1');
  });

  afterAll(async () => {
    await new Promise((resolve) => server.close(resolve));
    await context.close();
    rmSync(parent, { recursive: true, force: true });
  });

  it('answers index.html for the root when the web root lies under a dot-directory', async () => {
    const response = await request(context.app).get('/');

    expect(response.status).toBe(200);
    expect(response.headers['content-type']).toMatch(/text\/html/);
    expect(response.text).toMatch(/<app-root ngCspNonce="[^"]+">/);
  });

  it('answers index.html, revalidated each time, for a deep link and an e-mailed link', async () => {
    for (const path of ['/scenarios/3a5d4046-48a5-4a78-ac98-8552c9ff0ac7', '/accept-invite?token=abc', '/reviews/x/y']) {
      const response = await request(context.app).get(path);

      expect(response.status, path).toBe(200);
      expect(response.text, path).toContain('<app-root ngCspNonce=');
      expect(response.headers['cache-control'], path).toBe('no-cache');
    }
  });

  it('compresses index.html on the fly, with a fresh nonce in each answer', async () => {
    const first = await rawGet(server, '/routes', 'gzip');
    const second = await rawGet(server, '/routes', 'gzip');

    expect(first.headers['content-encoding']).toBe('gzip');
    const html = gunzipSync(first.body).toString('utf8');
    const nonce = /ngCspNonce="([^"]+)"/.exec(html)?.[1];
    expect(nonce).toBeTruthy();
    expect(first.headers['content-security-policy']).toContain(`'nonce-${nonce}'`);
    expect(gunzipSync(second.body).toString('utf8')).not.toContain(nonce!);
  });

  it('serves a hashed bundle as brotli written at build time, kept by browsers for a year', async () => {
    const response = await rawGet(server, '/main-ABCD1234.js', 'gzip, deflate, br');

    expect(response.status).toBe(200);
    expect(response.headers['content-encoding']).toBe('br');
    expect(response.headers['vary']).toMatch(/Accept-Encoding/i);
    expect(response.headers['content-type']).toMatch(/javascript/);
    expect(response.headers['cache-control']).toBe('public, max-age=31536000, immutable');
    expect(Number(response.headers['content-length'])).toBeLessThan(BUNDLE.length / 4);
    expect(brotliDecompressSync(response.body).toString('utf8')).toBe(BUNDLE);
  });

  it('serves the gzip copy to a client without brotli and the plain file to one without either', async () => {
    const gzip = await rawGet(server, '/main-ABCD1234.js', 'gzip');
    const plain = await request(context.app).get('/main-ABCD1234.js').set('Accept-Encoding', 'identity');

    expect(gzip.headers['content-encoding']).toBe('gzip');
    expect(gunzipSync(gzip.body).toString('utf8')).toBe(BUNDLE);
    expect(plain.headers['content-encoding']).toBeUndefined();
    expect(plain.text).toBe(BUNDLE);
    expect(plain.headers['cache-control']).toBe('public, max-age=31536000, immutable');
  });

  it('answers a repeat request for an unchanged file with 304', async () => {
    const first = await request(context.app).get('/favicon.ico');
    const again = await request(context.app).get('/favicon.ico').set('If-None-Match', first.headers['etag']!);

    expect(first.headers['cache-control']).toBe('no-cache');
    expect(again.status).toBe(304);
  });

  it('keeps hashed fonts for a year and sends them as they are (already compressed)', async () => {
    const response = await request(context.app).get('/media/noto-sans-latin-400-normal-QWER5678.woff2').set('Accept-Encoding', 'br, gzip');

    expect(response.status).toBe(200);
    expect(response.headers['content-encoding']).toBeUndefined();
    expect(response.headers['cache-control']).toBe('public, max-age=31536000, immutable');
  });

  it('serves files without the API middleware: no JSON parsing, origin check, session lookup or no-store', async () => {
    const response = await request(context.app)
      .get('/main-ABCD1234.js')
      .set('Content-Type', 'application/json')
      .set('Origin', 'https://elsewhere.example')
      .set('Sec-Fetch-Site', 'cross-site')
      .set('Cookie', 'descentry_session=not-a-token')
      .send('{ not json');

    expect(response.status).toBe(200);
    expect(response.headers['cache-control']).not.toContain('no-store');
    expect(response.headers['set-cookie']).toBeUndefined();
  });

  it('answers 404 for a missing script instead of the page', async () => {
    const response = await request(context.app).get('/chunk-GONE0000.js');

    expect(response.status).toBe(404);
    expect(response.body.error.code).toBe('not_found');
  });

  it('leaves no built file but the pages reachable under /api', async () => {
    const response = await request(context.app).get('/api/main-ABCD1234.js');

    expect(response.status).toBe(404);
    expect(response.headers['cache-control']).toBe('no-store');
  });

  it('keeps answering unknown API paths with the JSON 404', async () => {
    const response = await request(context.app).get('/api/no-such-thing');

    expect(response.status).toBe(404);
    expect(response.body.error.code).toBe('not_found');
    expect(response.body.error.message).toContain('/api/no-such-thing');
  });

  it('compresses large API answers and leaves small ones as they are', async () => {
    const large = await rawGet(server, '/api/openapi.json', 'gzip');
    const small = await request(context.app).get('/api/health').set('Accept-Encoding', 'gzip');

    expect(large.headers['content-encoding']).toBe('gzip');
    expect(large.headers['cache-control']).toBe('no-store');
    expect(JSON.parse(gunzipSync(large.body).toString('utf8')).openapi).toMatch(/^3\.1/);
    expect(small.headers['content-encoding']).toBeUndefined();
    expect(small.body.status).toBe('ok');
  });

  it('writes brotli and gzip copies only for compressible files', () => {
    const webDir = join(parent, '.hidden', 'checkout', 'dist', 'web', 'browser');

    expect(readFileSync(join(webDir, 'main-ABCD1234.js.br')).length).toBeGreaterThan(0);
    expect(readFileSync(join(webDir, 'main-ABCD1234.js.gz')).length).toBeGreaterThan(0);
    expect(() => readFileSync(join(webDir, 'media', 'noto-sans-latin-400-normal-QWER5678.woff2.br'))).toThrow();
    expect(() => readFileSync(join(webDir, 'index.html.br'))).toThrow();
  });
});
