import { can } from '@shared/domain/permissions';
import { randomUUID } from 'node:crypto';
import { access, mkdir, rename, unlink } from 'node:fs/promises';
import type { User } from '@shared/domain/auth';
import type { TerrainModel, TerrainUploadAccepted } from '@shared/domain/terrain';
import type { AppDeps } from '../app-deps';
import { requestRoadGraphRegrade } from '../road-graph/road-graph-jobs';
import { ConflictError, ForbiddenError, HttpError, NotFoundError } from '../http/http-error';
import { type Actor, recordAudit } from '../audit/audit-log';
import { isUniqueViolation } from '../db/errors';
import { runtimeOf } from '../app-runtime';
import { type JobPolicy, type JobQueue } from '../jobs/job-queue';
import { inspectGeoTiff } from './ingestion/geotiff-inspection';
import { INGEST_STALE_MS, ingestTerrainModel, TERRAIN_INGEST_JOB, type TerrainIngestJob } from './ingestion/terrain-ingestion';
import {
  countScenariosUsingTerrain,
  deleteTerrainRow,
  markTerrainDeleted,
  markTerrainRestored,
  findTerrainBySha256,
  findTerrainModel,
  insertTerrainModel,
  listProcessingTerrain,
  replaceIngestJob,
  listStoredPaths,
  listTerrainModels,
  toTerrainModel,
  updateTerrainModel,
} from './terrain-repository';
import { terrainRuntimeFor } from './terrain-runtime';
import type { HashedUpload } from './terrain-storage';

export interface TerrainUpload {
  file: HashedUpload;
  originalFileName: string;
  name: string;
}

/**
 * Accepts an uploaded file already on disk: checks it, refuses duplicates, moves it into place,
 * registers it as "processing" and queues ingestion. Whatever is refused leaves no file and no row.
 */
export async function acceptTerrainUpload(deps: AppDeps, user: User, upload: TerrainUpload): Promise<TerrainUploadAccepted> {
  const runtime = terrainRuntimeFor(deps);
  const { file } = upload;
  let movedTo: string | null = null;
  const id = randomUUID();
  try {
    const header = await inspectGeoTiff(file.path, {
      maxPixels: deps.config.TERRAIN_MAX_PIXELS,
      maxBlockBytes: deps.config.TERRAIN_MAX_BLOCK_BYTES,
    });
    const existing = await findTerrainBySha256(deps.db, file.sha256);
    if (existing) throw duplicateError(existing);

    const notes: string[] = [];
    if (header.bandCount > 1) notes.push(`The file has ${header.bandCount} bands; band 1 is used as elevation.`);
    if (header.pixelType === 'point') notes.push('Pixel-is-point file: pixel centres are placed where the file says.');
    if (header.verticalScaleToM !== 1) notes.push(`Elevations are stored in ${header.verticalUnit} and converted to metres.`);
    if (header.hasOwnOverviews) notes.push('The file carries its own overviews; map tiles use the pyramid built at ingestion.');

    await runtime.storage.ensureFolders();
    await mkdir(runtime.storage.modelDir(id), { recursive: true });
    movedTo = runtime.storage.absolute(runtime.storage.relativeModelPath(id));
    await rename(file.path, movedTo);
    await insertTerrainModel(deps.db, {
      id,
      name: upload.name,
      status: 'processing',
      originalFileName: upload.originalFileName,
      storedPath: runtime.storage.relativeModelPath(id),
      sha256: file.sha256,
      fileSizeBytes: file.size,
      crs: header.crs.crs,
      crsName: header.crs.name,
      proj4Definition: header.crs.proj4Definition,
      widthPx: header.widthPx,
      heightPx: header.heightPx,
      blockWidthPx: header.blockWidthPx,
      blockHeightPx: header.blockHeightPx,
      originX: header.originX,
      originY: header.originY,
      pixelSizeX: header.pixelSizeX,
      pixelSizeY: header.pixelSizeY,
      resolutionM: header.resolutionM,
      dataType: header.dataType,
      nodata: header.nodata,
      pixelType: header.pixelType,
      verticalUnit: header.verticalUnit,
      verticalScaleToM: header.verticalScaleToM,
      qualityNotes: notes,
      footprint: header.footprint,
      uploadedById: user.id,
    });
    await recordAudit(deps.db, actorOf(user), {
      action: 'create',
      kind: 'terrain',
      entityId: id,
      entityName: upload.name,
      details: { file: upload.originalFileName, bytes: file.size },
    });
  } catch (error) {
    // Expected failures: a refused file (HttpError) or a lost race on the same SHA-256. Either
    // way nothing may stay behind.
    await unlink(file.path).catch(() => undefined);
    if (movedTo) await runtime.storage.removeModelFiles(id);
    if (isUniqueViolation(error)) {
      const existing = await findTerrainBySha256(deps.db, file.sha256);
      if (existing) throw duplicateError(existing);
    }
    throw error;
  }
  const jobs = await terrainJobs(deps);
  await replaceIngestJob(
    deps.db,
    id,
    null,
    await jobs.send(TERRAIN_INGEST_JOB, { terrainId: id } satisfies TerrainIngestJob, TERRAIN_INGEST_POLICY),
  );
  return { id, status: 'processing' };
}

export async function getTerrainModel(deps: AppDeps, id: string): Promise<TerrainModel> {
  const row = await findTerrainModel(deps.db, id);
  if (!row) throw new NotFoundError('The terrain model');
  return toTerrainModel(row);
}

export async function listTerrain(deps: AppDeps): Promise<{ items: TerrainModel[]; tilesVersion: string }> {
  const [rows, catalogue] = await Promise.all([listTerrainModels(deps.db), terrainRuntimeFor(deps).readyCatalogue()]);
  return { items: rows.map(toTerrainModel), tilesVersion: catalogue.version };
}

/**
 * Deletes a model, restorably: it leaves the catalogue, the map and sampling at once; its files
 * stay until the maintenance sweep removes it for good after the retention period. Refused with
 * 409 while saved scenarios depend on it, unless an admin forces it (their scenarios then lose
 * their terrain and must be re-run on another).
 */
export async function deleteTerrain(deps: AppDeps, user: User, id: string, force: boolean): Promise<void> {
  const runtime = terrainRuntimeFor(deps);
  const row = await findTerrainModel(deps.db, id);
  if (!row) throw new NotFoundError('The terrain model');
  if (force && !can(user.role, 'terrain.force-delete'))
    throw new ForbiddenError('Only an administrator may force the deletion of terrain in use');
  const scenarios = await countScenariosUsingTerrain(deps.db, id);
  if (scenarios > 0 && !force) {
    throw new ConflictError(
      `“${row.name}” is used by ${scenarios} saved scenario${scenarios === 1 ? '' : 's'}; delete or re-run them first (an administrator may force the deletion)`,
      'terrain_in_use',
      { scenarioCount: scenarios },
    );
  }
  await deps.db.transaction(async (tx) => {
    await markTerrainDeleted(tx, id, actorOf(user));
    await recordAudit(tx, actorOf(user), {
      action: 'delete',
      kind: 'terrain',
      entityId: id,
      entityName: row.name,
      details: scenarios > 0 ? { forced: true, scenariosUsingIt: scenarios } : {},
    });
  });
  runtime.invalidateCatalogue();
  await requestRoadGraphRegrade(deps);
  // Expected failure: no decoder thread holds the file; nothing to forget.
  await runtime.blocks.forget(runtime.sourceFromRow(row)).catch(() => undefined);
}

/** Brings a deleted model back into the catalogue (its files were kept). */
export async function restoreTerrain(deps: AppDeps, user: User, id: string): Promise<TerrainModel> {
  const row = await findTerrainModel(deps.db, id, true);
  if (!row?.deletedAt) throw new NotFoundError('A deleted terrain model with that id');
  await deps.db.transaction(async (tx) => {
    await markTerrainRestored(tx, id);
    await recordAudit(tx, actorOf(user), { action: 'restore', kind: 'terrain', entityId: id, entityName: row.name });
  });
  terrainRuntimeFor(deps).invalidateCatalogue();
  await requestRoadGraphRegrade(deps);
  return getTerrainModel(deps, id);
}

/** Removes a deleted model for good: its files, then its row (the purge). */
export async function purgeTerrain(deps: AppDeps, id: string): Promise<void> {
  const runtime = terrainRuntimeFor(deps);
  await runtime.storage.removeModelFiles(id);
  await deleteTerrainRow(deps.db, id);
}

function actorOf(user: User): Actor {
  return { id: user.id, name: user.name };
}

/**
 * Start-up recovery, so a crash or kill leaves nothing half-done: half-received uploads and
 * folders without a catalogue row are removed; models whose ingestion stopped are queued again
 * (or failed when their file is gone), as the maintenance sweep then does every minute.
 */
export async function recoverTerrain(deps: AppDeps): Promise<{ removed: string[]; requeued: string[]; failed: string[] }> {
  const runtime = terrainRuntimeFor(deps);
  const stored = await listStoredPaths(deps.db);
  const removed = await runtime.storage.sweep(new Set(stored.map((row) => row.id)));
  return { removed, ...(await requeueStaleIngestion(deps)) };
}

/**
 * Models still "processing" whose ingestion is not alive: no heartbeat for INGEST_STALE_MS while
 * its job is active (the worker died; the job is cancelled so it does not linger as active), or
 * a job the queue no longer holds as waiting or active. Each is queued again with a new job, or
 * failed when its file is gone.
 */
export async function requeueStaleIngestion(deps: AppDeps, now = new Date()): Promise<{ requeued: string[]; failed: string[] }> {
  const runtime = terrainRuntimeFor(deps);
  const jobs = await terrainJobs(deps);
  const staleBefore = now.getTime() - INGEST_STALE_MS;
  const requeued: string[] = [];
  const failed: string[] = [];
  for (const model of await listProcessingTerrain(deps.db)) {
    if (model.ingestHeartbeatAt && model.ingestHeartbeatAt.getTime() >= staleBefore) continue;
    const job = model.ingestJobId ? await jobs.jobState(TERRAIN_INGEST_JOB, model.ingestJobId) : null;
    if (job && (job.state === 'created' || job.state === 'retry')) continue;
    // Just handed to a worker that has not stamped its first heartbeat yet.
    if (job?.state === 'active' && !model.ingestHeartbeatAt && (job.startedOn?.getTime() ?? 0) >= staleBefore) continue;
    const row = await findTerrainModel(deps.db, model.id);
    const exists = row
      ? await access(runtime.storage.absolute(row.storedPath)).then(
          () => true,
          () => false,
        )
      : false;
    if (!exists) {
      await updateTerrainModel(deps.db, model.id, {
        status: 'failed',
        failureReason: 'The uploaded file was lost before ingestion finished; upload it again',
      });
      failed.push(model.id);
      continue;
    }
    const placeholder = `requeueing:${randomUUID()}`;
    if (!(await replaceIngestJob(deps.db, model.id, model.ingestJobId, placeholder))) continue;
    if (model.ingestJobId && job?.state === 'active') await jobs.cancel(TERRAIN_INGEST_JOB, model.ingestJobId);
    const jobId = await jobs.send(TERRAIN_INGEST_JOB, { terrainId: model.id } satisfies TerrainIngestJob, TERRAIN_INGEST_POLICY);
    await replaceIngestJob(deps.db, model.id, placeholder, jobId);
    requeued.push(model.id);
  }
  runtime.invalidateCatalogue();
  return { requeued, failed };
}

/**
 * One retry for a file that failed to read; an hour before pg-boss itself gives up on a lost
 * 2 GB ingestion. A worker that dies is found much sooner by its heartbeat.
 */
export const TERRAIN_INGEST_POLICY: JobPolicy = { retryLimit: 1, expireInSeconds: 60 * 60 };

/** Registers the ingestion worker on a queue (api/main.ts does this when RUN_WORKERS). */
export async function registerTerrainWorkers(deps: AppDeps, queue: JobQueue): Promise<void> {
  await queue.registerWorker<TerrainIngestJob>(
    TERRAIN_INGEST_JOB,
    (job, jobId) => ingestTerrainModel(deps, job.terrainId, jobId),
    TERRAIN_INGEST_POLICY,
  );
}

/** The app's job queue, or (tests, CLI tools) an in-process queue with the terrain worker on it. */
function terrainJobs(deps: AppDeps): Promise<JobQueue> {
  return runtimeOf(deps).jobsFor('terrain', (queue) => registerTerrainWorkers(deps, queue));
}

/** Resolves when in-process ingestion jobs have finished (tests and the demo seed). */
export async function waitForInlineTerrainJobs(deps: AppDeps): Promise<void> {
  await runtimeOf(deps).inlineJobsIdle('terrain');
}

function duplicateError(existing: { id: string; name: string; deletedAt: Date | null }): HttpError {
  if (existing.deletedAt) {
    return new ConflictError(
      `This file was deleted from the catalogue as “${existing.name}”; restore it under Recently deleted instead of uploading it again`,
      'duplicate_terrain',
      { existingId: existing.id, existingName: existing.name, deleted: true },
    );
  }
  return new ConflictError(`This file is already in the catalogue as “${existing.name}”`, 'duplicate_terrain', {
    existingId: existing.id,
    existingName: existing.name,
  });
}
