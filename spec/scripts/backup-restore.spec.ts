import { spawnSync } from 'node:child_process';
import { mkdirSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { sql } from 'drizzle-orm';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { createApp } from '../../api/app';
import { createDatabase } from '../../api/db/client';
import { terrainModels } from '../../api/db/schema/index';
import { ensureVehiclePresets, presetProfileId } from '../../api/vehicle-profiles/vehicle-presets-seed';
import { aRouteDraft, eastwardLine } from '../support/road-route-builders';
import { createTestContext, signedInAgent, testConfig } from '../support/test-app';
import { truncateAll } from '../support/test-database';

const work = mkdtempSync(join(tmpdir(), 'descentry-backup-'));
const sourceData = join(work, 'data');
const context = createTestContext({ DATA_DIR: sourceData });
const restoredUrl = process.env['DATABASE_URL']!.replace(/\/[^/]+$/, '/descentry_restore_check');
let routeId = '';
let scenarioId = '';
let terrainId = '';

beforeAll(async () => {
  await truncateAll(context.db);
  await ensureVehiclePresets(context.db);
  const { agent: planner } = await signedInAgent(context.app, context.db, 'planner');
  routeId = (
    await planner
      .post('/api/routes')
      .send(aRouteDraft({ name: 'Backed-up line', geometry: eastwardLine({ lengthM: 2_000, dropM: 150 }), stops: [], speedLimits: [] }))
  ).body.id;
  scenarioId = (
    await planner.post('/api/scenarios').send({ name: 'Backed-up run', routeId, vehicleProfileId: presetProfileId('battery-bus-12m') })
  ).body.id;
  const deleted = (await planner.post('/api/routes').send(aRouteDraft({ name: 'Deleted before the backup' }))).body.id;
  await planner.delete(`/api/routes/${deleted}`);
  terrainId = crypto.randomUUID();
  mkdirSync(join(sourceData, 'terrain', terrainId), { recursive: true });
  writeFileSync(join(sourceData, 'terrain', terrainId, 'model.tif'), 'elevation model bytes');
  mkdirSync(join(sourceData, 'tiles', 'v1', '12'), { recursive: true });
  writeFileSync(join(sourceData, 'tiles', 'v1', '12', 'cached.png'), 'a rebuildable tile');
  await context.db.insert(terrainModels).values(aTerrainRow(terrainId));
  dropRestored();
});

afterAll(async () => {
  await context.close();
  dropRestored();
  rmSync(work, { recursive: true, force: true });
});

describe('npm run backup and npm run restore (issue 11)', () => {
  it('restores a backup into a fresh database and data folder with everything in it', async () => {
    const backup = run('backup.mjs', [join(work, 'backup')], { DATA_DIR: sourceData });
    const restoredData = join(work, 'restored-data');
    const restore = run('restore.mjs', [join(work, 'backup')], { DATABASE_URL: restoredUrl, DATA_DIR: restoredData });

    expect(backup.status, backup.stderr).toBe(0);
    expect(restore.status, restore.stderr).toBe(0);
    expect(restore.stdout).toMatch(/every table as in the backup/);
    const restored = createDatabase(restoredUrl, { max: 1 });
    try {
      const app = createApp({ db: restored.db, config: testConfig({ DATABASE_URL: restoredUrl, DATA_DIR: restoredData }) });
      const { agent } = await signedInAgent(app, restored.db, 'planner');
      const routes = await agent.get('/api/routes');
      const scenario = await agent.get(`/api/scenarios/${scenarioId}/result`);
      const deleted = await agent.get('/api/deleted-items');
      const audit = await restored.db.execute<{ n: number }>(sql`select count(*)::int as n from audit_log`);
      const original = await context.db.execute<{ n: number }>(sql`select count(*)::int as n from audit_log`);

      expect(routes.body.items.map((route: { id: string; name: string }) => [route.id, route.name])).toEqual([[routeId, 'Backed-up line']]);
      expect(scenario.status).toBe(200);
      expect(scenario.body.summary.lengthM).toBeGreaterThan(1_900);
      expect(deleted.body.items.map((item: { name: string }) => item.name)).toEqual(['Deleted before the backup']);
      expect([...audit][0]!.n).toBe([...original][0]!.n);
      expect(readFileSync(join(restoredData, 'terrain', terrainId, 'model.tif'), 'utf8')).toBe('elevation model bytes');
      expect(() => readFileSync(join(restoredData, 'tiles', 'v1', '12', 'cached.png'))).toThrow();
    } finally {
      await restored.close();
    }
  });

  it('refuses to restore over a database that holds tables unless told to replace it', () => {
    const refused = run('restore.mjs', [join(work, 'backup')], { DATABASE_URL: restoredUrl, DATA_DIR: join(work, 'other-data') });

    expect(refused.status).toBe(1);
    expect(refused.stderr).toMatch(/already holds \d+ tables; add --replace/);
  });

  it('refuses a backup whose files do not match its manifest, changing nothing', () => {
    const damaged = join(work, 'damaged');
    expect(run('backup.mjs', [damaged], { DATA_DIR: sourceData }).status).toBe(0);
    writeFileSync(join(damaged, 'data.tar.gz'), 'not what was backed up');

    const refused = run('restore.mjs', [damaged, '--replace'], { DATABASE_URL: restoredUrl, DATA_DIR: join(work, 'restored-data') });

    expect(refused.status).toBe(1);
    expect(refused.stderr).toMatch(/data\.tar\.gz does not match the manifest/);
    expect(readFileSync(join(work, 'restored-data', 'terrain', terrainId, 'model.tif'), 'utf8')).toBe('elevation model bytes');
  });
});

// Helpers

function run(script: string, args: string[], env: Record<string, string>) {
  return spawnSync(process.execPath, [join('scripts', script), ...args], {
    encoding: 'utf8',
    env: { ...process.env, DATABASE_URL: process.env['DATABASE_URL'], ...env },
  });
}

function dropRestored(): void {
  const url = new URL(restoredUrl);
  spawnSync(
    'psql',
    [
      '-h',
      url.hostname,
      '-p',
      url.port,
      '-U',
      url.username,
      '-d',
      'postgres',
      '-c',
      'drop database if exists descentry_restore_check with (force)',
    ],
    {
      env: { ...process.env, PGPASSWORD: decodeURIComponent(url.password) },
    },
  );
}

function aTerrainRow(id: string) {
  return {
    id,
    name: 'Backed-up valley model',
    status: 'ready' as const,
    originalFileName: 'valley.tif',
    storedPath: join('terrain', id, 'model.tif'),
    sha256: id,
    fileSizeBytes: 21,
    crs: 'EPSG:32632',
    proj4Definition: '+proj=utm +zone=32 +datum=WGS84 +units=m +no_defs',
    widthPx: 10,
    heightPx: 10,
    blockWidthPx: 10,
    blockHeightPx: 10,
    originX: 640_000,
    originY: 5_160_000,
    pixelSizeX: 20,
    pixelSizeY: -20,
    resolutionM: 20,
    dataType: 'Float32' as const,
    pixelType: 'area' as const,
    verticalUnit: 'metre',
  };
}
