import { setImmediate as yieldToEventLoop } from 'node:timers/promises';
import type { SamplingMethod } from '@shared/domain/terrain';
import type { AppDeps } from '../../app-deps';
import { NotFoundError } from '../../http/http-error';
import type { Block, BlockStore, TerrainSource } from './block-store';
import { projectorFor } from './crs-registry';
import { bilinearValue, nearestValue, type GridGeometry } from './terrain-grid';
import { terrainRuntimeFor, type ReadyTerrain } from '../terrain-runtime';

export interface SampleOptions {
  /** Bilinear (default) or nearest pixel. */
  method?: SamplingMethod;
  /** Restrict sampling to one model (404 when it is not a ready model). */
  terrainId?: string;
}

/** [longitude, latitude] in WGS 84 degrees → elevation in metres, or null where nothing covers. */
export type ElevationSampler = (points: [number, number][], options?: SampleOptions) => Promise<(number | null)[]>;

/** Points handled between yields to the event loop: keeps a 100 000-point request from stalling others. */
const CHUNK_POINTS = 4096;

/**
 * The elevation sampler of this process, for callers outside the terrain feature (the analysis
 * preview samples routes without their own elevations with it):
 *
 *   const sample = elevationSamplerFor(deps);
 *   const elevationsM = await sample([[lon, lat], …]);   // (number | null)[]
 */
export function elevationSamplerFor(deps: AppDeps): ElevationSampler {
  return (points, options) => sampleElevations(deps, points, options);
}

/**
 * Elevations at WGS 84 points from the ready terrain models. Each point is reprojected into each
 * model's CRS; where several models cover it, the finest resolution that has data wins.
 */
export async function sampleElevations(
  deps: AppDeps,
  points: ReadonlyArray<readonly [number, number]>,
  options: SampleOptions = {},
): Promise<(number | null)[]> {
  const runtime = terrainRuntimeFor(deps);
  const catalogue = await runtime.readyCatalogue();
  let models = catalogue.models;
  if (options.terrainId) {
    models = models.filter((model) => model.id === options.terrainId);
    if (models.length === 0) throw new NotFoundError('A ready terrain model with that id');
  }
  return sampleFromModels(runtime.blocks, models, points, options.method ?? 'bilinear');
}

/** Blocks requested ahead of the points being interpolated: enough to keep every decoder thread busy. */
const PREFETCH_BLOCKS = 32;

/**
 * Sampling against an explicit list of models, finest first (exported for the benchmark). Model
 * by model: the points still without a value are reprojected, then interpolated chunk by chunk
 * while the blocks of the following chunks are already being decoded on the decoder threads.
 */
export async function sampleFromModels(
  blocks: BlockStore,
  models: readonly ReadyTerrain[],
  points: ReadonlyArray<readonly [number, number]>,
  method: SamplingMethod,
): Promise<(number | null)[]> {
  const found = new Float64Array(points.length).fill(NaN);
  for (const model of models) {
    const [west, south, east, north] = model.bbox;
    const wanted: number[] = [];
    for (let i = 0; i < points.length; i++) {
      if (found[i] === found[i]) continue;
      const [lon, lat] = points[i]!;
      if (lon >= west && lon <= east && lat >= south && lat <= north) wanted.push(i);
    }
    if (wanted.length === 0) continue;
    const values = await sampleModel(
      blocks,
      model,
      wanted.map((i) => points[i]!),
      method,
    );
    for (let k = 0; k < wanted.length; k++) {
      const value = values[k]!;
      if (value === value) found[wanted[k]!] = value;
    }
  }
  const result = new Array<number | null>(points.length);
  for (let i = 0; i < points.length; i++) result[i] = found[i] === found[i] ? found[i]! : null;
  return result;
}

/** Samples one model at WGS 84 points; NaN where it has no data. */
export async function sampleModel(
  blocks: BlockStore,
  model: TerrainSource,
  points: ReadonlyArray<readonly [number, number]>,
  method: SamplingMethod,
): Promise<Float64Array> {
  const projector = projectorFor(model.proj4Definition);
  const cols = new Float64Array(points.length);
  const rows = new Float64Array(points.length);
  for (let start = 0; start < points.length; start += CHUNK_POINTS) {
    const end = Math.min(points.length, start + CHUNK_POINTS);
    for (let i = start; i < end; i++) {
      const [x, y] = model.isGeographic ? (points[i] as [number, number]) : projector.forward(points[i]!);
      cols[i] = (x - model.originX) / model.pixelSizeX;
      rows[i] = (y - model.originY) / model.pixelSizeY;
    }
    if (end < points.length) await yieldToEventLoop();
  }
  if (points.length <= CHUNK_POINTS) return samplePixels(blocks, model, 0, cols, rows, method);

  // Which blocks each chunk needs, then the chunks in order with the decoder threads working ahead.
  const grid = blocks.blockGrid(model, 0);
  const chunkBlocks: number[][] = [];
  for (let start = 0; start < points.length; start += CHUNK_POINTS) {
    chunkBlocks.push(blocksTouched(grid, cols, rows, start, Math.min(points.length, start + CHUNK_POINTS), method));
  }
  const requested = new Set<number>();
  let ahead = 0;
  let nextChunk = 0;
  let nextBlock = 0;
  const requestAhead = (untilChunk: number) => {
    while (nextChunk < chunkBlocks.length && (nextChunk <= untilChunk || ahead < PREFETCH_BLOCKS)) {
      const list = chunkBlocks[nextChunk]!;
      if (nextBlock >= list.length) {
        nextChunk++;
        nextBlock = 0;
        continue;
      }
      const index = list[nextBlock++]!;
      if (requested.has(index)) continue;
      requested.add(index);
      const blockX = index % grid.across;
      const blockY = Math.floor(index / grid.across);
      if (blocks.peek(model, 0, blockX, blockY)) continue;
      ahead++;
      // Errors surface when the chunk that needs the block asks for it again.
      void blocks.block(model, 0, blockX, blockY).then(
        () => ahead--,
        () => ahead--,
      );
    }
  };
  const out = new Float64Array(points.length);
  for (let chunk = 0; chunk < chunkBlocks.length; chunk++) {
    requestAhead(chunk);
    const start = chunk * CHUNK_POINTS;
    const end = Math.min(points.length, start + CHUNK_POINTS);
    await samplePixels(blocks, model, 0, cols.subarray(start, end), rows.subarray(start, end), method, out.subarray(start, end));
    if (end < points.length) await yieldToEventLoop();
  }
  return out;
}

/** Indexes (blockY · across + blockX) of the blocks whose pixels points [from, to) read, in first-use order. */
function blocksTouched(
  grid: { blockWidth: number; blockHeight: number; across: number; down: number; widthPx: number; heightPx: number },
  cols: Float64Array,
  rows: Float64Array,
  from: number,
  to: number,
  method: SamplingMethod,
): number[] {
  const { blockWidth, blockHeight, across } = grid;
  // A bitmap over the block grid (cheaper than a Set for the 65 536 samples of a tile).
  const wanted = new Uint8Array(across * grid.down);
  const needed: number[] = [];
  const addBlockOf = (col: number, row: number) => {
    if (col < 0 || row < 0 || col >= grid.widthPx || row >= grid.heightPx) return;
    const index = Math.floor(row / blockHeight) * across + Math.floor(col / blockWidth);
    if (wanted[index] === 0) {
      wanted[index] = 1;
      needed.push(index);
    }
  };
  for (let i = from; i < to; i++) {
    const col = cols[i]!;
    const row = rows[i]!;
    if (!(col >= 0 && row >= 0 && col <= grid.widthPx && row <= grid.heightPx)) continue;
    if (method === 'nearest') {
      addBlockOf(Math.min(Math.floor(col), grid.widthPx - 1), Math.min(Math.floor(row), grid.heightPx - 1));
    } else {
      const c0 = Math.floor(col - 0.5);
      const r0 = Math.floor(row - 0.5);
      addBlockOf(c0, r0);
      addBlockOf(c0 + 1, r0);
      addBlockOf(c0, r0 + 1);
      addBlockOf(c0 + 1, r0 + 1);
    }
  }
  return needed;
}

/**
 * Values at continuous pixel coordinates of one level (0 = full resolution, k = overview k,
 * whose coordinates are the level-0 ones divided by its factor). Fetches every block the points
 * touch, in parallel, then interpolates.
 */
export async function samplePixels(
  blocks: BlockStore,
  model: TerrainSource,
  level: number,
  cols: Float64Array,
  rows: Float64Array,
  method: SamplingMethod,
  out: Float64Array = new Float64Array(cols.length),
): Promise<Float64Array> {
  const grid = blocks.blockGrid(model, level);
  const geometry: GridGeometry = { originX: 0, originY: 0, pixelSizeX: 1, pixelSizeY: 1, widthPx: grid.widthPx, heightPx: grid.heightPx };
  const { blockWidth, blockHeight, across } = grid;
  const needed = blocksTouched(grid, cols, rows, 0, cols.length, method);
  const loaded = new Map<number, Block>();
  await Promise.all(
    needed.map(async (index) => {
      const blockX = index % across;
      const blockY = Math.floor(index / across);
      loaded.set(index, blocks.peek(model, level, blockX, blockY) ?? (await blocks.block(model, level, blockX, blockY)));
    }),
  );

  // Neighbouring lookups mostly hit the same block: remember the last one.
  let lastIndex = -1;
  let lastBlock: Block | undefined;
  const valueAt = (col: number, row: number): number => {
    if (col < 0 || row < 0 || col >= grid.widthPx || row >= grid.heightPx) return NaN;
    const blockX = Math.floor(col / blockWidth);
    const blockY = Math.floor(row / blockHeight);
    const index = blockY * across + blockX;
    if (index !== lastIndex) {
      lastIndex = index;
      lastBlock = loaded.get(index);
    }
    if (!lastBlock) return NaN;
    return lastBlock.values[(row - blockY * blockHeight) * lastBlock.width + (col - blockX * blockWidth)]!;
  };
  const interpolate = method === 'nearest' ? nearestValue : bilinearValue;
  for (let i = 0; i < cols.length; i++) out[i] = interpolate(geometry, cols[i]!, rows[i]!, valueAt);
  return out;
}
