/** Types of tile-kernel.mjs (plain JavaScript so worker threads load it without a TypeScript loader). */

export declare const TILE_PX: number;
export declare const SAMPLES_PX: number;
/** How tiles are encoded: part of the tile catalogue's version. */
export declare const TILE_ENCODING: string;
/** Most tint classes in a tile's palette (the 255 opaque entries are shared among them as shade levels). */
export declare const TINT_CLASSES: number;
/** A pixel's code where no model has data; otherwise (tint metre << 8) | ⌊256 · illumination⌋. */
export declare const NO_DATA_CODE: number;

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

/** What turns pixel codes into colours: the task's tint stops and light. */
export type TileColours = Pick<TileTask, 'stops' | 'shadowFloor' | 'shadeGain'>;

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
/** Pixel codes (tint metre, illumination) of rows [firstRow, endRow); NO_DATA_CODE where the elevation is NaN. */
export declare function shadeCodes(
  elevations: Float64Array,
  cellSizeM: number,
  sun: KernelSun,
  stops: Float64Array,
  firstRow?: number,
  endRow?: number,
  /** Written into (a view of its start is returned) instead of a new array. */
  into?: Uint32Array | null,
): Uint32Array;
/** Palette PNG of pixel codes: tint classes × shade levels (at most 255 entries) and entry 0 transparent where NO_DATA_CODE. */
export declare function encodeTileCodes(codes: Uint32Array, width: number, height: number, colours: TileColours): Uint8Array;
export declare function renderTilePng(task: TileTask): Uint8Array;
/** Pixel codes of rows [firstRow, endRow) of a tile (NO_DATA_CODE where there is no data), for rendering a tile in parts. */
export declare function renderTileRows(task: TileTask, firstRow: number, endRow: number): Uint32Array;
/** A whole tile's pixel codes from its row parts in order. */
export declare function joinParts(parts: readonly Uint32Array[]): Uint32Array;
/** The tile's PNG from its parts in order and its task's colours. */
export declare function pngFromParts(parts: readonly Uint32Array[], colours: TileColours): Uint8Array;
/** Compiles the kernel ahead of real tiles (a worker thread calls it when it starts). */
export declare function warmUpKernel(rounds?: number): void;
