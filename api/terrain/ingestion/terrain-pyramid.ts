import { open, type FileHandle } from 'node:fs/promises';
import { join } from 'node:path';
import type { TerrainOverviewLevel } from '../../db/schema/terrain';
import { OVERVIEW_BLOCK_PX } from '../raster/block-store';

/**
 * Builds the reduced pyramid (2×, 4×, 8× … overviews) of a grid from rows streamed top to bottom,
 * holding at most one block row per level in memory. Each level halves the previous one by
 * averaging 2 × 2 pixels, nodata (NaN) excluded; a 2 × 2 group without data stays NaN.
 * Files are raw little-endian Float32 in 256 × 256 blocks, row-major, edges padded with NaN, so a
 * tile renderer reads one block with one positioned read.
 */
export class PyramidBuilder {
  private readonly levels: LevelWriter[] = [];

  private constructor(
    levels: LevelWriter[],
    private readonly sourceWidthPx: number,
  ) {
    this.levels = levels;
  }

  /** Levels until the whole grid fits one block (none for a grid that already does). */
  static async create(dir: string, widthPx: number, heightPx: number): Promise<PyramidBuilder> {
    const levels: LevelWriter[] = [];
    let width = widthPx;
    let height = heightPx;
    let factor = 1;
    while (width > OVERVIEW_BLOCK_PX || height > OVERVIEW_BLOCK_PX) {
      factor *= 2;
      width = Math.ceil(width / 2);
      height = Math.ceil(height / 2);
      const fileName = `overview-${factor}.f32`;
      levels.push(new LevelWriter({ factor, widthPx: width, heightPx: height, fileName }, await open(join(dir, fileName), 'w')));
    }
    return new PyramidBuilder(levels, widthPx);
  }

  get overviewLevels(): TerrainOverviewLevel[] {
    return this.levels.map((level) => level.level);
  }

  /** Next rows of the full-resolution grid (row-major, `rowCount` × source width). */
  async addRows(rows: Float32Array | Float64Array, rowCount: number): Promise<void> {
    await this.push(0, rows, rowCount);
  }

  async finish(): Promise<TerrainOverviewLevel[]> {
    for (let i = 0; i < this.levels.length; i++) {
      const carried = this.levels[i]!.takeCarry();
      if (carried) await this.push(i, carried, 1, true);
      await this.levels[i]!.flush(true);
    }
    for (const level of this.levels) await level.close();
    return this.overviewLevels;
  }

  async abort(): Promise<void> {
    for (const level of this.levels) await level.close().catch(() => undefined);
  }

  /** Halves `rows` (of level i−1, or the source for i = 0) into level i and cascades. */
  private async push(index: number, rows: Float32Array | Float64Array, rowCount: number, isLast = false): Promise<void> {
    const target = this.levels[index];
    if (!target) return;
    const sourceWidth = index === 0 ? this.sourceWidthPx : this.levels[index - 1]!.level.widthPx;
    const width = target.level.widthPx;
    const paired = target.pairWithCarry(rows, rowCount, sourceWidth, isLast);
    if (!paired) return;
    const { data, pairs } = paired;
    const out = target.halvedRows(pairs);
    const srcWidth = data.length / (pairs * 2);
    for (let p = 0; p < pairs; p++) {
      const top = 2 * p * srcWidth;
      const bottom = top + srcWidth;
      for (let c = 0; c < width; c++) {
        const c0 = 2 * c;
        const c1 = c0 + 1 < srcWidth ? c0 + 1 : c0;
        let sum = 0;
        let count = 0;
        const a = data[top + c0]!;
        const b = c1 !== c0 ? data[top + c1]! : NaN;
        const d = data[bottom + c0]!;
        const e = c1 !== c0 ? data[bottom + c1]! : NaN;
        if (a === a) {
          sum += a;
          count++;
        }
        if (b === b) {
          sum += b;
          count++;
        }
        if (d === d) {
          sum += d;
          count++;
        }
        if (e === e) {
          sum += e;
          count++;
        }
        out[p * width + c] = count > 0 ? sum / count : NaN;
      }
    }
    const completed = await target.append(out, pairs);
    if (completed) await this.push(index + 1, completed.rows, completed.rowCount);
  }
}

class LevelWriter {
  private pending: Float32Array;
  private pendingRows = 0;
  private blockRowIndex = 0;
  private carry: Float32Array | Float64Array | null = null;
  private readonly across: number;
  /** Reused between bands (a scan of a large grid would otherwise leave tens of MB per band to the GC). */
  private halved = new Float32Array(0);
  private blockRow: Float32Array | null = null;

  constructor(
    readonly level: TerrainOverviewLevel,
    private readonly file: FileHandle,
  ) {
    this.across = Math.ceil(level.widthPx / OVERVIEW_BLOCK_PX);
    this.pending = new Float32Array(OVERVIEW_BLOCK_PX * level.widthPx);
  }

  /**
   * Joins a carried odd row with new rows and returns whole row pairs. At the end (isLast) an odd
   * row is paired with an all-NaN row, which averaging ignores.
   */
  pairWithCarry(
    rows: Float32Array | Float64Array,
    rowCount: number,
    sourceWidth: number,
    isLast: boolean,
  ): { data: Float32Array | Float64Array; pairs: number } | null {
    let data = rows.subarray(0, rowCount * sourceWidth);
    let count = rowCount;
    if (this.carry) {
      const joined = new Float32Array((count + 1) * sourceWidth);
      joined.set(this.carry, 0);
      joined.set(data, sourceWidth);
      data = joined;
      count += 1;
      this.carry = null;
    }
    if (count % 2 === 1) {
      if (isLast) {
        const padded = new Float32Array((count + 1) * sourceWidth).fill(NaN);
        padded.set(data, 0);
        data = padded;
        count += 1;
      } else {
        this.carry = data.slice((count - 1) * sourceWidth, count * sourceWidth);
        data = data.subarray(0, (count - 1) * sourceWidth);
        count -= 1;
      }
    }
    return count > 0 ? { data, pairs: count / 2 } : null;
  }

  /** Room for `pairs` rows of this level, valid until the next call. */
  halvedRows(pairs: number): Float32Array {
    const length = pairs * this.level.widthPx;
    if (this.halved.length < length) this.halved = new Float32Array(length);
    return this.halved.subarray(0, length);
  }

  takeCarry(): Float32Array | Float64Array | null {
    const carried = this.carry;
    this.carry = null;
    return carried;
  }

  /** Adds rows; returns them again for the next level once written. */
  async append(rows: Float32Array, rowCount: number): Promise<{ rows: Float32Array; rowCount: number } | null> {
    const width = this.level.widthPx;
    let offset = 0;
    while (offset < rowCount) {
      const take = Math.min(rowCount - offset, OVERVIEW_BLOCK_PX - this.pendingRows);
      this.pending.set(rows.subarray(offset * width, (offset + take) * width), this.pendingRows * width);
      this.pendingRows += take;
      offset += take;
      if (this.pendingRows === OVERVIEW_BLOCK_PX) await this.flush(false);
    }
    return { rows, rowCount };
  }

  /** Writes the pending block row (padding a last partial one with NaN). */
  async flush(isLast: boolean): Promise<void> {
    if (this.pendingRows === 0 || (!isLast && this.pendingRows < OVERVIEW_BLOCK_PX)) return;
    const width = this.level.widthPx;
    const blockValues = OVERVIEW_BLOCK_PX * OVERVIEW_BLOCK_PX;
    this.blockRow ??= new Float32Array(this.across * blockValues);
    const out = this.blockRow.fill(NaN);
    for (let r = 0; r < this.pendingRows; r++) {
      for (let bx = 0; bx < this.across; bx++) {
        const c0 = bx * OVERVIEW_BLOCK_PX;
        const c1 = Math.min(c0 + OVERVIEW_BLOCK_PX, width);
        out.set(this.pending.subarray(r * width + c0, r * width + c1), bx * blockValues + r * OVERVIEW_BLOCK_PX);
      }
    }
    const bytes = Buffer.from(out.buffer, out.byteOffset, out.byteLength);
    await this.file.write(bytes, 0, bytes.length, this.blockRowIndex * bytes.length);
    this.blockRowIndex++;
    this.pendingRows = 0;
  }

  async close(): Promise<void> {
    await this.file.close();
  }
}
