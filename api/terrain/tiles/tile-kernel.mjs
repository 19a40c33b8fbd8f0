// The per-pixel work of one terrain map tile: sampling the elevation grid, Horn hillshade, the
// elevation tint and PNG encoding, all in flat typed-array loops without per-pixel objects or
// closures. Plain JavaScript on purpose: the worker threads load it as is (under tsx, vitest and
// the bundled server alike) and the API thread imports the same file.
//
// The API thread prepares a task (tile-renderer.ts): for each model, in the order "finest first",
// a window of its grid (decoded blocks copied side by side, NaN where the grid has no data or
// ends) and a coarse lattice of grid coordinates of the tile's pixels, exact at the nodes.
import { constants, crc32, deflateRawSync, deflateSync } from 'node:zlib';

export const TILE_PX = 256;
/** Samples per side: the tile's pixels plus a one-pixel border for the 3 × 3 Horn window. */
export const SAMPLES_PX = TILE_PX + 2;
/** Bytes per PNG scanline: the filter byte and RGB per pixel. */
const TILE_STRIDE = 1 + TILE_PX * 3;

/**
 * Elevations at the centres of the SAMPLES_PX² sample points, row-major, NaN where no layer has
 * data. Bilinear between the four pixel centres around each point; a neighbour that is nodata or
 * off the grid drops out and the remaining weights are renormalised (the same rule as
 * terrain-grid.ts's bilinearValue).
 */
export function sampleTileElevations(layers, rowStart = 0, rowEnd = SAMPLES_PX, into = new Float64Array(SAMPLES_PX * SAMPLES_PX)) {
  const size = SAMPLES_PX;
  // Only the rows asked for are filled (and read by the shading of those rows).
  const out = into.fill(NaN, rowStart * size, rowEnd * size);
  let missing = size * (rowEnd - rowStart);
  const cellOf = new Int32Array(size);
  const fractionOf = new Float64Array(size);
  for (const layer of layers) {
    if (missing === 0) break;
    const { window, x0, y0, width, height, gridWidth, gridHeight, nodeCols, nodeRows, nodes, step } = layer;
    const rowNodeCols = new Float64Array(nodes);
    const rowNodeRows = new Float64Array(nodes);
    for (let i = 0; i < size; i++) {
      let ni = Math.floor(i / step);
      if (ni > nodes - 2) ni = nodes - 2;
      cellOf[i] = ni;
      fractionOf[i] = i / step - ni;
    }
    for (let j = rowStart; j < rowEnd; j++) {
      // The lattice interpolated down to this row, then along it.
      let nj = Math.floor(j / step);
      if (nj > nodes - 2) nj = nodes - 2;
      const fy = j / step - nj;
      const top = nj * nodes;
      const bottom = top + nodes;
      for (let n = 0; n < nodes; n++) {
        rowNodeCols[n] = nodeCols[top + n] * (1 - fy) + nodeCols[bottom + n] * fy;
        rowNodeRows[n] = nodeRows[top + n] * (1 - fy) + nodeRows[bottom + n] * fy;
      }
      const base = j * size;
      for (let i = 0; i < size; i++) {
        const index = base + i;
        if (out[index] === out[index]) continue;
        const ni = cellOf[i];
        const fx = fractionOf[i];
        const col = rowNodeCols[ni] * (1 - fx) + rowNodeCols[ni + 1] * fx;
        const row = rowNodeRows[ni] * (1 - fx) + rowNodeRows[ni + 1] * fx;
        if (!(col >= 0 && row >= 0 && col <= gridWidth && row <= gridHeight)) continue;
        const px = col - 0.5;
        const py = row - 0.5;
        const c0 = Math.floor(px);
        const r0 = Math.floor(py);
        const wx = c0 - x0;
        const wy = r0 - y0;
        if (wx < 0 || wy < 0 || wx + 1 >= width || wy + 1 >= height) continue;
        const fxp = px - c0;
        const fyp = py - r0;
        const k = wy * width + wx;
        const z00 = window[k];
        const z10 = window[k + 1];
        const z01 = window[k + width];
        const z11 = window[k + width + 1];
        let value;
        if (z00 === z00 && z10 === z10 && z01 === z01 && z11 === z11) {
          value = z00 * (1 - fxp) * (1 - fyp) + z10 * fxp * (1 - fyp) + z01 * (1 - fxp) * fyp + z11 * fxp * fyp;
        } else {
          let sum = 0;
          let weight = 0;
          let w = (1 - fxp) * (1 - fyp);
          if (w > 0 && z00 === z00) {
            sum += z00 * w;
            weight += w;
          }
          w = fxp * (1 - fyp);
          if (w > 0 && z10 === z10) {
            sum += z10 * w;
            weight += w;
          }
          w = (1 - fxp) * fyp;
          if (w > 0 && z01 === z01) {
            sum += z01 * w;
            weight += w;
          }
          w = fxp * fyp;
          if (w > 0 && z11 === z11) {
            sum += z11 * w;
            weight += w;
          }
          if (weight === 0) continue;
          value = sum / weight;
        }
        out[index] = value;
        missing--;
      }
    }
  }
  return out;
}

/**
 * PNG scanlines (filter byte + RGB per row) of the shaded, tinted tile (or of its rows
 * [firstRow, endRow)), written into `into` when given. Per pixel: Horn gradient over the 3 × 3
 * window (a NaN neighbour takes the centre value), illumination = (cos zenith + sin zenith·
 * (q·sin A − p·cos A)) / √(1 + p² + q²) clamped at 0 (as hillshade.ts), light = shadowFloor +
 * shadeGain·illumination, colour = tint byte × light capped at 255 (the tint of the elevation's
 * whole metre, as elevation-tint.ts). Where the elevation is NaN the pixel is black, the PNG's
 * transparent colour (tRNS); a shaded pixel that would come out black is written (0, 0, 1)
 * instead. Every tile is thus RGB, with or without gaps, a quarter less to shade and deflate than
 * RGBA. Rows use PNG's "Sub" filter (difference to the pixel on the left), which makes smooth
 * relief compress well at a fast deflate level.
 */
export function shadeAndTint(elevations, cellSizeM, sun, stops, shadowFloor, shadeGain, firstRow = 0, endRow = TILE_PX, into = null) {
  const length = (endRow - firstRow) * TILE_STRIDE;
  const raw = into === null ? new Uint8Array(length) : into.subarray(0, length);
  const { table, base, top } = tintTable(stops);
  const shading = {
    scale: sun.zFactor / (8 * cellSizeM),
    cosZenith: sun.cosZenith,
    sinZenith: sun.sinZenith,
    cosAzimuth: sun.cosAzimuth,
    sinAzimuth: sun.sinAzimuth,
    shadowFloor,
    shadeGain,
    tint: table,
    tintBase: base,
    tintTop: top,
  };
  // One call per row: a small function that the JIT compiles whole, rather than one long loop
  // compiled mid-run.
  for (let j = firstRow; j < endRow; j++) {
    const out = (j - firstRow) * TILE_STRIDE;
    raw[out] = 1;
    shadeRow(elevations, (j + 1) * SAMPLES_PX + 1, raw, out + 1, shading);
  }
  return raw;
}

/** Horn illumination (0–1) at `centre`; a NaN neighbour takes the centre value e. */
function illuminationAt(elevations, centre, e, s) {
  const size = SAMPLES_PX;
  let av = elevations[centre - size - 1];
  let bv = elevations[centre - size];
  let cv = elevations[centre - size + 1];
  let dv = elevations[centre - 1];
  let fv = elevations[centre + 1];
  let gv = elevations[centre + size - 1];
  let hv = elevations[centre + size];
  let iv = elevations[centre + size + 1];
  if (av !== av) av = e;
  if (bv !== bv) bv = e;
  if (cv !== cv) cv = e;
  if (dv !== dv) dv = e;
  if (fv !== fv) fv = e;
  if (gv !== gv) gv = e;
  if (hv !== hv) hv = e;
  if (iv !== iv) iv = e;
  const p = (cv + 2 * fv + iv - (av + 2 * dv + gv)) * s.scale;
  const q = (gv + 2 * hv + iv - (av + 2 * bv + cv)) * s.scale;
  const illumination = (s.cosZenith + s.sinZenith * (-p * s.cosAzimuth + q * s.sinAzimuth)) / Math.sqrt(1 + p * p + q * q);
  return illumination > 0 ? illumination : 0;
}

function shadeRow(elevations, rowStart, raw, out, s) {
  const { tint, tintBase, tintTop, shadowFloor, shadeGain } = s;
  let lr = 0;
  let lg = 0;
  let lb = 0;
  const rowEnd = rowStart + TILE_PX;
  for (let centre = rowStart; centre < rowEnd; centre++) {
    const e = elevations[centre];
    let r = 0;
    let g = 0;
    let b = 0;
    if (e === e) {
      const light = shadowFloor + shadeGain * illuminationAt(elevations, centre, e, s);
      const above = e - tintBase;
      const m = 3 * (above <= 0 ? 0 : above >= tintTop ? tintTop : above | 0);
      const vr = tint[m] * light;
      const vg = tint[m + 1] * light;
      const vb = tint[m + 2] * light;
      r = vr >= 255 ? 255 : vr | 0;
      g = vg >= 255 ? 255 : vg | 0;
      b = vb >= 255 ? 255 : vb | 0;
      // Black is the transparent colour: a shaded pixel never takes it.
      if ((r | g | b) === 0) b = 1;
    }
    raw[out] = r - lr;
    raw[out + 1] = g - lg;
    raw[out + 2] = b - lb;
    out += 3;
    lr = r;
    lg = g;
    lb = b;
  }
}

let lastStops = null;
let lastTable = null;

/**
 * The tint of every whole metre from the lowest stop to the highest (RGB bytes, linear between the
 * stops and truncated, exactly as elevation-tint.ts computes them), for the last stops seen: one
 * lookup per pixel instead of a search and three interpolations.
 */
function tintTable(stops) {
  if (lastStops !== null && lastStops.length === stops.length && lastStops.every((value, k) => value === stops[k])) return lastTable;
  const count = stops.length >> 2;
  const base = Math.floor(stops[0]);
  const top = Math.ceil(stops[4 * (count - 1)]) - base;
  const table = new Uint8Array((top + 1) * 3);
  for (let m = 0; m <= top; m++) {
    const e = base + m;
    // Stops l and k around e (one stop alone: its colour throughout).
    let k = Math.min(1, count - 1);
    while (k < count - 1 && e > stops[4 * k]) k++;
    const l = Math.max(0, k - 1);
    let t = k === l ? 0 : (e - stops[4 * l]) / (stops[4 * k] - stops[4 * l]);
    if (t < 0) t = 0;
    else if (t > 1) t = 1;
    for (let c = 1; c <= 3; c++) table[3 * m + c - 1] = stops[4 * l + c] + (stops[4 * k + c] - stops[4 * l + c]) * t;
  }
  lastStops = Float64Array.from(stops);
  lastTable = { table, base, top };
  return lastTable;
}

/**
 * Deflate settings of a tile. Magnified tiles (finer than the grid under them: smooth, with long
 * runs in the Sub-filtered rows) look for runs only, the fastest matching and a tenth smaller than
 * the fastest level there. Other tiles carry the grid's full detail, where matches are rare: they
 * are Huffman-coded only, about a quarter faster at a sixth larger.
 */
function deflateOptions(task) {
  return { level: task.deflateLevel, memLevel: 9, strategy: task.magnified === false ? constants.Z_HUFFMAN_ONLY : constants.Z_RLE };
}

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/**
 * An RGB PNG (8 bits per channel) from ready scanlines, black transparent: signature, IHDR, tRNS,
 * one IDAT, IEND. The result owns its whole ArrayBuffer, so a worker can hand it over without a copy.
 */
export function encodePng(scanlines, width, height, deflateLevel = 1, magnified = true) {
  return pngFromIdat(deflateSync(scanlines, deflateOptions({ deflateLevel, magnified })), width, height);
}

function pngFromIdat(idat, width, height) {
  const total = PNG_SIGNATURE.length + (12 + 13) + (12 + 6) + (12 + idat.length) + 12;
  const png = new Uint8Array(total);
  const view = new DataView(png.buffer);
  png.set(PNG_SIGNATURE, 0);
  let offset = PNG_SIGNATURE.length;
  const chunk = (type, length, fill) => {
    view.setUint32(offset, length);
    for (let k = 0; k < 4; k++) png[offset + 4 + k] = type.charCodeAt(k);
    fill(offset + 8);
    view.setUint32(offset + 8 + length, crc32(png.subarray(offset + 4, offset + 8 + length)));
    offset += 12 + length;
  };
  chunk('IHDR', 13, (at) => {
    view.setUint32(at, width);
    view.setUint32(at + 4, height);
    png[at + 8] = 8; // bit depth
    png[at + 9] = 2; // colour type: RGB
    png[at + 10] = 0; // deflate
    png[at + 11] = 0; // adaptive filtering (per-row filter bytes)
    png[at + 12] = 0; // no interlace
  });
  // The transparent colour, black (16-bit samples, as tRNS stores them for RGB): zero already.
  chunk('tRNS', 6, () => undefined);
  chunk('IDAT', idat.length, (at) => png.set(idat, at));
  chunk('IEND', 0, () => undefined);
  return png;
}

/**
 * Tile rows [firstRow, endRow) on their own, for rendering a tile's parts on several threads:
 * their scanlines as raw deflate data (ending on a byte boundary, not final unless `final`, so
 * the parts concatenate into one stream), and the scanlines' Adler-32 and length. The final part
 * is deflated with zlib's wrapper, whose trailer carries the Adler-32 zlib computed, rather than
 * summing the bytes again here.
 */
export function renderTileRows(task, firstRow, endRow, final) {
  task = uniformTask(task);
  const { elevations: scratchElevations, scanlines: scratchScanlines } = scratch();
  const elevations = sampleTileElevations(task.layers, firstRow, endRow + 2, scratchElevations);
  const scanlines = shadeAndTint(
    elevations,
    task.cellSizeM,
    task.sun,
    task.stops,
    task.shadowFloor,
    task.shadeGain,
    firstRow,
    endRow,
    scratchScanlines,
  );
  const options = deflateOptions(task);
  if (final) {
    const wrapped = deflateSync(scanlines, options);
    const adler = wrapped.readUInt32BE(wrapped.length - 4);
    const data = new Uint8Array(wrapped.buffer, wrapped.byteOffset + 2, wrapped.byteLength - 6);
    return { data, adler, length: scanlines.length };
  }
  const deflated = deflateRawSync(scanlines, { ...options, finishFlush: constants.Z_SYNC_FLUSH });
  const data = new Uint8Array(deflated.buffer, deflated.byteOffset, deflated.byteLength);
  return { data, adler: adler32(scanlines), length: scanlines.length };
}

/** The PNG of a whole tile from its row parts in order (renderTileRows, the last one final). */
export function pngFromParts(parts) {
  let size = 2 + 4;
  for (const part of parts) size += part.data.length;
  const idat = new Uint8Array(size);
  idat[0] = 0x78; // zlib header: deflate, 32 KB window
  idat[1] = 0x01; // no preset dictionary, fastest (header check bits)
  let offset = 2;
  let adler = 1;
  for (const part of parts) {
    idat.set(part.data, offset);
    offset += part.data.length;
    adler = adler32Combine(adler, part.adler, part.length);
  }
  new DataView(idat.buffer).setUint32(offset, adler);
  return pngFromIdat(idat, TILE_PX, TILE_PX);
}

const ADLER_BASE = 65521;

function adler32(bytes) {
  let a = 1;
  let b = 0;
  const n = bytes.length;
  for (let start = 0; start < n;) {
    // 5552 bytes at most between reductions keep the sums below 2³².
    const end = Math.min(n, start + 5552);
    for (let k = start; k < end; k++) {
      a += bytes[k];
      b += a;
    }
    a %= ADLER_BASE;
    b %= ADLER_BASE;
    start = end;
  }
  return ((b << 16) | a) >>> 0;
}

/** Adler-32 of two byte runs one after the other, from each run's checksum and the second's length (as zlib's adler32_combine). */
function adler32Combine(adler1, adler2, length2) {
  const remainder = length2 % ADLER_BASE;
  let sum1 = adler1 & 0xffff;
  let sum2 = (remainder * sum1) % ADLER_BASE;
  sum1 += (adler2 & 0xffff) + ADLER_BASE - 1;
  sum2 += (adler1 >>> 16) + (adler2 >>> 16) + ADLER_BASE - remainder;
  if (sum1 >= ADLER_BASE) sum1 -= ADLER_BASE;
  if (sum1 >= ADLER_BASE) sum1 -= ADLER_BASE;
  if (sum2 >= ADLER_BASE * 2) sum2 -= ADLER_BASE * 2;
  if (sum2 >= ADLER_BASE) sum2 -= ADLER_BASE;
  return ((sum2 << 16) | sum1) >>> 0;
}

/**
 * The task with its objects rebuilt as literals of one shape, whatever built them (a structured
 * clone from the API thread, the warm-up): the kernel's compiled code then sees the shapes it was
 * warmed up with rather than deoptimising on the first real tiles.
 */
function uniformTask(task) {
  const { sun } = task;
  return {
    layers: task.layers.map((layer) => ({
      window: layer.window,
      x0: layer.x0,
      y0: layer.y0,
      width: layer.width,
      height: layer.height,
      gridWidth: layer.gridWidth,
      gridHeight: layer.gridHeight,
      nodeCols: layer.nodeCols,
      nodeRows: layer.nodeRows,
      nodes: layer.nodes,
      step: layer.step,
    })),
    cellSizeM: task.cellSizeM,
    sun: {
      cosZenith: sun.cosZenith,
      sinZenith: sun.sinZenith,
      cosAzimuth: sun.cosAzimuth,
      sinAzimuth: sun.sinAzimuth,
      zFactor: sun.zFactor,
    },
    stops: task.stops,
    shadowFloor: task.shadowFloor,
    shadeGain: task.shadeGain,
    deflateLevel: task.deflateLevel,
    magnified: task.magnified !== false,
  };
}

let scratchArrays = null;

/**
 * This thread's working arrays for a tile (its elevations and its scanlines), reused from tile to
 * tile: fresh ones for every tile, three quarters of a megabyte, kept the garbage collector busy
 * with pauses of several milliseconds. The scanlines are consumed (deflated) before the next tile.
 */
function scratch() {
  scratchArrays ??= { elevations: new Float64Array(SAMPLES_PX * SAMPLES_PX), scanlines: new Uint8Array(TILE_PX * TILE_STRIDE) };
  return scratchArrays;
}

/** The whole tile: sampling, hillshade and tint, PNG. */
export function renderTilePng(task) {
  task = uniformTask(task);
  const { elevations: scratchElevations, scanlines: scratchScanlines } = scratch();
  const elevations = sampleTileElevations(task.layers, 0, SAMPLES_PX, scratchElevations);
  const scanlines = shadeAndTint(
    elevations,
    task.cellSizeM,
    task.sun,
    task.stops,
    task.shadowFloor,
    task.shadeGain,
    0,
    TILE_PX,
    scratchScanlines,
  );
  return encodePng(scanlines, TILE_PX, TILE_PX, task.deflateLevel, task.magnified);
}

/**
 * Runs the kernel on a synthetic tile a few times so the JIT has compiled it before real tiles
 * arrive: the first calls of a fresh thread otherwise take 3–5× longer. Every third tile is partly
 * without data (off the grid and nodata inside), so the transparent pixels, the renormalised
 * interpolation and the NaN neighbours of the hillshade are exercised; rounds alternate the two
 * deflate settings, and each renders the tile whole and in two halves (as split over threads).
 */
export function warmUpKernel(rounds = 12) {
  const width = 200;
  const window = new Float32Array(width * width);
  for (let k = 0; k < window.length; k++) window[k] = 800 + 600 * Math.sin(k / 911) + (k % width);
  // Partly without data: off the window on the left (x0 below) and nodata inside (a NaN square).
  const holed = window.slice();
  for (let r = 80; r < 120; r++) holed.fill(NaN, r * width + 100, r * width + 140);
  const shared = (values) => {
    const copy = new Float32Array(new SharedArrayBuffer(values.byteLength));
    copy.set(values);
    return copy;
  };
  const sharedWindow = shared(window);
  const sharedHoled = shared(holed);
  const nodes = Math.ceil((SAMPLES_PX - 1) / 16) + 1;
  const nodeCols = new Float64Array(nodes * nodes);
  const nodeRows = new Float64Array(nodes * nodes);
  for (let n = 0; n < nodeCols.length; n++) {
    nodeCols[n] = 3 + (n % nodes) * 11.7;
    nodeRows[n] = 3 + Math.floor(n / nodes) * 11.7;
  }
  const sun = { cosZenith: Math.SQRT1_2, sinZenith: Math.SQRT1_2, cosAzimuth: -Math.SQRT1_2, sinAzimuth: -Math.SQRT1_2, zFactor: 1 };
  const stops = Float64Array.from([0, 90, 130, 100, 1000, 180, 180, 120, 2000, 240, 240, 240]);
  for (let round = 0; round < rounds; round++) {
    const partial = round % 3 === 2;
    const layer = {
      window: partial ? holed : window,
      x0: partial ? 40 : 0,
      y0: 0,
      width,
      height: width,
      gridWidth: 10_000,
      gridHeight: 10_000,
      nodeCols,
      nodeRows,
      nodes,
      step: 16,
    };
    const task = {
      layers: [layer],
      cellSizeM: 10,
      sun,
      stops,
      shadowFloor: 0.3,
      shadeGain: 0.8,
      deflateLevel: 1,
      magnified: round % 2 === 0,
    };
    renderTilePng(task);
    // A tile split over two threads: both halves, reading shared memory as the pool's threads do.
    const split = { ...task, layers: [{ ...layer, window: partial ? sharedHoled : sharedWindow }] };
    pngFromParts([renderTileRows(split, 0, TILE_PX / 2, false), renderTileRows(split, TILE_PX / 2, TILE_PX, true)]);
  }
}
