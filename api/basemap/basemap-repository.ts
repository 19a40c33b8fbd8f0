import { and, desc, eq, getTableColumns, inArray, lt, sql } from 'drizzle-orm';
import type { BasemapImport } from '@shared/domain/basemap';
import type { Executor } from '../db/client';
import { basemapImports, users, type BasemapImportRow } from '../db/schema/index';

type NewBasemapImportRow = typeof basemapImports.$inferInsert;
export type BasemapImportWithUploader = BasemapImportRow & { uploaderName: string | null };

export async function insertBasemapImport(db: Executor, row: NewBasemapImportRow): Promise<void> {
  await db.insert(basemapImports).values(row);
}

export async function findBasemapImport(db: Executor, id: string): Promise<BasemapImportRow | undefined> {
  const [row] = await db.select().from(basemapImports).where(eq(basemapImports.id, id));
  return row;
}

/** Newest first. */
export async function listBasemapImports(db: Executor): Promise<BasemapImportWithUploader[]> {
  return db
    .select({ ...getTableColumns(basemapImports), uploaderName: users.name })
    .from(basemapImports)
    .leftJoin(users, eq(users.id, basemapImports.uploadedById))
    .orderBy(desc(basemapImports.createdAt));
}

export async function updateBasemapImport(db: Executor, id: string, values: Partial<NewBasemapImportRow>): Promise<void> {
  await db.update(basemapImports).set(values).where(eq(basemapImports.id, id));
}

/** Moves a queued import to "importing"; returns it, or nothing when another worker has it (or it is done). */
export async function claimBasemapImport(db: Executor, id: string): Promise<BasemapImportRow | undefined> {
  const [row] = await db
    .update(basemapImports)
    .set({ status: 'importing', startedAt: new Date(), failureReason: null, progress: { phase: 'reading', fraction: 0 } })
    .where(and(eq(basemapImports.id, id), eq(basemapImports.status, 'queued')))
    .returning();
  return row;
}

/** Imports left "importing" by a process that stopped (no progress for `staleBefore`) go back to the queue. */
export async function requeueStaleImports(db: Executor, staleBefore: Date): Promise<void> {
  await db
    .update(basemapImports)
    .set({ status: 'queued', progress: null })
    .where(and(eq(basemapImports.status, 'importing'), lt(basemapImports.updatedAt, staleBefore)));
}

export async function listQueuedImports(db: Executor): Promise<BasemapImportRow[]> {
  return db.select().from(basemapImports).where(eq(basemapImports.status, 'queued'));
}

/** Schemas that hold an import's data but no longer serve: ready imports that are not active. */
export async function listRetiredSchemas(db: Executor): Promise<{ id: string; schemaName: string }[]> {
  const rows = await db.execute<{ id: string; schema_name: string }>(sql`
    SELECT b.id, b.schema_name FROM basemap_imports b
    JOIN information_schema.schemata s ON s.schema_name = b.schema_name
    WHERE NOT b.is_active AND b.status IN ('ready', 'failed')`);
  return [...rows].map((row) => ({ id: row.id, schemaName: row.schema_name }));
}

/** Schemas named like an import's that no catalogue row claims (an import whose row is gone). */
export async function listOrphanSchemas(db: Executor): Promise<string[]> {
  const rows = await db.execute<{ schema_name: string }>(sql`
    SELECT s.schema_name FROM information_schema.schemata s
    WHERE s.schema_name ~ '^basemap_[0-9a-f]{32}$'
      AND NOT EXISTS (SELECT 1 FROM basemap_imports b WHERE b.schema_name = s.schema_name)`);
  return [...rows].map((row) => row.schema_name);
}

export async function markImportsInactive(db: Executor, ids: string[]): Promise<void> {
  if (ids.length === 0) return;
  await db.update(basemapImports).set({ isActive: false }).where(inArray(basemapImports.id, ids));
}

export function toBasemapImport(row: BasemapImportWithUploader): BasemapImport {
  const hasBbox = row.bboxWest !== null && row.bboxSouth !== null && row.bboxEast !== null && row.bboxNorth !== null;
  return {
    id: row.id,
    status: row.status,
    active: row.isActive,
    fileName: row.originalFileName,
    fileSizeBytes: row.fileSizeBytes,
    attribution: row.attribution,
    progress: row.status === 'queued' || row.status === 'importing' ? row.progress : null,
    error: row.failureReason,
    bbox: hasBbox ? [row.bboxWest!, row.bboxSouth!, row.bboxEast!, row.bboxNorth!] : null,
    roadCount: row.roadCount,
    placeCount: row.placeCount,
    waterCount: row.waterCount,
    landuseCount: row.landuseCount,
    graphEdgeCount: row.graphEdgeCount,
    uploadedBy: row.uploaderName,
    createdAt: row.createdAt.toISOString(),
    startedAt: row.startedAt?.toISOString() ?? null,
    finishedAt: row.finishedAt?.toISOString() ?? null,
  };
}
