import { readdir, rm } from 'node:fs/promises';
import { join } from 'node:path';
import type { AppDeps } from '../../app-deps';
import { requestRoadGraphRegrade } from '../../road-graph/road-graph-jobs';
import type { TerrainOverviewLevel } from '../../db/schema/terrain';
import type { TerrainSource } from '../raster/block-store';
import { PyramidBuilder } from './terrain-pyramid';
import { beatIngestion, claimIngestion, findTerrainModel, updateTerrainModel } from '../terrain-repository';
import { terrainRuntimeFor } from '../terrain-runtime';
import { StatisticsAccumulator, spikeThresholdM, type TerrainStatistics } from './terrain-statistics';

/** Name of the background job that ingests one uploaded model. */
export const TERRAIN_INGEST_JOB = 'terrain-ingest';
/** How often a running ingestion says it is alive, ms. */
export const INGEST_HEARTBEAT_MS = 15_000;
/** Silence after which an ingestion counts as abandoned and is queued again, ms. */
export const INGEST_STALE_MS = 4 * INGEST_HEARTBEAT_MS;
export interface TerrainIngestJob {
  terrainId: string;
}

/** Rows decoded per step: bounded memory (≈ rows × width × 4 bytes) whatever the grid size. */
const BAND_ROWS = 256;

/**
 * Ingests one model: statistics and the reduced pyramid in a single pass over the grid, band by
 * band, then the row becomes "ready" (or "failed" with the reason). Idempotent: a model that is
 * no longer "processing", or whose ingestion another worker is running (its heartbeat is
 * fresh), is left alone, and a rerun after a crash simply overwrites the pyramid.
 */
export async function ingestTerrainModel(deps: AppDeps, terrainId: string, jobId: string): Promise<void> {
  const runtime = terrainRuntimeFor(deps);
  if (!(await claimIngestion(deps.db, terrainId, jobId, new Date(Date.now() - INGEST_STALE_MS)))) return;
  const row = await findTerrainModel(deps.db, terrainId);
  if (!row || row.status !== 'processing') return;
  const source = runtime.sourceFromRow(row);
  const heartbeat = setInterval(() => {
    // A missed beat (database briefly away) is made up by the next one.
    beatIngestion(deps.db, terrainId, jobId).catch(() => undefined);
  }, INGEST_HEARTBEAT_MS);
  try {
    const { statistics, overviews } = await scanGrid(deps, source);
    await updateTerrainModel(deps.db, terrainId, {
      status: 'ready',
      failureReason: null,
      ingestHeartbeatAt: null,
      minElevationM: statistics.minElevationM,
      maxElevationM: statistics.maxElevationM,
      nodataShare: statistics.nodataShare,
      spikeCount: statistics.spikeCount,
      qualityNotes: [...row.qualityNotes, ...qualityNotesFor(statistics, source)],
      overviews,
      readyAt: new Date(),
    });
  } catch (error) {
    await removePyramid(source);
    const message = error instanceof Error ? error.message : String(error);
    await updateTerrainModel(deps.db, terrainId, {
      status: 'failed',
      ingestHeartbeatAt: null,
      failureReason: `The pixel data could not be read: ${message}`,
    });
  } finally {
    clearInterval(heartbeat);
  }
  runtime.invalidateCatalogue();
  // The road graph's grades come from the terrain: sample them again with this model.
  await requestRoadGraphRegrade(deps);
}

async function scanGrid(
  deps: AppDeps,
  source: TerrainSource,
): Promise<{ statistics: TerrainStatistics; overviews: TerrainOverviewLevel[] }> {
  const runtime = terrainRuntimeFor(deps);
  const statistics = new StatisticsAccumulator(source.widthPx, spikeThresholdM(source.resolutionM));
  await removePyramid(source);
  const pyramid = await PyramidBuilder.create(source.overviewDir, source.widthPx, source.heightPx);
  try {
    // Bands follow the file's own block rows where it has them, so each block is decoded once.
    const bandRows = Math.max(1, Math.floor(BAND_ROWS / source.blockHeightPx)) * source.blockHeightPx;
    // One band buffer travels to the decoder thread and back for the whole scan.
    let band: Float32Array | Float64Array | undefined;
    for (let firstRow = 0; firstRow < source.heightPx; firstRow += bandRows) {
      const rowCount = Math.min(bandRows, source.heightPx - firstRow);
      const haloAbove = firstRow > 0;
      const haloBelow = firstRow + rowCount < source.heightPx;
      const top = firstRow - (haloAbove ? 1 : 0);
      const bottom = firstRow + rowCount + (haloBelow ? 1 : 0);
      band = await runtime.blocks.window(source, [0, top, source.widthPx, bottom], band);
      statistics.addRows(band, firstRow, rowCount, haloAbove, haloBelow);
      const offset = haloAbove ? source.widthPx : 0;
      await pyramid.addRows(band.subarray(offset, offset + rowCount * source.widthPx), rowCount);
    }
    return { statistics: statistics.result(), overviews: await pyramid.finish() };
  } catch (error) {
    await pyramid.abort();
    throw error;
  }
}

async function removePyramid(source: TerrainSource): Promise<void> {
  const names = await readdir(source.overviewDir).catch(() => [] as string[]);
  await Promise.all(
    names.filter((name) => name.startsWith('overview-')).map((name) => rm(join(source.overviewDir, name), { force: true })),
  );
}

function qualityNotesFor(statistics: TerrainStatistics, source: TerrainSource): string[] {
  const notes: string[] = [];
  const percent = (statistics.nodataShare * 100).toFixed(statistics.nodataShare < 0.01 ? 2 : 1);
  if (statistics.minElevationM === null) notes.push('The model holds no data at all: every pixel is nodata.');
  else if (statistics.nodataShare > 0) notes.push(`${percent} % of the pixels are nodata; routes crossing them get no elevation there.`);
  else notes.push('No nodata pixels: the model is complete.');
  if (statistics.spikeCount > 0) {
    const where = statistics.spikeSamples.map(([col, row]) => `pixel ${col}, ${row}`).join('; ');
    notes.push(
      `${statistics.spikeCount} suspicious spike${statistics.spikeCount === 1 ? '' : 's'}: single pixels more than ${spikeThresholdM(source.resolutionM).toFixed(0)} m above or below all neighbours (${where}). Check the grade profile there.`,
    );
  } else {
    notes.push('No single-pixel spikes found.');
  }
  if (statistics.implausibleCount > 0) {
    notes.push(`${statistics.implausibleCount} pixels lie outside −500 … 9 000 m; they may be undeclared nodata.`);
  }
  return notes;
}
