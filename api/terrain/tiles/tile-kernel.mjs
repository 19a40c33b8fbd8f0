// The per-pixel work of one terrain map tile: sampling the elevation grid, Horn hillshade, the
// elevation tint and PNG encoding (a palette of at most 256 colours), all in flat typed-array
// loops without per-pixel objects or closures. Plain JavaScript on purpose: the worker threads load it as is (under tsx, vitest and
// the bundled server alike) and the API thread imports the same file.
//
// The API thread prepares a task (tile-renderer.ts): for each model, in the order "finest first",
// a window of its grid (decoded blocks copied side by side, NaN where the grid has no data or
// ends) and a coarse lattice of grid coordinates of the tile's pixels, exact at the nodes.
import { crc32, deflateSync } from 'node:zlib';
import UPNG from 'upng-js';

export const TILE_PX = 256;
/** Samples per side: the tile's pixels plus a one-pixel border for the 3 × 3 Horn window. */
export const SAMPLES_PX = TILE_PX + 2;
/** Bytes per row of a tile's pixels (RGB). */
const TILE_STRIDE = TILE_PX * 3;
/**
 * Names how tiles are encoded; part of the tile catalogue's version (terrain-runtime.ts), so
 * tiles cached on disk or in browsers in an earlier encoding are never served again.
 */
export const TILE_ENCODING = 'palette-256';
/** Colours of a tile's palette besides the transparent entry (PNG allows 256 entries in all). */
const OPAQUE_COLOURS = 255;
/**
 * The palette is made from every 4th opaque pixel (every pixel is then mapped to it): on the
 * demo's tiles a third less work than from all of them, 7 % smaller, for a mean error of 0.76
 * instead of 0.73 levels.
 */
const PALETTE_SAMPLE_STEP = 4;
/** zlib's default level: on palette indices level 9 saves under 1 % for twice the time. */
const DEFLATE_LEVEL = 6;

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
 * The shaded, tinted pixels of the tile (or of its rows [firstRow, endRow)), RGB row by row,
 * written into `into` when given. Per pixel: Horn gradient over the 3 × 3 window (a NaN neighbour
 * takes the centre value), illumination = (cos zenith + sin zenith·(q·sin A − p·cos A)) /
 * √(1 + p² + q²) clamped at 0 (as hillshade.ts), light = shadowFloor + shadeGain·illumination,
 * colour = tint byte × light capped at 255 (the tint of the elevation's whole metre, as
 * elevation-tint.ts). Where the elevation is NaN the pixel is black, which marks it transparent;
 * a shaded pixel that would come out black is written (0, 0, 1) instead.
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
    shadeRow(elevations, (j + 1) * SAMPLES_PX + 1, raw, (j - firstRow) * TILE_STRIDE, shading);
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
    raw[out] = r;
    raw[out + 1] = g;
    raw[out + 2] = b;
    out += 3;
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

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/**
 * A palette PNG (colour type 3, 8-bit indices) of `width` × `height` RGB pixels, black
 * transparent. Index 0 is the transparent entry; the opaque pixels are reduced to at most 255
 * colours by upng-js's quantiser (principal-axis splits of the colour cloud) and each distinct
 * colour then takes its nearest palette entry (squared RGB distance), so no pixel lands further
 * from its colour than the palette allows. Rows are not filtered: for indexed colour, filter type 0
 * is usually the most effective (PNG specification, W3C, §12.8 "Filter selection"). Four to five
 * times smaller than the RGB tile it replaces, with a mean error under one level per channel on
 * the demo's relief. The result owns its whole ArrayBuffer, so a worker can hand it over without
 * a copy.
 */
export function encodePalettePng(rgb, width, height) {
  const count = width * height;
  let opaque = 0;
  for (let k = 0, p = 0; k < count; k++, p += 3) if ((rgb[p] | rgb[p + 1] | rgb[p + 2]) !== 0) opaque++;
  const indices = new Uint8Array(count);
  let palette = new Uint32Array(0);
  if (opaque > 0) {
    // RGBA (little-endian 0xAABBGGRR words) of the opaque pixels, every PALETTE_SAMPLE_STEP-th
    // one, for the quantiser.
    const words = new Uint32Array(Math.ceil(opaque / PALETTE_SAMPLE_STEP));
    for (let k = 0, p = 0, seen = 0, o = 0; k < count; k++, p += 3) {
      const r = rgb[p];
      const g = rgb[p + 1];
      const b = rgb[p + 2];
      if ((r | g | b) !== 0 && seen++ % PALETTE_SAMPLE_STEP === 0) words[o++] = (0xff000000 | (b << 16) | (g << 8) | r) >>> 0;
    }
    palette = Uint32Array.from(UPNG.quantize([words.buffer], OPAQUE_COLOURS).plte, (leaf) => leaf.est.rgba);
    mapToPalette(rgb, count, palette, indices);
  }
  return palettePng(indices, palette, width, height);
}

/**
 * Each pixel's palette index (index 0 transparent, entry k at index k + 1): the nearest entry per
 * distinct colour. The entries are searched in order of green outward from the colour's own
 * green, stopping once the green difference alone is further than the best entry found: the
 * same answer as trying every entry, in a fraction of the time.
 */
function mapToPalette(rgb, count, palette, indices) {
  const entries = palette.length;
  const order = Array.from({ length: entries }, (_, k) => k).sort((a, b) => ((palette[a] >>> 8) & 0xff) - ((palette[b] >>> 8) & 0xff));
  const reds = new Int32Array(entries);
  const greens = new Int32Array(entries);
  const blues = new Int32Array(entries);
  const indexOf = new Uint8Array(entries);
  for (let k = 0; k < entries; k++) {
    const colour = palette[order[k]];
    reds[k] = colour & 0xff;
    greens[k] = (colour >>> 8) & 0xff;
    blues[k] = (colour >>> 16) & 0xff;
    indexOf[k] = order[k] + 1;
  }
  // First sorted entry with at least each green.
  const fromGreen = new Int32Array(256);
  for (let g = 0, k = 0; g < 256; g++) {
    while (k < entries && greens[k] < g) k++;
    fromGreen[g] = k;
  }
  const nearest = new Map();
  for (let k = 0, p = 0; k < count; k++, p += 3) {
    const r = rgb[p];
    const g = rgb[p + 1];
    const b = rgb[p + 2];
    const key = (r << 16) | (g << 8) | b;
    if (key === 0) continue;
    let index = nearest.get(key);
    if (index === undefined) {
      let best = Infinity;
      let up = fromGreen[g];
      let down = up - 1;
      while (up < entries || down >= 0) {
        if (up < entries) {
          const dg = greens[up] - g;
          if (dg * dg >= best) up = entries;
          else {
            const dr = r - reds[up];
            const db = b - blues[up];
            const distance = dr * dr + dg * dg + db * db;
            if (distance < best) {
              best = distance;
              index = indexOf[up];
            }
            up++;
          }
        }
        if (down >= 0) {
          const dg = g - greens[down];
          if (dg * dg >= best) down = -1;
          else {
            const dr = r - reds[down];
            const db = b - blues[down];
            const distance = dr * dr + dg * dg + db * db;
            if (distance < best) {
              best = distance;
              index = indexOf[down];
            }
            down--;
          }
        }
      }
      nearest.set(key, index);
    }
    indices[k] = index;
  }
}

/** Signature, IHDR, PLTE, tRNS (entry 0 transparent), one IDAT of unfiltered index rows, IEND. */
function palettePng(indices, palette, width, height) {
  const scanlines = new Uint8Array((width + 1) * height);
  for (let row = 0; row < height; row++) scanlines.set(indices.subarray(row * width, (row + 1) * width), row * (width + 1) + 1);
  const idat = deflateSync(scanlines, { level: DEFLATE_LEVEL, memLevel: 9 });
  const entries = palette.length + 1;
  const total = PNG_SIGNATURE.length + (12 + 13) + (12 + 3 * entries) + (12 + 1) + (12 + idat.length) + 12;
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
    png[at + 9] = 3; // colour type: indexed
    png[at + 10] = 0; // deflate
    png[at + 11] = 0; // adaptive filtering (every row filter type 0)
    png[at + 12] = 0; // no interlace
  });
  // Entry 0 is the transparent one (its colour, black, is never shown).
  chunk('PLTE', 3 * entries, (at) => {
    for (let k = 0; k < palette.length; k++) {
      png[at + 3 * (k + 1)] = palette[k] & 0xff;
      png[at + 3 * (k + 1) + 1] = (palette[k] >>> 8) & 0xff;
      png[at + 3 * (k + 1) + 2] = (palette[k] >>> 16) & 0xff;
    }
  });
  // Alpha of the first entry only: the entries after it are opaque.
  chunk('tRNS', 1, () => undefined);
  chunk('IDAT', idat.length, (at) => png.set(idat, at));
  chunk('IEND', 0, () => undefined);
  return png;
}

/**
 * Tile rows [firstRow, endRow) on their own, for rendering a tile's parts on several threads:
 * their RGB pixels (a new array, black where there is no data). `pngFromParts` joins them.
 */
export function renderTileRows(task, firstRow, endRow) {
  task = uniformTask(task);
  const { elevations: scratchElevations } = scratch();
  const elevations = sampleTileElevations(task.layers, firstRow, endRow + 2, scratchElevations);
  return shadeAndTint(elevations, task.cellSizeM, task.sun, task.stops, task.shadowFloor, task.shadeGain, firstRow, endRow);
}

/** The whole tile's RGB pixels from its row parts in order (renderTileRows). */
export function joinParts(parts) {
  const rgb = new Uint8Array(TILE_PX * TILE_STRIDE);
  let offset = 0;
  for (const part of parts) {
    rgb.set(part, offset);
    offset += part.length;
  }
  if (offset !== rgb.length) throw new Error(`Tile parts cover ${offset / TILE_STRIDE} of ${TILE_PX} rows`);
  return rgb;
}

/** The PNG of a whole tile from its row parts in order (renderTileRows). */
export function pngFromParts(parts) {
  return encodePalettePng(joinParts(parts), TILE_PX, TILE_PX);
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
  };
}

let scratchArrays = null;

/**
 * This thread's working arrays for a tile (its elevations and its pixels), reused from tile to
 * tile: fresh ones for every tile, three quarters of a megabyte, kept the garbage collector busy
 * with pauses of several milliseconds. The pixels are consumed (encoded) before the next tile.
 */
function scratch() {
  scratchArrays ??= { elevations: new Float64Array(SAMPLES_PX * SAMPLES_PX), pixels: new Uint8Array(TILE_PX * TILE_STRIDE) };
  return scratchArrays;
}

/** The whole tile: sampling, hillshade and tint, PNG. */
export function renderTilePng(task) {
  task = uniformTask(task);
  const { elevations: scratchElevations, pixels: scratchPixels } = scratch();
  const elevations = sampleTileElevations(task.layers, 0, SAMPLES_PX, scratchElevations);
  const pixels = shadeAndTint(
    elevations,
    task.cellSizeM,
    task.sun,
    task.stops,
    task.shadowFloor,
    task.shadeGain,
    0,
    TILE_PX,
    scratchPixels,
  );
  return encodePalettePng(pixels, TILE_PX, TILE_PX);
}

/**
 * Runs the kernel on a synthetic tile a few times so the JIT has compiled it before real tiles
 * arrive: the first calls of a fresh thread otherwise take 3–5× longer. Every third tile is partly
 * without data (off the grid and nodata inside), so the transparent pixels, the renormalised
 * interpolation and the NaN neighbours of the hillshade are exercised; each round renders the
 * tile whole (encoded) and in two halves (as split over threads).
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
    };
    renderTilePng(task);
    // A tile split over two threads: both halves, reading shared memory as the pool's threads do.
    const split = { ...task, layers: [{ ...layer, window: partial ? sharedHoled : sharedWindow }] };
    joinParts([renderTileRows(split, 0, TILE_PX / 2), renderTileRows(split, TILE_PX / 2, TILE_PX)]);
  }
}
