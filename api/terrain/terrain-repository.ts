import { and, asc, eq, getTableColumns, isNull, lt, or, sql } from 'drizzle-orm';
import type { Polygon, TerrainModel } from '@shared/domain/terrain';
import type { Executor } from '../db/client';
import { lookupEpsg } from './raster/crs-registry';
import { scenarios, terrainDependents, terrainModels, users, type TerrainModelRow } from '../db/schema/index';

type NewTerrainRow = typeof terrainModels.$inferInsert;

/** A row with its footprint as GeoJSON text and the uploader's name. */
export type TerrainRowWithExtras = Omit<TerrainModelRow, 'footprint'> & {
  footprintGeoJson: string | null;
  uploaderName: string | null;
};

// The geometry column is read as GeoJSON text instead of its raw EWKB.
const { footprint: _footprint, ...columnsWithoutFootprint } = getTableColumns(terrainModels);

const selection = {
  ...columnsWithoutFootprint,
  footprintGeoJson: sql<string | null>`ST_AsGeoJSON(${terrainModels.footprint}, 9)`,
  uploaderName: users.name,
};

export async function insertTerrainModel(db: Executor, row: NewTerrainRow): Promise<void> {
  await db.insert(terrainModels).values(row);
}

/** The model unless it is deleted (or, with `includeDeleted`, either way). */
export async function findTerrainModel(db: Executor, id: string, includeDeleted = false): Promise<TerrainRowWithExtras | undefined> {
  const [row] = await db
    .select(selection)
    .from(terrainModels)
    .leftJoin(users, eq(users.id, terrainModels.uploadedById))
    .where(and(eq(terrainModels.id, id), includeDeleted ? undefined : isNull(terrainModels.deletedAt)));
  return row;
}

export async function listTerrainModels(db: Executor): Promise<TerrainRowWithExtras[]> {
  return db
    .select(selection)
    .from(terrainModels)
    .leftJoin(users, eq(users.id, terrainModels.uploadedById))
    .where(isNull(terrainModels.deletedAt))
    .orderBy(asc(terrainModels.name), asc(terrainModels.createdAt));
}

export async function listReadyTerrainRows(db: Executor): Promise<TerrainRowWithExtras[]> {
  return db
    .select(selection)
    .from(terrainModels)
    .leftJoin(users, eq(users.id, terrainModels.uploadedById))
    .where(and(eq(terrainModels.status, 'ready'), isNull(terrainModels.deletedAt)))
    .orderBy(asc(terrainModels.resolutionM), asc(terrainModels.createdAt));
}

/** The model holding a file, deleted or not (the same file may be in the catalogue only once). */
export async function findTerrainBySha256(
  db: Executor,
  sha256: string,
): Promise<{ id: string; name: string; deletedAt: Date | null } | undefined> {
  const [row] = await db
    .select({ id: terrainModels.id, name: terrainModels.name, deletedAt: terrainModels.deletedAt })
    .from(terrainModels)
    .where(eq(terrainModels.sha256, sha256));
  return row;
}

/** Models still being ingested, with their job and heartbeat. */
export async function listProcessingTerrain(db: Executor) {
  return db
    .select({ id: terrainModels.id, ingestJobId: terrainModels.ingestJobId, ingestHeartbeatAt: terrainModels.ingestHeartbeatAt })
    .from(terrainModels)
    .where(and(eq(terrainModels.status, 'processing'), isNull(terrainModels.deletedAt)));
}

/**
 * Takes a model's ingestion for `jobId`: true unless another job's ingestion of it is alive
 * (heartbeat after `staleBefore`) or the model is no longer processing.
 */
export async function claimIngestion(db: Executor, id: string, jobId: string, staleBefore: Date): Promise<boolean> {
  const claimed = await db
    .update(terrainModels)
    .set({ ingestJobId: jobId, ingestHeartbeatAt: new Date() })
    .where(
      and(
        eq(terrainModels.id, id),
        eq(terrainModels.status, 'processing'),
        or(isNull(terrainModels.ingestHeartbeatAt), lt(terrainModels.ingestHeartbeatAt, staleBefore), eq(terrainModels.ingestJobId, jobId)),
      ),
    )
    .returning({ id: terrainModels.id });
  return claimed.length === 1;
}

export async function beatIngestion(db: Executor, id: string, jobId: string): Promise<void> {
  await db
    .update(terrainModels)
    .set({ ingestHeartbeatAt: new Date() })
    .where(and(eq(terrainModels.id, id), eq(terrainModels.ingestJobId, jobId), eq(terrainModels.status, 'processing')));
}

/** Swaps the model's ingestion job only if it is still `expected` (one sweeper re-queues it). */
export async function replaceIngestJob(db: Executor, id: string, expected: string | null, jobId: string): Promise<boolean> {
  const replaced = await db
    .update(terrainModels)
    .set({ ingestJobId: jobId, ingestHeartbeatAt: null })
    .where(and(eq(terrainModels.id, id), expected === null ? isNull(terrainModels.ingestJobId) : eq(terrainModels.ingestJobId, expected)))
    .returning({ id: terrainModels.id });
  return replaced.length === 1;
}

export async function listStoredPaths(db: Executor): Promise<Array<{ id: string; storedPath: string }>> {
  return db.select({ id: terrainModels.id, storedPath: terrainModels.storedPath }).from(terrainModels);
}

export async function updateTerrainModel(db: Executor, id: string, values: Partial<NewTerrainRow>): Promise<void> {
  await db.update(terrainModels).set(values).where(eq(terrainModels.id, id));
}

/** Hides the model (restorable until the purge; its files stay). */
export async function markTerrainDeleted(db: Executor, id: string, by: { id: string | null; name: string }) {
  await db.update(terrainModels).set({ deletedAt: new Date(), deletedById: by.id, deletedByName: by.name }).where(eq(terrainModels.id, id));
}

export async function markTerrainRestored(db: Executor, id: string) {
  await db.update(terrainModels).set({ deletedAt: null, deletedById: null, deletedByName: null }).where(eq(terrainModels.id, id));
}

/** Removes the row for good (the purge, after its files). */
export async function deleteTerrainRow(db: Executor, id: string): Promise<boolean> {
  const deleted = await db.delete(terrainModels).where(eq(terrainModels.id, id)).returning({ id: terrainModels.id });
  return deleted.length > 0;
}

/**
 * How many saved scenarios use the terrain model. The scenarios feature registers each scenario
 * that was computed on a model in `terrain_dependents` (kind "scenario"); until then this is 0.
 */
export async function countScenariosUsingTerrain(db: Executor, terrainId: string): Promise<number> {
  const [row] = await db
    .select({ count: sql<number>`count(*)::int` })
    .from(terrainDependents)
    .where(
      and(
        eq(terrainDependents.terrainId, terrainId),
        eq(terrainDependents.kind, 'scenario'),
        // A deleted scenario (restorable, not yet purged) no longer holds the terrain back.
        sql`not exists (select 1 from ${scenarios} s where s.id = ${terrainDependents.dependentId} and s.deleted_at is not null)`,
      ),
    );
  return row?.count ?? 0;
}

/** Records that something (e.g. a saved scenario) depends on a terrain model. Idempotent. */
export async function addTerrainDependent(db: Executor, terrainId: string, kind: string, dependentId: string): Promise<void> {
  await db.insert(terrainDependents).values({ terrainId, kind, dependentId }).onConflictDoNothing();
}

export async function removeTerrainDependent(db: Executor, terrainId: string, kind: string, dependentId: string): Promise<void> {
  await db
    .delete(terrainDependents)
    .where(
      and(eq(terrainDependents.terrainId, terrainId), eq(terrainDependents.kind, kind), eq(terrainDependents.dependentId, dependentId)),
    );
}

/** The unit of a CRS's grid axes, from its EPSG definition. */
function pixelUnitOf(crs: string): TerrainModel['pixelSize']['unit'] {
  const definition = lookupEpsg(Number(crs.replace(/^EPSG:/, '')));
  if (!definition) return 'metre';
  if (definition.isGeographic) return 'degree';
  if (/\+units=us-ft\b/.test(definition.proj4Definition)) return 'US survey foot';
  if (/\+units=ft\b/.test(definition.proj4Definition)) return 'foot';
  return 'metre';
}

/** The catalogue entry the API answers with. */
export function toTerrainModel(row: TerrainRowWithExtras): TerrainModel {
  return {
    id: row.id,
    name: row.name,
    status: row.status,
    failureReason: row.failureReason,
    crs: row.crs,
    crsName: row.crsName,
    widthPx: row.widthPx,
    heightPx: row.heightPx,
    resolutionM: row.resolutionM,
    pixelSize: { x: Math.abs(row.pixelSizeX), y: Math.abs(row.pixelSizeY), unit: pixelUnitOf(row.crs) },
    nodata: row.nodata,
    dataType: row.dataType,
    pixelType: row.pixelType,
    verticalUnit: row.verticalUnit,
    fileSizeBytes: row.fileSizeBytes,
    sha256: row.sha256,
    minElevationM: row.minElevationM,
    maxElevationM: row.maxElevationM,
    nodataShare: row.nodataShare,
    spikeCount: row.spikeCount,
    qualityNotes: row.qualityNotes,
    footprint: row.footprintGeoJson ? (JSON.parse(row.footprintGeoJson) as Polygon) : null,
    uploadedBy: row.uploadedById && row.uploaderName ? { id: row.uploadedById, name: row.uploaderName } : null,
    createdAt: row.createdAt.toISOString(),
    readyAt: row.readyAt ? row.readyAt.toISOString() : null,
  };
}

/**
 * Records which ready terrain models a scenario's result was computed on: those whose footprint
 * meets the route version's line, when the elevations came from terrain rather than from the
 * route's own coordinates. Replaces what the scenario's previous run recorded.
 */
export async function replaceScenarioTerrainUse(db: Executor, scenarioId: string, routeVersionId: string | null): Promise<void> {
  await db.delete(terrainDependents).where(and(eq(terrainDependents.kind, 'scenario'), eq(terrainDependents.dependentId, scenarioId)));
  if (!routeVersionId) return;
  await db.execute(sql`
    insert into terrain_dependents (terrain_id, kind, dependent_id)
    select t.id, 'scenario', ${scenarioId}::uuid
    from terrain_models t join road_route_versions v on v.id = ${routeVersionId}::uuid
    where t.status = 'ready' and t.deleted_at is null and ST_Intersects(t.footprint, v.geometry)
    on conflict do nothing`);
}
