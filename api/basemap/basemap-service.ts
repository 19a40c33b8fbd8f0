import { randomUUID } from 'node:crypto';
import { rename, unlink } from 'node:fs/promises';
import type { User } from '@shared/domain/auth';
import { DEFAULT_BASEMAP_ATTRIBUTION, type BasemapList, type BasemapUploadAccepted } from '@shared/domain/basemap';
import type { AppDeps } from '../app-deps';
import { HttpError } from '../http/http-error';
import { runtimeOf } from '../app-runtime';
import { type JobPolicy, type JobQueue } from '../jobs/job-queue';
import { BASEMAP_IMPORT_JOB, retireOldImports, runBasemapImport, type BasemapImportJob } from './basemap-import';
import {
  insertBasemapImport,
  listBasemapImports,
  listOrphanSchemas,
  listQueuedImports,
  requeueStaleImports,
  toBasemapImport,
  updateBasemapImport,
} from './basemap-repository';
import { detectOsmFormat } from './osm-file';
import { schemaIdentifier } from '../road-graph/road-graph-build';
import { sql } from 'drizzle-orm';

export interface BasemapUpload {
  path: string;
  size: number;
  originalFileName: string;
  attribution?: string;
}

/**
 * Accepts an uploaded extract already on disk: checks from its first bytes that it is an
 * OpenStreetMap file (PBF, or XML plain, bzip2 or gzip), moves it into place, registers it as
 * "queued" and queues its import. A refused file leaves nothing behind.
 */
export async function acceptBasemapUpload(deps: AppDeps, user: User, upload: BasemapUpload): Promise<BasemapUploadAccepted> {
  const storage = runtimeOf(deps).basemapStorage;
  const format = await detectOsmFormat(upload.path).catch(() => null);
  if (!format) {
    await unlink(upload.path).catch(() => undefined);
    throw new HttpError(
      415,
      'not_osm',
      `“${upload.originalFileName}” is not an OpenStreetMap extract: upload an .osm.pbf file or OSM XML (.osm, optionally .osm.bz2 or .osm.gz)`,
      { field: 'file' },
    );
  }
  const id = randomUUID();
  const storedPath = storage.relativeExtractPath(id);
  try {
    await storage.ensureFolders();
    await rename(upload.path, storage.absolute(storedPath));
    await insertBasemapImport(deps.db, {
      id,
      status: 'queued',
      originalFileName: upload.originalFileName,
      storedPath,
      fileSizeBytes: upload.size,
      fileFormat: format,
      attribution: upload.attribution ?? DEFAULT_BASEMAP_ATTRIBUTION,
      schemaName: `basemap_${id.replaceAll('-', '')}`,
      uploadedById: user.id,
    });
  } catch (error) {
    // Expected only when the disk or the database fails mid-way: nothing may stay behind.
    await unlink(upload.path).catch(() => undefined);
    await unlink(storage.absolute(storedPath)).catch(() => undefined);
    throw error;
  }
  await (await basemapJobs(deps)).send(BASEMAP_IMPORT_JOB, { importId: id } satisfies BasemapImportJob, BASEMAP_IMPORT_POLICY);
  return { id, status: 'queued' };
}

export async function listBasemaps(deps: AppDeps): Promise<BasemapList> {
  const [rows, active] = await Promise.all([listBasemapImports(deps.db), runtimeOf(deps).activeBasemap.current()]);
  return { items: rows.map(toBasemapImport), tilesVersion: active?.version ?? null, attribution: active?.attribution ?? null };
}

/** An import that has shown no progress for this long was left by a process that stopped. */
const STALE_IMPORT_MS = 10 * 60 * 1000;

/**
 * Start-up recovery: imports left half-done by a stopped process are queued again, data of
 * imports that no longer serve is dropped, uploads no import waits for are removed.
 */
export async function recoverBasemaps(deps: AppDeps): Promise<{ requeued: number }> {
  await requeueStaleImports(deps.db, new Date(Date.now() - STALE_IMPORT_MS));
  const queued = await listQueuedImports(deps.db);
  await runtimeOf(deps).basemapStorage.sweep(new Set(queued.map((row) => row.id)));
  await retireOldImports(deps);
  for (const schemaName of await listOrphanSchemas(deps.db)) {
    await deps.db.execute(sql`DROP SCHEMA IF EXISTS ${schemaIdentifier(schemaName)} CASCADE`);
  }
  const jobs = await basemapJobs(deps);
  for (const row of queued) {
    if (!row.storedPath) {
      await updateBasemapImport(deps.db, row.id, {
        status: 'failed',
        failureReason: 'The uploaded file was lost before the import started; upload it again',
      });
      continue;
    }
    await jobs.send(BASEMAP_IMPORT_JOB, { importId: row.id } satisfies BasemapImportJob, BASEMAP_IMPORT_POLICY);
  }
  return { requeued: queued.length };
}

/** Registers the import worker on a queue (api/main.ts and api/worker.ts, when RUN_WORKERS). */
export async function registerBasemapWorkers(deps: AppDeps, queue: JobQueue): Promise<void> {
  await queue.registerWorker<BasemapImportJob>(BASEMAP_IMPORT_JOB, (job) => runBasemapImport(deps, job.importId), BASEMAP_IMPORT_POLICY);
}

/** A country-sized extract takes a long while; a lost job is handed out again after 3 hours. */
export const BASEMAP_IMPORT_POLICY: JobPolicy = { expireInSeconds: 3 * 60 * 60, retryLimit: 0 };

/** The app's job queue, or (tests, the demo seed) an in-process queue with the import worker on it. */
function basemapJobs(deps: AppDeps): Promise<JobQueue> {
  return runtimeOf(deps).jobsFor('basemap', (queue) => registerBasemapWorkers(deps, queue));
}

/** Resolves when in-process imports have finished (tests and the demo seed). */
export async function waitForInlineBasemapJobs(deps: AppDeps): Promise<void> {
  await runtimeOf(deps).inlineJobsIdle('basemap');
}
