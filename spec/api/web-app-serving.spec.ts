import { mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createTestContext, type TestContext } from '../support/test-app';

/**
 * The built web app served by the API, installed the way a checkout under a hidden folder is
 * (issue 10): every path in the web root's parents may contain a dot-directory.
 */
describe('serving the built web app', () => {
  let parent: string;
  let context: TestContext;

  beforeAll(() => {
    parent = mkdtempSync(join(tmpdir(), 'descentry-web-'));
    const webDir = join(parent, '.hidden', 'checkout', 'dist', 'web', 'browser');
    mkdirSync(webDir, { recursive: true });
    writeFileSync(join(webDir, 'index.html'), '<!doctype html><title>Descentry</title><app-root></app-root>');
    writeFileSync(join(webDir, 'main-ABC.js'), 'console.log("app")');
    context = createTestContext({ WEB_DIR: webDir });
  });

  afterAll(async () => {
    await context.close();
    rmSync(parent, { recursive: true, force: true });
  });

  it('answers index.html for the root when the web root lies under a dot-directory', async () => {
    const response = await request(context.app).get('/');

    expect(response.status).toBe(200);
    expect(response.headers['content-type']).toMatch(/text\/html/);
    expect(response.text).toMatch(/<app-root[ >]/);
  });

  it('answers index.html for a deep link and an e-mailed link when the web root lies under a dot-directory', async () => {
    for (const path of ['/scenarios/3a5d4046-48a5-4a78-ac98-8552c9ff0ac7', '/accept-invite?token=abc', '/reviews/x/y']) {
      const response = await request(context.app).get(path);

      expect(response.status, path).toBe(200);
      expect(response.text, path).toMatch(/<app-root[ >]/);
      expect(response.headers['cache-control'], path).toBe('no-cache');
    }
  });

  it('serves the built files themselves', async () => {
    const response = await request(context.app).get('/main-ABC.js');

    expect(response.status).toBe(200);
    expect(response.text).toContain('console.log');
  });

  it('keeps answering unknown API paths with the JSON 404', async () => {
    const response = await request(context.app).get('/api/no-such-thing');

    expect(response.status).toBe(404);
    expect(response.body.error.code).toBeDefined();
  });
});
