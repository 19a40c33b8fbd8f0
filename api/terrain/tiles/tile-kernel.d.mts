/** Types of tile-kernel.mjs (plain JavaScript so worker threads load it without a TypeScript loader). */

export declare const TILE_PX: number;
export declare const SAMPLES_PX: number;
/** How tiles are encoded: part of the tile catalogue's version. */
export declare const TILE_ENCODING: string;

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
/** Palette PNG (at most 256 colours, entry 0 transparent) of RGB pixels, black transparent. */
export declare function encodePalettePng(rgb: Uint8Array, width: number, height: number): Uint8Array;
export declare function renderTilePng(task: TileTask): Uint8Array;
/** RGB pixels of rows [firstRow, endRow) of a tile (black where there is no data), for rendering a tile in parts. */
export declare function renderTileRows(task: TileTask, firstRow: number, endRow: number): Uint8Array;
/** A whole tile's RGB pixels from its row parts in order. */
export declare function joinParts(parts: readonly Uint8Array[]): Uint8Array;
/** The tile's PNG from its parts in order. */
export declare function pngFromParts(parts: readonly Uint8Array[]): Uint8Array;
/** Compiles the kernel ahead of real tiles (a worker thread calls it when it starts). */
export declare function warmUpKernel(rounds?: number): void;
