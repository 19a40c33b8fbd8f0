import { existsSync, readSync } from 'node:fs';
import { open, type FileHandle } from 'node:fs/promises';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { LRUCache } from 'lru-cache';
import { Piscina } from 'piscina';
import type { TerrainOverviewLevel } from '../../db/schema/terrain';
import { decodeWindow, forgetFile, type DecodeWindowTask } from './raster-decode.mjs';
import { joinParts, renderTileRows, TILE_PX, warmUpKernel, type TileTask } from '../tiles/tile-kernel.mjs';

/** A ready terrain model as sampling and rendering see it. */
export interface TerrainSource {
  id: string;
  /** Changes when the model's file changes; part of every cache key. */
  version: string;
  /** Absolute path of the GeoTIFF. */
  path: string;
  /** Absolute folder of the reduced pyramid. */
  overviewDir: string;
  widthPx: number;
  heightPx: number;
  blockWidthPx: number;
  blockHeightPx: number;
  originX: number;
  originY: number;
  pixelSizeX: number;
  pixelSizeY: number;
  resolutionM: number;
  proj4Definition: string;
  isGeographic: boolean;
  nodata: number | null;
  dataType: 'Int16' | 'Int32' | 'Float32' | 'Float64';
  verticalScaleToM: number;
  overviews: TerrainOverviewLevel[];
}

/** A decoded block: elevations in metres, NaN for nodata, row-major `width` × `height`. */
export interface Block {
  values: Float32Array | Float64Array;
  width: number;
  height: number;
}

/** Tile size of the reduced pyramid files (raw little-endian Float32, 256 × 256 blocks). */
export const OVERVIEW_BLOCK_PX = 256;
/**
 * Rows a split tile's worker part gives up to this thread's: the worker starts about 0.15 ms and
 * answers about 0.3–0.5 ms after this thread starts its own part, so equal parts leave this
 * thread waiting. On the 2-core development machine 0, 12 and 24 rows were tried (warm tiles,
 * four alternating runs each): 12 and 24 both beat 0 by 5–8 %, 24 slightly ahead.
 */
const HAND_OFF_ROWS = 20;
/** Overview files kept open for reading. */
const MAX_OPEN_OVERVIEWS = 16;

/**
 * Decoded terrain blocks for sampling and tile rendering: an LRU cache bounded in bytes in front
 * of a pool of worker threads that decode GeoTIFF tiles/strips (geotiff.js inflates on the CPU,
 * which would otherwise stall every other request). Concurrent requests for the same block share
 * one decode.
 */
export class BlockStore {
  private readonly cache: LRUCache<string, Block>;
  private readonly inFlight = new Map<string, Promise<Block>>();
  private poolInstance: Piscina | null = null;
  /** Tasks of this store running or queued in the pool (a tile is split only when it is idle). */
  private tasksRunning = 0;
  private readonly overviewFiles = new Map<string, Promise<FileHandle>>();

  constructor(private readonly options: { cacheBytes: number; threads: number }) {
    this.cache = new LRUCache<string, Block>({
      maxSize: options.cacheBytes,
      sizeCalculation: (block) => Math.max(1, block.values.byteLength),
    });
  }

  /** Decoder threads start on first use: a process that never decodes never starts them. */
  private get pool(): Piscina {
    this.poolInstance ??= new Piscina({
      filename: decodeWorkerPath(),
      minThreads: 1,
      maxThreads: this.options.threads,
      // Idle workers exit so a quiet API holds no decoder memory.
      idleTimeout: 30_000,
      // geotiff.js pulls in the `web-worker` package, which inside any worker thread destructures
      // `workerData`; an empty object makes it behave as on the main thread.
      workerData: {},
    });
    return this.poolInstance;
  }

  /** Number of blocks across and down at a level (0 = the GeoTIFF, k = overview k). */
  blockGrid(
    source: TerrainSource,
    level: number,
  ): { blockWidth: number; blockHeight: number; across: number; down: number; widthPx: number; heightPx: number } {
    if (level === 0) {
      return {
        blockWidth: source.blockWidthPx,
        blockHeight: source.blockHeightPx,
        across: Math.ceil(source.widthPx / source.blockWidthPx),
        down: Math.ceil(source.heightPx / source.blockHeightPx),
        widthPx: source.widthPx,
        heightPx: source.heightPx,
      };
    }
    const overview = source.overviews[level - 1]!;
    return {
      blockWidth: OVERVIEW_BLOCK_PX,
      blockHeight: OVERVIEW_BLOCK_PX,
      across: Math.ceil(overview.widthPx / OVERVIEW_BLOCK_PX),
      down: Math.ceil(overview.heightPx / OVERVIEW_BLOCK_PX),
      widthPx: overview.widthPx,
      heightPx: overview.heightPx,
    };
  }

  /** The cached block, if any, without waiting. */
  peek(source: TerrainSource, level: number, blockX: number, blockY: number): Block | undefined {
    return this.cache.get(blockKey(source, level, blockX, blockY));
  }

  async block(source: TerrainSource, level: number, blockX: number, blockY: number): Promise<Block> {
    return this.load(source, level, blockX, blockY, () =>
      level === 0
        ? this.decodeGeoTiffBlock(source, blockX, blockY, (window) => this.window(source, window))
        : this.overviewFile(source, level).then((handle) => readOverviewBlock(handle, source, level, blockX, blockY)),
    );
  }

  /** Whether no terrain work of this store is running or queued in the pool. */
  get idle(): boolean {
    return this.tasksRunning === 0;
  }

  /**
   * The block, loaded on this thread when not cached: a GeoTIFF block decoded here rather than
   * in a worker, an overview block read with one synchronous read of the file (a quarter of a
   * megabyte, normally from the page cache). For a map tile while the pool is idle: as in
   * renderTile, this thread takes a share of the tile's work, where handing it over and back
   * (to a worker or to libuv's threads) costs the tile half a millisecond or more.
   */
  async blockHere(source: TerrainSource, level: number, blockX: number, blockY: number): Promise<Block> {
    return this.load(source, level, blockX, blockY, () =>
      level === 0
        ? this.decodeGeoTiffBlock(source, blockX, blockY, (window) => decodeWindow(decodeTask(source, window)))
        : this.overviewFile(source, level).then((handle) => readOverviewBlockSync(handle.fd, source, level, blockX, blockY)),
    );
  }

  /** The cached block, or the one being loaded, or a new load (cached once done). */
  private load(source: TerrainSource, level: number, blockX: number, blockY: number, loader: () => Promise<Block>): Promise<Block> {
    const key = blockKey(source, level, blockX, blockY);
    const cached = this.cache.get(key);
    if (cached) return Promise.resolve(cached);
    let pending = this.inFlight.get(key);
    if (!pending) {
      pending = loader()
        .then((block) => {
          this.cache.set(key, block);
          return block;
        })
        .finally(() => this.inFlight.delete(key));
      this.inFlight.set(key, pending);
    }
    return pending;
  }

  /**
   * Decodes any window of a model's GeoTIFF in a worker (ingestion reads row bands this way).
   * `reuse`, an array from an earlier call that the caller no longer needs, is handed to the
   * worker and filled again when it is large enough (the caller must not touch it afterwards).
   */
  async window(
    source: Pick<TerrainSource, 'path' | 'nodata' | 'dataType' | 'verticalScaleToM'>,
    window: [number, number, number, number],
    reuse?: Float32Array | Float64Array,
  ): Promise<Float32Array | Float64Array> {
    const into = reuse?.buffer as ArrayBuffer | undefined;
    return (await this.runTask(decodeTask(source, window, into), into ? { transferList: [into] } : {})) as Float32Array | Float64Array;
  }

  /**
   * Renders one map tile (sampling, hillshade, tint, palette PNG) in the worker threads, so the
   * event loop stays free for other requests. When the pool has nothing else to do, the tile is
   * split in two at `splitRow` (where the work halves: a tile half without data splits off
   * centre): a worker renders the top part while this thread renders the bottom one, and a worker
   * encodes the joined pixel codes (the palette depends on the tint metres of the whole tile). With two cores that keeps both busy; handing the
   * second part to a second worker instead waits for this thread to go idle before that worker
   * can run, and the event loop is held for one part of one tile only when no other terrain work
   * is waiting. Otherwise one worker renders it all. Windows in shared memory are read in place,
   * others are handed over, not copied: the caller must not use them afterwards.
   */
  async renderTile(task: TileTask, splitRow = TILE_PX / 2): Promise<Buffer> {
    if (this.options.threads >= 2 && this.tasksRunning === 0) {
      const split = Math.min(TILE_PX - 16, Math.max(16, Math.round(splitRow) - HAND_OFF_ROWS));
      // The worker reads the windows from shared memory: copied once, not serialised.
      const layers = task.layers.map((layer) => ({ ...layer, window: sharedCopy(layer.window) }));
      const top = this.runTask(
        { task: { ...task, layers }, firstRow: 0, endRow: split },
        { name: 'renderTileRows' },
      ) as Promise<Uint32Array>;
      let bottom: Uint32Array;
      try {
        bottom = renderTileRows(task, split, TILE_PX);
      } finally {
        // The worker's part settles either way (no unhandled rejection when this one throws).
        void top.catch(() => undefined);
      }
      const codes = joinParts([await top, bottom]);
      const { stops, shadowFloor, shadeGain } = task;
      const png = (await this.runTask(
        { codes, colours: { stops, shadowFloor, shadeGain } },
        { name: 'encodeTile', transferList: [codes.buffer as ArrayBuffer] },
      )) as Uint8Array;
      return Buffer.from(png.buffer, png.byteOffset, png.byteLength);
    }
    // Windows in shared memory are read in place; others are handed over.
    const transferList = task.layers
      .map((layer) => layer.window.buffer)
      .filter((buffer): buffer is ArrayBuffer => buffer instanceof ArrayBuffer);
    const png = (await this.runTask(task, { name: 'renderTile', transferList })) as Uint8Array;
    return Buffer.from(png.buffer, png.byteOffset, png.byteLength);
  }

  private async runTask(task: unknown, options: Parameters<Piscina['run']>[1]): Promise<unknown> {
    this.tasksRunning++;
    try {
      return await this.pool.run(task, options);
    } finally {
      this.tasksRunning--;
    }
  }

  /**
   * Starts the worker threads now rather than on first use, and compiles this thread's share of
   * the tile kernel (the benchmark times work, not start-up).
   */
  async startThreads(): Promise<void> {
    const pool = this.pool;
    await Promise.all(Array.from({ length: this.options.threads }, () => pool.run({ path: '' }, { name: 'forget' })));
    warmUpKernel();
  }

  /** Overview files stay open between reads (a few, least recently used first out). */
  private overviewFile(source: TerrainSource, level: number): Promise<FileHandle> {
    const path = join(source.overviewDir, source.overviews[level - 1]!.fileName);
    let handle = this.overviewFiles.get(path);
    if (handle) {
      this.overviewFiles.delete(path);
    } else {
      handle = open(path, 'r');
      handle.catch(() => this.overviewFiles.delete(path));
    }
    this.overviewFiles.set(path, handle);
    if (this.overviewFiles.size > MAX_OPEN_OVERVIEWS) {
      const [oldestPath, oldest] = this.overviewFiles.entries().next().value!;
      this.overviewFiles.delete(oldestPath);
      // Reads already under way finish first: the handle closes once they have settled.
      void oldest.then(
        (file) => setTimeout(() => void file.close().catch(() => undefined), 1_000),
        () => undefined,
      );
    }
    return handle;
  }

  private closeOverviewFiles(prefix?: string): void {
    for (const [path, handle] of this.overviewFiles) {
      if (prefix && !path.startsWith(prefix)) continue;
      this.overviewFiles.delete(path);
      void handle
        .then(
          (file) => file.close(),
          () => undefined,
        )
        .catch(() => undefined);
    }
  }

  /** Forgets everything about a model (after deletion). */
  async forget(source: Pick<TerrainSource, 'id' | 'path' | 'overviewDir'>): Promise<void> {
    for (const key of this.cache.keys()) if (key.startsWith(`${source.id}:`)) this.cache.delete(key);
    this.closeOverviewFiles(join(source.overviewDir, '/'));
    forgetFile(source.path);
    if (!this.poolInstance) return;
    const pool = this.poolInstance;
    await Promise.all(Array.from({ length: pool.threads.length }, () => pool.run({ path: source.path }, { name: 'forget' })));
  }

  async close(): Promise<void> {
    this.closeOverviewFiles();
    await this.poolInstance?.destroy();
    this.poolInstance = null;
  }

  private async decodeGeoTiffBlock(
    source: TerrainSource,
    blockX: number,
    blockY: number,
    decode: (window: [number, number, number, number]) => Promise<Float32Array | Float64Array>,
  ): Promise<Block> {
    const x0 = blockX * source.blockWidthPx;
    const y0 = blockY * source.blockHeightPx;
    const x1 = Math.min(x0 + source.blockWidthPx, source.widthPx);
    const y1 = Math.min(y0 + source.blockHeightPx, source.heightPx);
    const values = await decode([x0, y0, x1, y1]);
    return { values, width: x1 - x0, height: y1 - y0 };
  }
}

/** The values themselves when they are in shared memory already, else a copy in shared memory. */
function sharedCopy(values: Float32Array | Float64Array): Float32Array | Float64Array {
  if (typeof SharedArrayBuffer !== 'undefined' && values.buffer instanceof SharedArrayBuffer) return values;
  const Values = values instanceof Float64Array ? Float64Array : Float32Array;
  const copy = new Values(new SharedArrayBuffer(values.byteLength) as unknown as ArrayBuffer);
  copy.set(values);
  return copy;
}

/** A decode task for a window of a model's GeoTIFF (raster-decode.mjs). */
function decodeTask(
  source: Pick<TerrainSource, 'path' | 'nodata' | 'dataType' | 'verticalScaleToM'>,
  window: [number, number, number, number],
  into?: ArrayBuffer,
): DecodeWindowTask {
  return {
    path: source.path,
    window,
    // Float32 files store nodata rounded to single precision; compare like with like.
    nodata: source.nodata === null ? null : source.dataType === 'Float32' ? Math.fround(source.nodata) : source.nodata,
    verticalScaleToM: source.verticalScaleToM,
    wide: source.dataType === 'Int32' || source.dataType === 'Float64',
    into,
  };
}

function blockKey(source: TerrainSource, level: number, blockX: number, blockY: number): string {
  return `${source.id}:${source.version}:${level}:${blockX}:${blockY}`;
}

/** Overview files are raw tiled Float32: one positioned read per block (off-thread in libuv). */
async function readOverviewBlock(handle: FileHandle, source: TerrainSource, level: number, blockX: number, blockY: number): Promise<Block> {
  const { buffer, blockBytes, position } = overviewRead(source, level, blockX, blockY);
  await handle.read(buffer, 0, blockBytes, position);
  return overviewBlock(buffer);
}

/** The same read on this thread. */
function readOverviewBlockSync(fd: number, source: TerrainSource, level: number, blockX: number, blockY: number): Block {
  const { buffer, blockBytes, position } = overviewRead(source, level, blockX, blockY);
  readSync(fd, buffer, 0, blockBytes, position);
  return overviewBlock(buffer);
}

function overviewRead(
  source: TerrainSource,
  level: number,
  blockX: number,
  blockY: number,
): { buffer: Buffer; blockBytes: number; position: number } {
  const overview = source.overviews[level - 1]!;
  const across = Math.ceil(overview.widthPx / OVERVIEW_BLOCK_PX);
  const blockBytes = OVERVIEW_BLOCK_PX * OVERVIEW_BLOCK_PX * 4;
  // Every byte is read over, so no zero-filling; a buffer of its own, not a slice of Node's pool.
  return { buffer: Buffer.allocUnsafeSlow(blockBytes), blockBytes, position: (blockY * across + blockX) * blockBytes };
}

function overviewBlock(buffer: Buffer): Block {
  const values = new Float32Array(buffer.buffer, buffer.byteOffset, OVERVIEW_BLOCK_PX * OVERVIEW_BLOCK_PX);
  return { values, width: OVERVIEW_BLOCK_PX, height: OVERVIEW_BLOCK_PX };
}

/**
 * The worker file sits next to this module; the bundled server (dist/api/main.mjs) runs from the
 * repository root and finds it under api/terrain/raster/.
 */
function decodeWorkerPath(): string {
  const besideModule = fileURLToPath(new URL('./raster-decode-worker.mjs', import.meta.url));
  if (existsSync(besideModule)) return besideModule;
  return join(process.cwd(), 'api', 'terrain', 'raster', 'raster-decode-worker.mjs');
}
