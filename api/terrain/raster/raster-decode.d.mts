/** Types of raster-decode.mjs (plain JavaScript so worker threads load it without a TypeScript loader). */

export interface DecodeWindowTask {
  path: string;
  /** [x0, y0, x1, y1] pixels of the file's first image. */
  window: [number, number, number, number];
  /** The file's nodata value (as stored: a Float32 file's rounded to single precision), or null. */
  nodata: number | null;
  verticalScaleToM: number;
  /** Float64Array (Int32 and Float64 files) rather than Float32Array. */
  wide: boolean;
  into?: ArrayBuffer;
}

export declare function decodeWindow(task: DecodeWindowTask): Promise<Float32Array | Float64Array>;
/** Closes this thread's handles on the file (after the model is deleted). */
export declare function forgetFile(path: string): void;
