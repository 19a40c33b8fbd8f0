/**
 * The pure geometry of a terrain grid and the interpolation rules shared by elevation sampling
 * and tile rendering. No I/O: values come from a `PixelLookup` that answers NaN for nodata and
 * for pixels outside the grid.
 */

/** Metres per degree of longitude at the equator on the WGS 84 ellipsoid (2π·a/360, a = 6 378 137 m). */
export const WGS84_EQUATORIAL_M_PER_DEGREE = 111_319.49;
/** Mean metres per degree of latitude on the WGS 84 ellipsoid (common practice: 111.32 km/° at
 *  the equator, 111.69 at the poles; 111.13 km is the mean). */
export const WGS84_MERIDIAN_M_PER_DEGREE = 111_132.95;

/** Where a grid lies: pixel (col, row) covers [originX + col·pixelSizeX, … + pixelSizeX). */
export interface GridGeometry {
  originX: number;
  originY: number;
  pixelSizeX: number;
  /** Negative for north-up grids. */
  pixelSizeY: number;
  widthPx: number;
  heightPx: number;
}

/** Elevation in metres at an integer pixel; NaN for nodata or outside the grid. */
export type PixelLookup = (col: number, row: number) => number;

/** Continuous pixel coordinates with pixel centres at integer + 0.5 (pixel-is-area). */
export function toPixel(grid: GridGeometry, x: number, y: number): [number, number] {
  return [(x - grid.originX) / grid.pixelSizeX, (y - grid.originY) / grid.pixelSizeY];
}

/** Whether continuous pixel coordinates fall on the grid (its outer edges included). */
export function isOnGrid(grid: GridGeometry, col: number, row: number): boolean {
  return col >= 0 && row >= 0 && col <= grid.widthPx && row <= grid.heightPx;
}

/**
 * Nearest pixel: the pixel that contains the point (the same rule as GDAL's location query,
 * which takes floor() of the pixel coordinate). Returns NaN for nodata.
 */
export function nearestValue(grid: GridGeometry, col: number, row: number, valueAt: PixelLookup): number {
  if (!isOnGrid(grid, col, row)) return NaN;
  const c = Math.min(Math.floor(col), grid.widthPx - 1);
  const r = Math.min(Math.floor(row), grid.heightPx - 1);
  return valueAt(c, r);
}

/**
 * Bilinear interpolation between the four pixel centres around the point (shared/engine/README.md §6.1):
 * z = z00(1−fx)(1−fy) + z10·fx(1−fy) + z01(1−fx)fy + z11·fx·fy.
 *
 * A neighbour that is nodata or outside the grid drops out and the remaining weights are
 * renormalised, so a value is never made up from nodata; near the grid edge this degrades to the
 * nearest pixel. NaN when no neighbour with weight has data.
 */
export function bilinearValue(grid: GridGeometry, col: number, row: number, valueAt: PixelLookup): number {
  if (!isOnGrid(grid, col, row)) return NaN;
  const px = col - 0.5;
  const py = row - 0.5;
  const c0 = Math.floor(px);
  const r0 = Math.floor(py);
  const fx = px - c0;
  const fy = py - r0;
  const z00 = valueAt(c0, r0);
  const z10 = valueAt(c0 + 1, r0);
  const z01 = valueAt(c0, r0 + 1);
  const z11 = valueAt(c0 + 1, r0 + 1);
  if (z00 === z00 && z10 === z10 && z01 === z01 && z11 === z11) {
    // All four valid (NaN !== NaN): the plain formula, the common case.
    return z00 * (1 - fx) * (1 - fy) + z10 * fx * (1 - fy) + z01 * (1 - fx) * fy + z11 * fx * fy;
  }
  let sum = 0;
  let weight = 0;
  const add = (z: number, w: number) => {
    if (w > 0 && z === z) {
      sum += z * w;
      weight += w;
    }
  };
  add(z00, (1 - fx) * (1 - fy));
  add(z10, fx * (1 - fy));
  add(z01, (1 - fx) * fy);
  add(z11, fx * fy);
  return weight > 0 ? sum / weight : NaN;
}

/** Lookup that answers NaN outside the grid, so callers need not bounds-check. */
export function guardedLookup(grid: GridGeometry, valueAt: PixelLookup): PixelLookup {
  return (col, row) => (col < 0 || row < 0 || col >= grid.widthPx || row >= grid.heightPx ? NaN : valueAt(col, row));
}
