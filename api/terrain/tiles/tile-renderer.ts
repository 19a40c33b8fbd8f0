import type { Block, BlockStore } from '../raster/block-store';
import { projectorFor } from '../raster/crs-registry';
import { ELEVATION_TINT_STOPS } from './elevation-tint';
import { sunTerms, type SunTerms } from './hillshade';
import type { ReadyTerrain } from '../terrain-runtime';
import { encodeTileCodes, NO_DATA_CODE, SAMPLES_PX, type TileLayer, type TileTask } from './tile-kernel.mjs';

export const TILE_SIZE_PX = 256;
/** WGS 84 / Web Mercator sphere radius (EPSG:3857), m. */
const WEB_MERCATOR_RADIUS_M = 6_378_137;
/** Reprojection is exact on a coarse lattice and interpolated in between (error far below a pixel at tile scale). */
const LATTICE_STEP_PX = 16;
/** Hillshade weight in the blend: the tint keeps 30 % of its brightness in full shadow. */
const SHADOW_FLOOR = 0.3;
/** Hillshade's share of the light, slightly boosted so lit slopes brighten the tint. */
const SHADE_GAIN = (1 - SHADOW_FLOOR) * 1.15;
const SUN: SunTerms = sunTerms();
const TINT_STOPS = Float64Array.from(ELEVATION_TINT_STOPS.flatMap((stop) => [stop.elevationM, ...stop.rgb]));
/** Largest window gathered for one model and tile (4 MB of Float32). */
const MAX_WINDOW_PX = 1024 * 1024;

/** Web-Mercator XYZ tile bounds in WGS 84: [west, south, east, north] degrees. */
export function tileBounds(z: number, x: number, y: number): [number, number, number, number] {
  const n = 2 ** z;
  return [(x / n) * 360 - 180, tileLatitude(y + 1, n), ((x + 1) / n) * 360 - 180, tileLatitude(y, n)];
}

function tileLatitude(y: number, n: number): number {
  return (Math.atan(Math.sinh(Math.PI * (1 - (2 * y) / n))) * 180) / Math.PI;
}

/**
 * Renders one 256 × 256 tile: elevations sampled bilinearly from the ready models (finest with
 * data wins, the pyramid level matched to the tile's ground resolution), hillshade by Horn's
 * method with the sun at 315° / 45°, blended with our elevation tint; transparent where no model
 * has data; a palette PNG of tint classes × shade levels (tile-kernel.mjs). Null when no model touches
 * the tile.
 *
 * This thread only reprojects a coarse lattice (proj4, every 16 pixels), gathers the decoded
 * blocks under the tile into one window per model and hands the rest to a worker thread
 * (tile-kernel.mjs), which does the per-pixel work in flat typed-array loops.
 */
export async function renderTerrainTile(
  blocks: BlockStore,
  models: readonly ReadyTerrain[],
  z: number,
  x: number,
  y: number,
): Promise<Buffer | null> {
  const prepared = await terrainTileTask(blocks, models, z, x, y);
  if (prepared === null) return null;
  if (prepared === 'empty') return transparentTile();
  return blocks.renderTile(prepared.task, prepared.splitRow);
}

/**
 * What a worker thread needs to render tile z/x/y (the windows gathered, the lattice
 * reprojected) and the row where splitting it halves the work; null when no model touches the
 * tile, 'empty' when models touch it but none has data under it.
 */
export async function terrainTileTask(
  blocks: BlockStore,
  models: readonly ReadyTerrain[],
  z: number,
  x: number,
  y: number,
): Promise<{ task: TileTask; splitRow: number } | 'empty' | null> {
  const [west, south, east, north] = tileBounds(z, x, y);
  const touching = models.filter((m) => m.bbox[0] <= east && m.bbox[2] >= west && m.bbox[1] <= north && m.bbox[3] >= south);
  if (touching.length === 0) return null;

  const worldPx = TILE_SIZE_PX * 2 ** z;
  const centreLatRad = (((north + south) / 2) * Math.PI) / 180;
  const groundPxM = ((2 * Math.PI * WEB_MERCATOR_RADIUS_M) / worldPx) * Math.cos(centreLatRad);

  const layers: TileLayer[] = [];
  for (const model of touching) {
    const layer = await layerFor(blocks, model, x, y, worldPx, groundPxM);
    if (layer) layers.push(layer);
  }
  if (layers.length === 0) return 'empty';
  return {
    task: {
      layers,
      cellSizeM: groundPxM,
      sun: SUN,
      stops: TINT_STOPS,
      shadowFloor: SHADOW_FLOOR,
      shadeGain: SHADE_GAIN,
    },
    splitRow: balancedSplitRow(layers),
  };
}

/**
 * The tile row that halves the rendering work when the tile is split over two threads: pixels
 * without data cost next to nothing, so a tile cut by a grid edge splits where the lattice nodes
 * inside some grid are halved, not in the middle.
 */
function balancedSplitRow(layers: readonly TileLayer[]): number {
  const { nodes, step } = layers[0]!;
  const perRow = new Array<number>(nodes).fill(0);
  for (let nj = 0; nj < nodes; nj++) {
    for (let ni = 0; ni < nodes; ni++) {
      const n = nj * nodes + ni;
      const inside = layers.some((layer) => {
        const col = layer.nodeCols[n]!;
        const row = layer.nodeRows[n]!;
        return col >= 0 && row >= 0 && col <= layer.gridWidth && row <= layer.gridHeight;
      });
      if (inside) perRow[nj]!++;
    }
  }
  const total = perRow.reduce((sum, count) => sum + count, 0);
  let seen = 0;
  for (let nj = 0; nj < nodes; nj++) {
    seen += perRow[nj]!;
    if (seen >= total / 2) return Math.min(TILE_SIZE_PX - 16, Math.max(16, nj * step));
  }
  return TILE_SIZE_PX / 2;
}

/** Coarsest pyramid level whose pixels are still no larger than the tile's pixels. */
function levelFor(model: ReadyTerrain, groundPxM: number): number {
  let level = 0;
  for (let k = 0; k < model.overviews.length; k++) {
    if (model.overviews[k]!.factor * model.resolutionM <= groundPxM) level = k + 1;
  }
  return level;
}

/**
 * One model's share of the tile: the lattice of the tile's samples in the model's grid (exact
 * reprojection every 16 pixels; the kernel interpolates bilinearly in between) and the window of
 * decoded values they fall on. Null when the tile misses the grid.
 */
async function layerFor(
  blocks: BlockStore,
  model: ReadyTerrain,
  x: number,
  y: number,
  worldPx: number,
  groundPxM: number,
): Promise<TileLayer | null> {
  const projector = projectorFor(model.proj4Definition);
  const nodes = Math.ceil((SAMPLES_PX - 1) / LATTICE_STEP_PX) + 1;
  const modelX = new Float64Array(nodes * nodes);
  const modelY = new Float64Array(nodes * nodes);
  const point: [number, number] = [0, 0];
  for (let nj = 0; nj < nodes; nj++) {
    const globalRow = y * TILE_SIZE_PX + nj * LATTICE_STEP_PX - 1 + 0.5;
    const lat = (Math.atan(Math.sinh(Math.PI * (1 - (2 * globalRow) / worldPx))) * 180) / Math.PI;
    for (let ni = 0; ni < nodes; ni++) {
      point[0] = ((x * TILE_SIZE_PX + ni * LATTICE_STEP_PX - 1 + 0.5) / worldPx) * 360 - 180;
      point[1] = lat;
      const [mx, my] = model.isGeographic ? point : projector.forward(point);
      modelX[nj * nodes + ni] = mx;
      modelY[nj * nodes + ni] = my;
    }
  }

  // A window larger than this (only for oddly shaped grids at low zoom) moves to a coarser level.
  let level = levelFor(model, groundPxM);
  for (;;) {
    const factor = level === 0 ? 1 : model.overviews[level - 1]!.factor;
    const grid = blocks.blockGrid(model, level);
    const nodeCols = new Float64Array(nodes * nodes);
    const nodeRows = new Float64Array(nodes * nodes);
    let minCol = Infinity;
    let maxCol = -Infinity;
    let minRow = Infinity;
    let maxRow = -Infinity;
    for (let n = 0; n < nodeCols.length; n++) {
      const col = (modelX[n]! - model.originX) / model.pixelSizeX / factor;
      const row = (modelY[n]! - model.originY) / model.pixelSizeY / factor;
      nodeCols[n] = col;
      nodeRows[n] = row;
      if (col < minCol) minCol = col;
      if (col > maxCol) maxCol = col;
      if (row < minRow) minRow = row;
      if (row > maxRow) maxRow = row;
    }
    if (!(minCol <= maxCol && minRow <= maxRow)) return null;
    // Every bilinear neighbour of a sample inside the lattice's hull, clipped to the grid plus a
    // one-pixel NaN margin (neighbours off the grid count as nodata).
    const x0 = Math.max(-1, Math.floor(minCol - 0.5));
    const y0 = Math.max(-1, Math.floor(minRow - 0.5));
    const x1 = Math.min(grid.widthPx, Math.floor(maxCol - 0.5) + 1);
    const y1 = Math.min(grid.heightPx, Math.floor(maxRow - 0.5) + 1);
    if (x1 < 0 || y1 < 0 || x0 >= grid.widthPx || y0 >= grid.heightPx || x1 <= x0 || y1 <= y0) return null;
    const width = x1 - x0 + 1;
    const height = y1 - y0 + 1;
    if (width * height > MAX_WINDOW_PX && level < model.overviews.length) {
      level++;
      continue;
    }
    const window = await gatherWindow(blocks, model, level, x0, y0, width, height);
    return {
      window,
      x0,
      y0,
      width,
      height,
      gridWidth: grid.widthPx,
      gridHeight: grid.heightPx,
      nodeCols,
      nodeRows,
      nodes,
      step: LATTICE_STEP_PX,
    };
  }
}

/** Decoded values of grid pixels [x0, x0 + width) × [y0, y0 + height) at a level; NaN off the grid. */
async function gatherWindow(
  blocks: BlockStore,
  model: ReadyTerrain,
  level: number,
  x0: number,
  y0: number,
  width: number,
  height: number,
): Promise<Float32Array | Float64Array> {
  const grid = blocks.blockGrid(model, level);
  const wide = level === 0 && (model.dataType === 'Int32' || model.dataType === 'Float64');
  // Shared memory: the threads that render the tile read it without a copy.
  const shared = new SharedArrayBuffer(width * height * (wide ? 8 : 4)) as unknown as ArrayBuffer;
  const window = (wide ? new Float64Array(shared) : new Float32Array(shared)).fill(NaN);
  const cx0 = Math.max(0, x0);
  const cy0 = Math.max(0, y0);
  const cx1 = Math.min(grid.widthPx, x0 + width);
  const cy1 = Math.min(grid.heightPx, y0 + height);
  if (cx1 <= cx0 || cy1 <= cy0) return window;
  const missing: Array<[number, number]> = [];
  const copies: Array<(block: Block) => void> = [];
  for (let by = Math.floor(cy0 / grid.blockHeight); by * grid.blockHeight < cy1; by++) {
    for (let bx = Math.floor(cx0 / grid.blockWidth); bx * grid.blockWidth < cx1; bx++) {
      const copy = (block: Block) => {
        const bx0 = bx * grid.blockWidth;
        const by0 = by * grid.blockHeight;
        const c0 = Math.max(cx0, bx0);
        const c1 = Math.min(cx1, bx0 + block.width);
        for (let r = Math.max(cy0, by0); r < Math.min(cy1, by0 + block.height); r++) {
          const from = (r - by0) * block.width + (c0 - bx0);
          window.set(block.values.subarray(from, from + (c1 - c0)), (r - y0) * width + (c0 - x0));
        }
      };
      const cached = blocks.peek(model, level, bx, by);
      if (cached) copy(cached);
      else {
        missing.push([bx, by]);
        copies.push(copy);
      }
    }
  }
  // While the pool is idle this thread takes a share: it reads missing overview blocks itself,
  // and decodes one missing GeoTIFF block after handing the others to the workers.
  const hereFrom = !blocks.idle ? missing.length : level > 0 ? 0 : Math.max(0, missing.length - 1);
  const fetches = missing.slice(0, hereFrom).map(([bx, by], k) => blocks.block(model, level, bx, by).then(copies[k]!));
  for (let k = hereFrom; k < missing.length; k++)
    fetches.push(blocks.blockHere(model, level, missing[k]![0], missing[k]![1]).then(copies[k]!));
  await Promise.all(fetches);
  return window;
}

let transparent: Buffer | null = null;
/** A fully transparent tile (where no model covers): a palette PNG of one entry, 169 bytes. */
export function transparentTile(): Buffer {
  if (!transparent) {
    const png = encodeTileCodes(new Uint32Array(TILE_SIZE_PX * TILE_SIZE_PX).fill(NO_DATA_CODE), TILE_SIZE_PX, TILE_SIZE_PX, {
      stops: TINT_STOPS,
      shadowFloor: SHADOW_FLOOR,
      shadeGain: SHADE_GAIN,
    });
    transparent = Buffer.from(png.buffer, png.byteOffset, png.byteLength);
  }
  return transparent;
}
