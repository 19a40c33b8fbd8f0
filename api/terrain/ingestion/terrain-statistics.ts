/**
 * Running statistics of an elevation grid, fed one band of rows at a time so memory stays
 * bounded whatever the grid size: min/max, nodata share and single-pixel spikes.
 */

/** Elevations outside this range are implausible on Earth's surface (common practice). */
export const PLAUSIBLE_MIN_ELEVATION_M = -500;
export const PLAUSIBLE_MAX_ELEVATION_M = 9000;
/** Spike positions kept for the quality notes. */
const SPIKES_LISTED = 5;

export interface TerrainStatistics {
  minElevationM: number | null;
  maxElevationM: number | null;
  nodataShare: number;
  spikeCount: number;
  /** Pixel positions (col, row) of the first spikes found. */
  spikeSamples: Array<[number, number]>;
  implausibleCount: number;
}

/**
 * A spike is a pixel that stands above (or below) all eight neighbours by more than the threshold:
 * a single-pixel pit or pinnacle, usually a sensor artefact. Scaled with resolution so that a
 * steep but real 3 × 3 neighbourhood (a 56° slope everywhere) does not count (from memory:
 * spike filters in DEM cleaning use a fixed height jump of tens of metres).
 */
export function spikeThresholdM(resolutionM: number): number {
  return Math.max(30, 1.5 * resolutionM);
}

export class StatisticsAccumulator {
  private min = Infinity;
  private max = -Infinity;
  private nodata = 0;
  private total = 0;
  private spikes = 0;
  private implausible = 0;
  private readonly spikeSamples: Array<[number, number]> = [];

  constructor(
    private readonly widthPx: number,
    private readonly spikeThreshold: number,
  ) {}

  /**
   * Adds rows [firstRow, firstRow + rowCount) of the grid. `band` holds those rows plus, where
   * they exist, one row above (`haloAbove`) and one below (`haloBelow`) for the spike test.
   */
  addRows(band: Float32Array | Float64Array, firstRow: number, rowCount: number, haloAbove: boolean, haloBelow: boolean): void {
    const width = this.widthPx;
    const offset = haloAbove ? 1 : 0;
    const bandRows = rowCount + offset + (haloBelow ? 1 : 0);
    const threshold = this.spikeThreshold;
    for (let r = 0; r < rowCount; r++) {
      const bandRow = r + offset;
      const base = bandRow * width;
      for (let c = 0; c < width; c++) {
        const z = band[base + c]!;
        this.total++;
        if (z !== z) {
          this.nodata++;
          continue;
        }
        if (z < this.min) this.min = z;
        if (z > this.max) this.max = z;
        if (z < PLAUSIBLE_MIN_ELEVATION_M || z > PLAUSIBLE_MAX_ELEVATION_M) this.implausible++;
        if (bandRow === 0 || bandRow === bandRows - 1 || c === 0 || c === width - 1) continue;
        let above = true;
        let below = true;
        for (let dr = -1; dr <= 1 && (above || below); dr++) {
          const rowBase = (bandRow + dr) * width + c;
          for (let dc = -1; dc <= 1; dc++) {
            if (dr === 0 && dc === 0) continue;
            const n = band[rowBase + dc]!;
            if (n !== n) {
              above = below = false;
              break;
            }
            if (z - n <= threshold) above = false;
            if (n - z <= threshold) below = false;
          }
        }
        if (above || below) {
          this.spikes++;
          if (this.spikeSamples.length < SPIKES_LISTED) this.spikeSamples.push([c, firstRow + r]);
        }
      }
    }
  }

  result(): TerrainStatistics {
    const hasData = this.min <= this.max;
    return {
      minElevationM: hasData ? this.min : null,
      maxElevationM: hasData ? this.max : null,
      nodataShare: this.total > 0 ? this.nodata / this.total : 0,
      spikeCount: this.spikes,
      spikeSamples: this.spikeSamples,
      implausibleCount: this.implausible,
    };
  }
}
