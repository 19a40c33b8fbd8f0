import { mkdtempSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import request from 'supertest';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { closeTerrainRuntime } from '../../../../api/terrain/terrain-runtime';
import { TileCache } from '../../../../api/terrain/tiles/tile-cache';
import { createTestContext, type TestContext } from '../../../support/test-app';
import { sessionCookies } from '../../../support/session-cookie';
import { truncateAll } from '../../../support/test-database';

const KIB = 1024;

describe('TileCache', () => {
  const dir = mkdtempSync(join(tmpdir(), 'descentry-tiles-'));
  afterAll(() => rmSync(dir, { recursive: true, force: true }));

  it('keeps the bytes on disk within its bound, deleting the least recently used tiles first (issue 11)', async () => {
    const cache = new TileCache(dir, 500 * KIB);
    const tile = Buffer.alloc(100 * KIB, 7);
    for (let x = 0; x < 4; x++) await cache.write('v1', 12, x, 0, tile);
    await cache.read('v1', 12, 0, 0);

    for (let x = 4; x < 6; x++) await cache.write('v1', 12, x, 0, tile);
    await settle();

    const files = pngsUnder(join(dir, 'v1'));
    const bytes = files.reduce((sum, file) => sum + statSync(file).size, 0);
    expect(bytes).toBeLessThanOrEqual(500 * KIB);
    expect(files.map((file) => file.split('/').slice(-2).join('/')).sort()).toEqual([
      '0/0.png',
      '2/0.png',
      '3/0.png',
      '4/0.png',
      '5/0.png',
    ]);
  });

  it('counts the tiles a previous process left in the folder against the bound', async () => {
    const before = new TileCache(dir, 10_000 * KIB);
    for (let x = 0; x < 5; x++) await before.write('v2', 13, x, 0, Buffer.alloc(100 * KIB, 1));

    const after = new TileCache(dir, 300 * KIB);
    await after.read('v2', 13, 99, 99);
    await settle();
    await after.write('v2', 13, 5, 0, Buffer.alloc(100 * KIB, 1));
    await settle();

    expect(pngsUnder(join(dir, 'v2'))).toHaveLength(3);
  });
});

describe('GET /api/tiles/terrain/:z/:x/:y.png where no terrain is', () => {
  let context: TestContext;
  let dataDir: string;
  let cookie: string;

  beforeAll(async () => {
    dataDir = mkdtempSync(join(tmpdir(), 'descentry-tile-data-'));
    context = createTestContext({ DATA_DIR: dataDir });
    await truncateAll(context.db);
    cookie = await sessionCookies(context.db, context.deps.config)('planner');
  });
  afterAll(async () => {
    await closeTerrainRuntime(context.deps);
    await context.close();
    rmSync(dataDir, { recursive: true, force: true });
  });

  it('answers one shared empty tile for 300 distinct zoom-22 tiles without writing a file (issue 11)', async () => {
    const answers = [];
    for (let i = 0; i < 300; i++) {
      answers.push(
        await request(context.app)
          .get(`/api/tiles/terrain/22/${1_000_000 + i}/${2_000_000 + i}.png`)
          .set('Cookie', cookie),
      );
    }
    await settle();

    expect(answers.every((answer) => answer.status === 200 && answer.headers['content-type'] === 'image/png')).toBe(true);
    expect(new Set(answers.map((answer) => (answer.body as Buffer).toString('base64'))).size).toBe(1);
    expect(pngsUnder(join(dataDir, 'tiles'))).toEqual([]);
  });
});

// Helpers

/** Lets the writes and deletions the cache runs after answering finish. */
async function settle(): Promise<void> {
  await new Promise((resolve) => setTimeout(resolve, 100));
}

function pngsUnder(root: string): string[] {
  let names: string[];
  try {
    names = readdirSync(root, { recursive: true }) as string[];
  } catch {
    // Expected: nothing was ever written, so the folder does not exist.
    return [];
  }
  return names.filter((name) => name.endsWith('.png')).map((name) => join(root, name));
}
