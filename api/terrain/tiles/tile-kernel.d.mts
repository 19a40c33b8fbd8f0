/** Types of tile-kernel.mjs (plain JavaScript so worker threads load it without a TypeScript loader). */

export declare const TILE_PX: number;
export declare const SAMPLES_PX: number;

/** One model's share of a tile: a window of its grid and where the tile's pixels fall on it. */
export interface TileLayer {
  /** Row-major `width` × `height` elevations in metres of grid pixels [x0, x0 + width) × [y0, y0 + height); NaN for nodata and off the grid. */
  window: Float32Array | Float64Array;
  x0: number;
  y0: number;
  width: number;
  height: number;
  /** Size of the grid level the window is cut from (continuous coordinates beyond it have no value). */
  gridWidth: number;
  gridHeight: number;
  /** Continuous grid coordinates at lattice nodes, `nodes` × `nodes`, node (n, m) at sample (n·step, m·step). */
  nodeCols: Float64Array;
  nodeRows: Float64Array;
  nodes: number;
  step: number;
}

export interface KernelSun {
  cosZenith: number;
  sinZenith: number;
  cosAzimuth: number;
  sinAzimuth: number;
  zFactor: number;
}

export interface TileTask {
  /** Finest model first: later layers only fill samples the earlier ones left without data. */
  layers: TileLayer[];
  /** Ground size of a tile pixel, m. */
  cellSizeM: number;
  sun: KernelSun;
  /** Tint stops flattened: elevation m, red, green, blue, … ascending by elevation. */
  stops: Float64Array;
  shadowFloor: number;
  shadeGain: number;
  deflateLevel: number;
  /** Whether the tile is finer than the grids under it (smooth: deflate by runs); detailed tiles are Huffman-coded. Default true. */
  magnified?: boolean;
}

/** Only sample rows [rowStart, rowEnd) are filled when given; `into` (SAMPLES_PX² values) is filled instead of a new array. */
export declare function sampleTileElevations(
  layers: readonly TileLayer[],
  rowStart?: number,
  rowEnd?: number,
  into?: Float64Array,
): Float64Array;
export declare function shadeAndTint(
  elevations: Float64Array,
  cellSizeM: number,
  sun: KernelSun,
  stops: Float64Array,
  shadowFloor: number,
  shadeGain: number,
  firstRow?: number,
  endRow?: number,
  /** Written into (a view of its start is returned) instead of a new array. */
  into?: Uint8Array | null,
): Uint8Array;
/** RGB with black transparent (tRNS). */
export declare function encodePng(
  scanlines: Uint8Array,
  width: number,
  height: number,
  deflateLevel?: number,
  magnified?: boolean,
): Uint8Array;
export declare function renderTilePng(task: TileTask): Uint8Array;
/** Rows [firstRow, endRow) of a tile, deflated to join the other parts' (see renderTileRows in tile-kernel.mjs). */
export interface TilePart {
  data: Uint8Array;
  adler: number;
  length: number;
}
export declare function renderTileRows(task: TileTask, firstRow: number, endRow: number, final: boolean): TilePart;
/** The tile's PNG from its parts in order. */
export declare function pngFromParts(parts: readonly TilePart[]): Uint8Array;
/** Compiles the kernel ahead of real tiles (a worker thread calls it when it starts). */
export declare function warmUpKernel(rounds?: number): void;
