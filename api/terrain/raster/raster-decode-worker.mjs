// Worker thread (piscina) for the terrain's CPU work off the API's event loop: decoding windows
// of terrain GeoTIFFs (default task, raster-decode.mjs) and rendering map tiles (task
// `renderTile`). Plain JavaScript on purpose: it loads the same way under tsx, vitest and the
// bundled server.
//
// Decode task: { path, window: [x0, y0, x1, y1], nodata, verticalScaleToM, wide, into? }; the
// result (see raster-decode.mjs) goes back transferred.
// renderTile task: a TileTask (tile-kernel.d.mts); result: the PNG bytes (Uint8Array).
// renderTileRows task: { task, firstRow, endRow }; result: those rows' pixel codes (Uint32Array).
// encodeTile task: { codes, colours } (a whole tile's pixel codes, transferred, and the task's
// stops, shadowFloor and shadeGain); result: the PNG bytes.
import Piscina from 'piscina';
import { decodeWindow as decode, forgetFile } from './raster-decode.mjs';
import { encodeTileCodes, renderTilePng, renderTileRows as renderTileRowsOf, TILE_PX, warmUpKernel } from '../tiles/tile-kernel.mjs';

warmUpKernel();

export default async function decodeWindow(task) {
  return Piscina.move(await decode(task));
}

/** One map tile: the windows arrive transferred, the PNG goes back transferred. */
export function renderTile(task) {
  return Piscina.move(renderTilePng(task));
}

/** Some rows of a map tile (a tile split over threads): { task, firstRow, endRow }; the pixel codes go back transferred. */
export function renderTileRows({ task, firstRow, endRow }) {
  return Piscina.move(renderTileRowsOf(task, firstRow, endRow));
}

/** The PNG of a tile whose rows were rendered in parts: { codes, colours }, the joined pixel codes. */
export function encodeTile({ codes, colours }) {
  return Piscina.move(encodeTileCodes(codes, TILE_PX, TILE_PX, colours));
}

/** Drops cached file handles (after a model is deleted and its file removed). */
export function forget({ path }) {
  forgetFile(path);
  return true;
}
