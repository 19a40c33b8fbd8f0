/**
 * Slope and hillshade by Horn's method (Horn 1981), on a row-major grid whose rows run north to
 * south. For the 3 × 3 window
 *
 *   a b c
 *   d e f
 *   g h i
 *
 *   dz/dx = ((c + 2f + i) − (a + 2d + g)) / (8·Δx)      (east positive)
 *   dz/dy = ((g + 2h + i) − (a + 2b + c)) / (8·Δy)      (south positive)
 *
 * (shared/engine/README.md §6.5; the same weights as GDAL's default slope algorithm.) Hillshade is the
 * cosine of the angle between the surface normal and the sun:
 *
 *   shade = cos(zenith)·cos(slope) + sin(zenith)·sin(slope)·cos(azimuth_math − aspect)
 *
 * with aspect = atan2(dz/dy, −dz/dx) and azimuth_math = 90° − azimuth (compass → maths angle) —
 * the textbook formulation (Burrough & McDonnell, "Principles of GIS", from memory). It is written
 * below without trigonometry per pixel: with p = z·dz/dx, q = z·dz/dy,
 * shade = (cos zenith + sin zenith·(q·sin A − p·cos A)) / √(1 + p² + q²), A = azimuth_math + 180°
 * folded in as the signs.
 *
 * Map tiles do the same arithmetic in one typed-array loop in tile-kernel.mjs (checked pixel for
 * pixel against these functions, and against gdaldem, in tile-kernel.spec.ts).
 */

/** Sun from the north-west, 45° above the horizon: the cartographic convention (light from the top left). */
export const DEFAULT_SUN_AZIMUTH_DEG = 315;
export const DEFAULT_SUN_ALTITUDE_DEG = 45;

export interface HillshadeOptions {
  /** Compass direction the light comes from, degrees clockwise from north. */
  azimuthDeg?: number;
  /** Sun height above the horizon, degrees. */
  altitudeDeg?: number;
  /** Vertical exaggeration. */
  zFactor?: number;
}

export interface HornGradient {
  /** dz/dx, east positive (m per m). */
  dzdx: number;
  /** dz/dy, south positive (m per m). */
  dzdy: number;
}

/**
 * Horn gradient at (col, row) of `grid`. Neighbours that are NaN or off the grid take the centre
 * value (so edges and nodata borders still shade); NaN when the centre itself is NaN.
 */
export function hornGradient(
  grid: ArrayLike<number>,
  widthPx: number,
  heightPx: number,
  col: number,
  row: number,
  cellSizeXM: number,
  cellSizeYM: number,
): HornGradient {
  const e = grid[row * widthPx + col]!;
  if (e !== e) return { dzdx: NaN, dzdy: NaN };
  const at = (c: number, r: number) => {
    if (c < 0 || r < 0 || c >= widthPx || r >= heightPx) return e;
    const v = grid[r * widthPx + c]!;
    return v === v ? v : e;
  };
  const a = at(col - 1, row - 1);
  const b = at(col, row - 1);
  const c = at(col + 1, row - 1);
  const d = at(col - 1, row);
  const f = at(col + 1, row);
  const g = at(col - 1, row + 1);
  const h = at(col, row + 1);
  const i = at(col + 1, row + 1);
  return {
    dzdx: (c + 2 * f + i - (a + 2 * d + g)) / (8 * cellSizeXM),
    dzdy: (g + 2 * h + i - (a + 2 * b + c)) / (8 * cellSizeYM),
  };
}

/** Steepest slope in degrees from a Horn gradient. */
export function slopeDeg({ dzdx, dzdy }: HornGradient, zFactor = 1): number {
  return (Math.atan(zFactor * Math.hypot(dzdx, dzdy)) * 180) / Math.PI;
}

/** Precomputed sun terms for `shade()`. */
export interface SunTerms {
  cosZenith: number;
  sinZenith: number;
  cosAzimuth: number;
  sinAzimuth: number;
  zFactor: number;
}

export function sunTerms(options: HillshadeOptions = {}): SunTerms {
  const azimuthDeg = options.azimuthDeg ?? DEFAULT_SUN_AZIMUTH_DEG;
  const altitudeDeg = options.altitudeDeg ?? DEFAULT_SUN_ALTITUDE_DEG;
  const zenithRad = ((90 - altitudeDeg) * Math.PI) / 180;
  const azimuthMathRad = ((90 - azimuthDeg) * Math.PI) / 180;
  return {
    cosZenith: Math.cos(zenithRad),
    sinZenith: Math.sin(zenithRad),
    cosAzimuth: Math.cos(azimuthMathRad),
    sinAzimuth: Math.sin(azimuthMathRad),
    zFactor: options.zFactor ?? 1,
  };
}

/**
 * Illumination 0–1 (0 in full shadow) for a Horn gradient. The maths-angle light vector is
 * (cos A, sin A) east/north; the surface normal is (−p, +q) east/north because dz/dy grows
 * southwards.
 */
export function shade({ dzdx, dzdy }: HornGradient, sun: SunTerms): number {
  const p = sun.zFactor * dzdx;
  const q = sun.zFactor * dzdy;
  const value = (sun.cosZenith + sun.sinZenith * (-p * sun.cosAzimuth + q * sun.sinAzimuth)) / Math.sqrt(1 + p * p + q * q);
  return value > 0 ? value : 0;
}

/** Shade as an 8-bit grey level the way common GIS writes it: 1–255, 0 kept for nodata. */
export function shadeByte(illumination: number): number {
  return illumination <= 0 ? 1 : 1 + 254 * illumination;
}
