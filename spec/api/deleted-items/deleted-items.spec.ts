import { existsSync, mkdirSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { DELETED_RETENTION_DAYS } from '@shared/domain/deleted-items';
import { auditLog, roadRoutes, terrainModels } from '../../../api/db/schema/index';
import { runMaintenance } from '../../../api/jobs/maintenance';
import { closeTerrainRuntime } from '../../../api/terrain/terrain-runtime';
import { ensureVehiclePresets, presetProfileId } from '../../../api/vehicle-profiles/vehicle-presets-seed';
import { aRouteDraft, eastwardLine } from '../../support/road-route-builders';
import { createTestContext, signedInAgent } from '../../support/test-app';
import { countRows, truncateAll } from '../../support/test-database';

const dataDir = mkdtempSync(join(tmpdir(), 'descentry-deleted-'));
const context = createTestContext({ DATA_DIR: dataDir });
const { app, db } = context;
const DAY_MS = 86_400_000;

beforeEach(async () => {
  await truncateAll(db);
  await ensureVehiclePresets(db);
});
afterAll(async () => {
  await closeTerrainRuntime(context.deps);
  await context.close();
  rmSync(dataDir, { recursive: true, force: true });
});

describe('restorable deletes (issue 11)', () => {
  it("lets one planner delete another's route, keeps it restorable, and records who did what", async () => {
    const { agent: author } = await signedInAgent(app, db, 'planner');
    const { agent: colleague, person: colleagueRow } = await signedInAgent(app, db, 'planner');
    const { agent: admin } = await signedInAgent(app, db, 'admin');
    const route = (await author.post('/api/routes').send(aRouteDraft({ name: 'Mill Road loop' }))).body;
    await author.put(`/api/routes/${route.id}`).send(aRouteDraft({ name: 'Mill Road loop, winter' }));

    const deleted = await colleague.delete(`/api/routes/${route.id}`);
    const whileDeleted = { get: await author.get(`/api/routes/${route.id}`), list: await author.get('/api/routes') };
    const listed = (await colleague.get('/api/deleted-items')).body;
    const restored = await author.post(`/api/routes/${route.id}/restore`);
    const log = (await admin.get(`/api/audit-log?entityId=${route.id}`)).body;

    expect(deleted.status).toBe(204);
    expect(whileDeleted.get.status).toBe(404);
    expect(whileDeleted.list.body.items).toEqual([]);
    expect(listed.retentionDays).toBe(DELETED_RETENTION_DAYS);
    expect(listed.items).toEqual([
      expect.objectContaining({
        kind: 'route',
        id: route.id,
        name: 'Mill Road loop, winter',
        deletedBy: colleagueRow.name,
        blockedBy: null,
      }),
    ]);
    expect(Date.parse(listed.items[0].removedAfter) - Date.parse(listed.items[0].deletedAt)).toBe(DELETED_RETENTION_DAYS * DAY_MS);
    expect(restored.status).toBe(200);
    expect(restored.body).toMatchObject({ id: route.id, name: 'Mill Road loop, winter', version: 2 });
    expect((await author.get('/api/deleted-items')).body.items).toEqual([]);
    expect(log.items.map((event: { action: string }) => event.action)).toEqual(['restore', 'delete', 'update', 'create']);
    expect(log.items[1]).toMatchObject({
      kind: 'route',
      entityName: 'Mill Road loop, winter',
      actor: { id: colleagueRow.id, name: colleagueRow.name },
    });
  });

  it('hides a deleted scenario from lists, the board and network runs, and restores it only once its route is back', async () => {
    const { agent: planner } = await signedInAgent(app, db, 'planner');
    const route = (
      await planner
        .post('/api/routes')
        .send(aRouteDraft({ geometry: eastwardLine({ lengthM: 2_000, dropM: 150 }), stops: [], speedLimits: [] }))
    ).body;
    const scenario = (
      await planner
        .post('/api/scenarios')
        .send({ name: 'Summit', routeId: route.id, vehicleProfileId: presetProfileId('battery-bus-12m'), inService: true })
    ).body;
    const boardBefore = (await planner.get('/api/board/summary')).body;

    await planner.delete(`/api/scenarios/${scenario.id}`);
    await planner.delete(`/api/routes/${route.id}`);
    const listed = (await planner.get('/api/deleted-items')).body.items;
    const boardAfter = (await planner.get('/api/board/summary')).body;
    const { agent: analyst } = await signedInAgent(app, db, 'analyst');
    const run = await analyst.post('/api/batch-runs');
    const refused = await planner.post(`/api/scenarios/${scenario.id}/restore`);
    await planner.post(`/api/routes/${route.id}/restore`);
    const restored = await planner.post(`/api/scenarios/${scenario.id}/restore`);

    expect(JSON.stringify(boardBefore)).toContain('Summit');
    expect(JSON.stringify(boardAfter)).not.toContain('Summit');
    expect((await planner.get(`/api/scenarios/${scenario.id}`)).status).toBe(200);
    expect(listed.find((item: { kind: string }) => item.kind === 'scenario').blockedBy).toMatch(/route is deleted/);
    expect(run.status).toBe(409);
    expect(refused.status).toBe(409);
    expect(refused.body.error.code).toBe('route_deleted');
    expect(restored.status).toBe(200);
    expect(restored.body.summary).not.toBeNull();
  });

  it('refuses to delete a route while a scenario (not deleted) uses it, but not after that scenario is deleted', async () => {
    const { agent: planner } = await signedInAgent(app, db, 'planner');
    const route = (
      await planner
        .post('/api/routes')
        .send(aRouteDraft({ geometry: eastwardLine({ lengthM: 2_000, dropM: 150 }), stops: [], speedLimits: [] }))
    ).body;
    const scenario = (
      await planner
        .post('/api/scenarios')
        .send({ name: 'Uses it', routeId: route.id, vehicleProfileId: presetProfileId('battery-bus-12m') })
    ).body;

    const refused = await planner.delete(`/api/routes/${route.id}`);
    await planner.delete(`/api/scenarios/${scenario.id}`);
    const allowed = await planner.delete(`/api/routes/${route.id}`);

    expect(refused.status).toBe(409);
    expect(allowed.status).toBe(204);
  });

  it('deletes and restores a vehicle profile, recording the change in between', async () => {
    const { agent: analyst } = await signedInAgent(app, db, 'analyst');
    const { agent: admin } = await signedInAgent(app, db, 'admin');
    const preset = (await analyst.get(`/api/vehicles/${presetProfileId('battery-bus-12m')}`)).body;
    const draft = {
      name: 'Valley bus',
      description: '',
      vehicleClass: preset.vehicleClass,
      vehicle: preset.vehicle,
      loadsKg: preset.loadsKg,
      passengerMassKg: preset.passengerMassKg,
      seasons: preset.seasons,
    };
    const profile = (await analyst.post('/api/vehicles').send(draft)).body;
    await analyst.put(`/api/vehicles/${profile.id}`).send({ ...draft, name: 'Valley bus, retrofitted' });

    await analyst.delete(`/api/vehicles/${profile.id}`);
    const hidden = (await analyst.get('/api/vehicles')).body.items.some((item: { id: string }) => item.id === profile.id);
    const restored = await analyst.post(`/api/vehicles/${profile.id}/restore`);
    const again = await analyst.post(`/api/vehicles/${profile.id}/restore`);
    const log = (await admin.get('/api/audit-log?kind=vehicle-profile')).body;

    expect(hidden).toBe(false);
    expect(restored.status).toBe(200);
    expect(restored.body.name).toBe('Valley bus, retrofitted');
    expect(again.status).toBe(404);
    expect(log.items.map((event: { action: string }) => event.action)).toEqual(['restore', 'delete', 'update', 'create']);
  });

  it(`removes for good what was deleted more than ${DELETED_RETENTION_DAYS} days ago, terrain with its files, and says so in the log`, async () => {
    const { agent: planner } = await signedInAgent(app, db, 'planner');
    const { agent: admin } = await signedInAgent(app, db, 'admin');
    const old = (await planner.post('/api/routes').send(aRouteDraft({ name: 'Old line' }))).body;
    const recent = (await planner.post('/api/routes').send(aRouteDraft({ name: 'Recent line' }))).body;
    await planner.delete(`/api/routes/${old.id}`);
    await planner.delete(`/api/routes/${recent.id}`);
    const terrainId = await aDeletedTerrainModel();
    const longAgo = new Date(Date.now() - (DELETED_RETENTION_DAYS + 1) * DAY_MS);
    await db.update(roadRoutes).set({ deletedAt: longAgo }).where(eq(roadRoutes.id, old.id));
    await db.update(terrainModels).set({ deletedAt: longAgo }).where(eq(terrainModels.id, terrainId));

    const report = await runMaintenance(context.deps);
    const log = (await admin.get('/api/audit-log?action=purge')).body;

    expect(report.deletedItemsPurged).toBe(2);
    expect((await db.select().from(roadRoutes)).map((row) => row.id)).toEqual([recent.id]);
    expect(await countRows(db, 'terrain_models')).toBe(0);
    expect(existsSync(join(dataDir, 'terrain', terrainId))).toBe(false);
    expect(
      log.items.map((event: { kind: string; entityName: string; actor: { id: null } }) => [event.kind, event.entityName, event.actor.id]),
    ).toEqual(
      expect.arrayContaining([
        ['route', 'Old line', null],
        ['terrain', 'Old valley model', null],
      ]),
    );
  });

  it('keeps the audit log append-only, even against a direct query', async () => {
    const { agent: planner } = await signedInAgent(app, db, 'planner');
    await planner.post('/api/routes').send(aRouteDraft());

    const update = db.update(auditLog).set({ actorName: 'someone else' });
    const remove = db.delete(auditLog);

    await expect(update).rejects.toThrow();
    await expect(remove).rejects.toThrow();
    expect(await countRows(db, 'audit_log')).toBe(1);
  });

  it('answers 404 when restoring something that is not deleted', async () => {
    const { agent: planner } = await signedInAgent(app, db, 'planner');
    const route = (await planner.post('/api/routes').send(aRouteDraft())).body;

    const response = await planner.post(`/api/routes/${route.id}/restore`);

    expect(response.status).toBe(404);
    expect(await countRows(db, 'road_routes')).toBe(1);
  });
});

// Helpers

/** A terrain model row with a file on disk, deleted (as DELETE /api/terrain leaves it). */
async function aDeletedTerrainModel(): Promise<string> {
  const id = crypto.randomUUID();
  mkdirSync(join(dataDir, 'terrain', id), { recursive: true });
  writeFileSync(join(dataDir, 'terrain', id, 'model.tif'), 'kept until the purge');
  await db.insert(terrainModels).values({
    id,
    name: 'Old valley model',
    status: 'ready',
    originalFileName: 'old.tif',
    storedPath: join('terrain', id, 'model.tif'),
    sha256: id,
    fileSizeBytes: 20,
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
    dataType: 'Float32',
    pixelType: 'area',
    verticalUnit: 'metre',
    deletedAt: new Date(),
    deletedByName: 'Spec analyst',
  });
  return id;
}
