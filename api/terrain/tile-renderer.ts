import { PNG } from 'pngjs';
import type { BlockStore } from './block-store';
import { projectorFor } from './crs-registry';
import { samplePixels } from './elevation-sampler';
import { tintInto } from './elevation-tint';
import { shadeAt, sunTerms, type SunTerms } from './hillshade';
import type { ReadyTerrain } from './terrain-runtime';

export const TILE_SIZE_PX = 256;
/** WGS 84 / Web Mercator sphere radius (EPSG:3857), m. */
const WEB_MERCATOR_RADIUS_M = 6_378_137;
/** Reprojection is exact on a coarse lattice and interpolated in between (error far below a pixel at tile scale). */
const LATTICE_STEP_PX = 16;
/** Hillshade weight in the blend: the tint keeps 30 % of its brightness in full shadow. */
const SHADOW_FLOOR = 0.3;
const SUN: SunTerms = sunTerms();

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
 * has data. Null when no model touches the tile.
 */
export async function renderTerrainTile(
  blocks: BlockStore,
  models: readonly ReadyTerrain[],
  z: number,
  x: number,
  y: number,
): Promise<Buffer | null> {
  const [west, south, east, north] = tileBounds(z, x, y);
  const touching = models.filter((m) => m.bbox[0] <= east && m.bbox[2] >= west && m.bbox[1] <= north && m.bbox[3] >= south);
  if (touching.length === 0) return null;

  // Samples at the centres of the tile's pixels plus a one-pixel border for the 3 × 3 window.
  const size = TILE_SIZE_PX + 2;
  const elevations = new Float64Array(size * size).fill(NaN);
  const worldPx = TILE_SIZE_PX * 2 ** z;
  const lonAt = (i: number) => ((x * TILE_SIZE_PX + i - 1 + 0.5) / worldPx) * 360 - 180;
  const latAt = (j: number) =>
    (Math.atan(Math.sinh(Math.PI * (1 - (2 * (y * TILE_SIZE_PX + j - 1 + 0.5)) / worldPx))) * 180) / Math.PI;
  const centreLatRad = (((north + south) / 2) * Math.PI) / 180;
  const groundPxM = ((2 * Math.PI * WEB_MERCATOR_RADIUS_M) / worldPx) * Math.cos(centreLatRad);

  for (const model of touching) {
    const level = levelFor(model, groundPxM);
    const factor = level === 0 ? 1 : model.overviews[level - 1]!.factor;
    const { cols, rows, indices } = latticeToPixels(model, size, lonAt, latAt, factor, elevations);
    if (indices.length === 0) break;
    const values = await samplePixels(blocks, model, level, cols, rows, 'bilinear');
    for (let k = 0; k < indices.length; k++) {
      const value = values[k]!;
      if (value === value) elevations[indices[k]!] = value;
    }
  }

  const png = new PNG({ width: TILE_SIZE_PX, height: TILE_SIZE_PX, colorType: 6 });
  const rgba = png.data;
  const rgb = new Uint8Array(3);
  for (let j = 0; j < TILE_SIZE_PX; j++) {
    for (let i = 0; i < TILE_SIZE_PX; i++) {
      const out = (j * TILE_SIZE_PX + i) * 4;
      const elevationM = elevations[(j + 1) * size + (i + 1)]!;
      if (elevationM !== elevationM) {
        rgba[out + 3] = 0;
        continue;
      }
      const light = SHADOW_FLOOR + (1 - SHADOW_FLOOR) * 1.15 * shadeAt(elevations, size, size, i + 1, j + 1, groundPxM, groundPxM, SUN);
      tintInto(elevationM, rgb, 0);
      rgba[out] = Math.min(255, rgb[0]! * light);
      rgba[out + 1] = Math.min(255, rgb[1]! * light);
      rgba[out + 2] = Math.min(255, rgb[2]! * light);
      rgba[out + 3] = 255;
    }
  }
  // pngjs's default tries five filters per row; one fixed filter and a lighter deflate are ~10×
  // faster for a few per cent more bytes (pngjs also mutates the options: a fresh object each time).
  return PNG.sync.write(png, { colorType: 6, deflateLevel: 3, filterType: 1 });
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
 * Pixel coordinates (at the chosen level) of every still-empty sample: exact reprojection on a
 * lattice every 16 pixels, bilinear in between.
 */
function latticeToPixels(
  model: ReadyTerrain,
  size: number,
  lonAt: (i: number) => number,
  latAt: (j: number) => number,
  factor: number,
  elevations: Float64Array,
): { cols: Float64Array; rows: Float64Array; indices: number[] } {
  const projector = projectorFor(model.proj4Definition);
  const nodes = Math.ceil((size - 1) / LATTICE_STEP_PX) + 1;
  const nodeCol = new Float64Array(nodes * nodes);
  const nodeRow = new Float64Array(nodes * nodes);
  for (let nj = 0; nj < nodes; nj++) {
    for (let ni = 0; ni < nodes; ni++) {
      const point: [number, number] = [lonAt(ni * LATTICE_STEP_PX), latAt(nj * LATTICE_STEP_PX)];
      const [mx, my] = model.isGeographic ? point : projector.forward(point);
      nodeCol[nj * nodes + ni] = (mx - model.originX) / model.pixelSizeX / factor;
      nodeRow[nj * nodes + ni] = (my - model.originY) / model.pixelSizeY / factor;
    }
  }
  const indices: number[] = [];
  for (let index = 0; index < elevations.length; index++) if (elevations[index] !== elevations[index]) indices.push(index);
  const cols = new Float64Array(indices.length);
  const rows = new Float64Array(indices.length);
  for (let k = 0; k < indices.length; k++) {
    const index = indices[k]!;
    const i = index % size;
    const j = (index - i) / size;
    const ni = Math.min(Math.floor(i / LATTICE_STEP_PX), nodes - 2);
    const nj = Math.min(Math.floor(j / LATTICE_STEP_PX), nodes - 2);
    const fx = i / LATTICE_STEP_PX - ni;
    const fy = j / LATTICE_STEP_PX - nj;
    const n00 = nj * nodes + ni;
    const n10 = n00 + 1;
    const n01 = n00 + nodes;
    const n11 = n01 + 1;
    cols[k] = (nodeCol[n00]! * (1 - fx) + nodeCol[n10]! * fx) * (1 - fy) + (nodeCol[n01]! * (1 - fx) + nodeCol[n11]! * fx) * fy;
    rows[k] = (nodeRow[n00]! * (1 - fx) + nodeRow[n10]! * fx) * (1 - fy) + (nodeRow[n01]! * (1 - fx) + nodeRow[n11]! * fx) * fy;
  }
  return { cols, rows, indices };
}

let transparent: Buffer | null = null;
/** A fully transparent tile (where no model covers). */
export function transparentTile(): Buffer {
  transparent ??= PNG.sync.write(new PNG({ width: TILE_SIZE_PX, height: TILE_SIZE_PX, colorType: 6 }), { colorType: 6 });
  return transparent;
}
