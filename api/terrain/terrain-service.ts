import { randomUUID } from 'node:crypto';
import { access, mkdir, rename, unlink } from 'node:fs/promises';
import type { User } from '@shared/domain/auth';
import type { TerrainModel, TerrainUploadAccepted } from '@shared/domain/terrain';
import type { AppDeps } from '../app-deps';
import { requestRoadGraphRegrade } from '../road-graph/road-graph-jobs';
import { ConflictError, ForbiddenError, HttpError, NotFoundError } from '../http/http-error';
import { createInlineJobQueue, jobQueueOf, type JobQueue } from '../jobs/job-queue';
import { inspectGeoTiff } from './geotiff-inspection';
import { ingestTerrainModel, TERRAIN_INGEST_JOB, type TerrainIngestJob } from './terrain-ingestion';
import {
  countScenariosUsingTerrain,
  deleteTerrainRow,
  findTerrainBySha256,
  findTerrainModel,
  insertTerrainModel,
  listProcessingTerrainIds,
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
  await (await terrainJobs(deps)).send(TERRAIN_INGEST_JOB, { terrainId: id } satisfies TerrainIngestJob);
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
 * Deletes a model and its files. Refused with 409 while saved scenarios depend on it, unless an
 * admin forces it (their scenarios then lose their terrain and must be re-run on another).
 */
export async function deleteTerrain(deps: AppDeps, user: User, id: string, force: boolean): Promise<void> {
  const runtime = terrainRuntimeFor(deps);
  const row = await findTerrainModel(deps.db, id);
  if (!row) throw new NotFoundError('The terrain model');
  if (force && user.role !== 'admin') throw new ForbiddenError('Only an administrator may force the deletion of terrain in use');
  const scenarios = await countScenariosUsingTerrain(deps.db, id);
  if (scenarios > 0 && !force) {
    throw new ConflictError(
      `“${row.name}” is used by ${scenarios} saved scenario${scenarios === 1 ? '' : 's'}; delete or re-run them first (an administrator may force the deletion)`,
      'terrain_in_use',
      { scenarioCount: scenarios },
    );
  }
  await deleteTerrainRow(deps.db, id);
  runtime.invalidateCatalogue();
  await requestRoadGraphRegrade(deps);
  const source = runtime.sourceFromRow(row);
  await runtime.blocks.forget(source).catch(() => undefined);
  await runtime.storage.removeModelFiles(id);
}

/**
 * Start-up recovery, so a crash or kill leaves nothing half-done: half-received uploads and
 * folders without a catalogue row are removed; models still "processing" are queued again (or
 * failed when their file is gone).
 */
export async function recoverTerrain(deps: AppDeps): Promise<{ removed: string[]; requeued: string[]; failed: string[] }> {
  const runtime = terrainRuntimeFor(deps);
  const stored = await listStoredPaths(deps.db);
  const removed = await runtime.storage.sweep(new Set(stored.map((row) => row.id)));
  const requeued: string[] = [];
  const failed: string[] = [];
  const jobs = await terrainJobs(deps);
  for (const id of await listProcessingTerrainIds(deps.db)) {
    const path = stored.find((row) => row.id === id)?.storedPath;
    const exists = path ? await access(runtime.storage.absolute(path)).then(() => true, () => false) : false;
    if (!exists) {
      await updateTerrainModel(deps.db, id, { status: 'failed', failureReason: 'The uploaded file was lost before ingestion finished; upload it again' });
      failed.push(id);
      continue;
    }
    await jobs.send(TERRAIN_INGEST_JOB, { terrainId: id } satisfies TerrainIngestJob);
    requeued.push(id);
  }
  runtime.invalidateCatalogue();
  return { removed, requeued, failed };
}

/** Registers the ingestion worker on a queue (api/main.ts does this when RUN_WORKERS). */
export async function registerTerrainWorkers(deps: AppDeps, queue: JobQueue): Promise<void> {
  await queue.registerWorker<TerrainIngestJob>(TERRAIN_INGEST_JOB, (job) => ingestTerrainModel(deps, job.terrainId), {
    // A 2 GB model takes minutes; an hour before a lost job is handed out again.
    expireInSeconds: 60 * 60,
    retryLimit: 1,
  });
}

const inlineQueues = new WeakMap<object, ReturnType<typeof createInlineJobQueue>>();

/** The app's job queue, or (tests, CLI tools) an in-process queue with the terrain worker on it. */
async function terrainJobs(deps: AppDeps): Promise<JobQueue> {
  const attached = jobQueueOf(deps.db);
  if (attached) return attached;
  let queue = inlineQueues.get(deps.db);
  if (!queue) {
    queue = createInlineJobQueue();
    await registerTerrainWorkers(deps, queue);
    inlineQueues.set(deps.db, queue);
  }
  return queue;
}

/** Resolves when in-process ingestion jobs have finished (tests and the demo seed). */
export async function waitForInlineTerrainJobs(deps: AppDeps): Promise<void> {
  await inlineQueues.get(deps.db)?.idle();
}

function duplicateError(existing: { id: string; name: string }): HttpError {
  return new ConflictError(`This file is already in the catalogue as “${existing.name}”`, 'duplicate_terrain', {
    existingId: existing.id,
    existingName: existing.name,
  });
}

function isUniqueViolation(error: unknown): boolean {
  return typeof error === 'object' && error !== null && (error as { code?: unknown }).code === '23505';
}


