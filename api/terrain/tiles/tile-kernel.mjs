// The per-pixel work of one terrain map tile: sampling the elevation grid, Horn hillshade, the
// elevation tint and PNG encoding (a palette of at most 256 colours), all in flat typed-array
// loops without per-pixel objects or closures. Plain JavaScript on purpose: the worker threads load it as is (under tsx, vitest and
// the bundled server alike) and the API thread imports the same file.
//
// The API thread prepares a task (tile-renderer.ts): for each model, in the order "finest first",
// a window of its grid (decoded blocks copied side by side, NaN where the grid has no data or
// ends) and a coarse lattice of grid coordinates of the tile's pixels, exact at the nodes.
//
// How a tile's colours are encoded: every pixel's colour is its elevation's tint (a per-metre
// table) times its hillshade light. Rather than reduce the tile's RGB colours to a palette and
// search the palette for each colour, the kernel keeps per pixel its tint metre and its
// illumination (a "code") and builds the palette from those two scales (encodeTileCodes): the
// tint metres present in the tile are grouped into at most TINT_CLASSES tint classes, each
// class's illuminations into shade levels, and a pixel's palette index is two table lookups.
import { crc32, deflateSync } from 'node:zlib';

export const TILE_PX = 256;
/** Samples per side: the tile's pixels plus a one-pixel border for the 3 × 3 Horn window. */
export const SAMPLES_PX = TILE_PX + 2;
/** Bytes per row of a tile's pixels (RGB). */
const TILE_STRIDE = TILE_PX * 3;
/** Opaque palette entries: PNG allows 256 in all, and entry 0 is the transparent one. */
const OPAQUE_ENTRIES = 255;
/**
 * Most tint classes in a tile; the 255 opaque entries are shared among the classes present as
 * shade levels (10–11 each when all 24 are, more on a tile of few elevations). On the demo's
 * tiles 24 gave the smallest colour error of 15, 20, 24 and 32 (1.72 levels of 255 per channel).
 */
export const TINT_CLASSES = 24;
/** Illumination is kept per pixel in 8 bits (⌊256 · illumination⌋, capped), the shade levels group these. */
const ILLUMINATION_STEPS = 256;
/** Rounds of Lloyd's algorithm for the tint classes and the shade levels (the error settles after about eight). */
const LLOYD_ROUNDS = 8;
/**
 * 4 × 4 ordered-dither thresholds (Bayer's matrix, scaled to 8–248): where a metre's tint lies
 * between two class tints, that share of its pixels, spread evenly, takes the other class.
 */
const DITHER = Uint8Array.from([0, 8, 2, 10, 12, 4, 14, 6, 3, 11, 1, 9, 15, 7, 13, 5], (v) => v * 16 + 8);
/** zlib level 1 on Sub-filtered indices: see encodeTileCodes. */
const DEFLATE_OPTIONS = { level: 1, memLevel: 9 };
/** A pixel's code where no model has data (transparent). Otherwise (tint metre << 8) | illumination byte. */
export const NO_DATA_CODE = 0xffffffff;
/**
 * Names how tiles are encoded; part of the tile catalogue's version (terrain-runtime.ts), so
 * tiles cached on disk or in browsers in an earlier encoding are never served again. Change it
 * whenever the kernel's output changes.
 */
export const TILE_ENCODING = `tint${TINT_CLASSES}-shade-dither4-sub-deflate1`;

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
  const terms = sunTerms(sun, cellSizeM);
  const shading = { shadowFloor, shadeGain, tint: table, tintBase: base, tintTop: top };
  // One call per row: a small function that the JIT compiles whole, rather than one long loop
  // compiled mid-run.
  for (let j = firstRow; j < endRow; j++) {
    shadeRow(elevations, (j + 1) * SAMPLES_PX + 1, raw, (j - firstRow) * TILE_STRIDE, terms, shading);
  }
  return raw;
}

/**
 * What the Horn illumination needs of the sun and the grid, worked out once per tile: the
 * gradient's scale (z-factor over eight cell sizes: the Horn weights of each side sum to 4, over
 * a span of two cells) and the sun's zenith and azimuth cosines and sines. shadeAndTint and
 * shadeCodes both pass this one object to illuminationAt, so it always sees the same shape.
 */
function sunTerms(sun, cellSizeM) {
  return {
    scale: sun.zFactor / (8 * cellSizeM),
    cosZenith: sun.cosZenith,
    sinZenith: sun.sinZenith,
    cosAzimuth: sun.cosAzimuth,
    sinAzimuth: sun.sinAzimuth,
  };
}

/** Horn illumination (0–1) at `centre` under the sunTerms `s`; a NaN neighbour takes the centre value e. */
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

function shadeRow(elevations, rowStart, raw, out, terms, s) {
  const { tint, tintBase, tintTop, shadowFloor, shadeGain } = s;
  const rowEnd = rowStart + TILE_PX;
  for (let centre = rowStart; centre < rowEnd; centre++) {
    const e = elevations[centre];
    let r = 0;
    let g = 0;
    let b = 0;
    if (e === e) {
      const light = shadowFloor + shadeGain * illuminationAt(elevations, centre, e, terms);
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

/**
 * The codes of the tile's pixels (or of its rows [firstRow, endRow)), row by row, written into
 * `into` when given: (tint metre << 8) | illumination byte, where the tint metre indexes the
 * per-metre tint table (the same metre shadeAndTint colours the pixel with) and the illumination
 * byte is ⌊256 · illumination⌋ capped at 255 (the same Horn illumination); NO_DATA_CODE where
 * the elevation is NaN.
 */
export function shadeCodes(elevations, cellSizeM, sun, stops, firstRow = 0, endRow = TILE_PX, into = null) {
  const length = (endRow - firstRow) * TILE_PX;
  const codes = into === null ? new Uint32Array(length) : into.subarray(0, length);
  const { base, top } = tintTable(stops);
  const terms = sunTerms(sun, cellSizeM);
  for (let j = firstRow; j < endRow; j++) {
    codeRow(elevations, (j + 1) * SAMPLES_PX + 1, codes, (j - firstRow) * TILE_PX, terms, base, top);
  }
  return codes;
}

function codeRow(elevations, rowStart, codes, out, terms, tintBase, tintTop) {
  const rowEnd = rowStart + TILE_PX;
  for (let centre = rowStart; centre < rowEnd; centre++) {
    const e = elevations[centre];
    let code = NO_DATA_CODE;
    if (e === e) {
      const illumination = illuminationAt(elevations, centre, e, terms);
      const above = e - tintBase;
      const metre = above <= 0 ? 0 : above >= tintTop ? tintTop : above | 0;
      const byte = illumination >= 1 ? ILLUMINATION_STEPS - 1 : (illumination * ILLUMINATION_STEPS) | 0;
      code = (metre << 8) | byte;
    }
    codes[out++] = code;
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
 * A palette PNG (colour type 3, 8-bit indices) of `width` × `height` pixel codes (shadeCodes),
 * index 0 transparent (NO_DATA_CODE). The palette comes from the codes' two scales, never from
 * the colours:
 *
 * - the tint metres present are grouped into at most TINT_CLASSES classes (tintClasses), each
 *   with the mean tint of its pixels; a metre between two class tints sends a matching share of
 *   its pixels to the other class in a 4 × 4 ordered-dither pattern, so gentle slopes of a few
 *   classes show no contour-like bands;
 * - each class's pixels' illumination bytes are grouped into that class's share of the 255
 *   entries (shadeLevels), each level with the light of its mean illumination;
 * - entry (class, level) is the class tint times the level's light (capped at 255), the same
 *   arithmetic as shadeAndTint; a pixel's index is two lookups: its class, then its class's level
 *   of its illumination byte.
 *
 * Entries run class by class, levels from dark to light, so neighbouring pixels have nearby
 * indices: rows are filtered with Sub (PNG filter type 1), which halves the bytes here where
 * palette PNGs usually take filter 0 (PNG specification, W3C, §12.8, for palettes whose order
 * means nothing). The result owns its whole ArrayBuffer, so a worker can hand it over without a
 * copy.
 */
export function encodeTileCodes(codes, width, height, colours) {
  const count = width * height;
  const { table, top } = tintTable(colours.stops);
  // How many pixels have each tint metre.
  const metres = new Uint32Array(top + 1);
  let low = Infinity;
  let high = -1;
  for (let k = 0; k < count; k++) {
    const code = codes[k];
    if (code === NO_DATA_CODE) continue;
    const metre = code >>> 8;
    metres[metre]++;
    if (metre < low) low = metre;
    if (metre > high) high = metre;
  }
  const scanlines = new Uint8Array((width + 1) * height);
  // No data at all: zlib's best level, once per process (tile-renderer.ts keeps the tile).
  if (high < 0) return palettePng(scanlines, new Uint8Array(3), width, height, { level: 9 });
  const { classOf, otherOf, shareOf, tints, classes } = tintClasses(table, metres, low, high);
  // Each pixel's class (dithered) and how many pixels of each class have each illumination byte.
  const pixelClass = new Uint8Array(count);
  const illuminations = new Uint32Array(classes * ILLUMINATION_STEPS);
  for (let row = 0, k = 0; row < height; row++) {
    const dither = (row & 3) << 2;
    for (let col = 0; col < width; col++, k++) {
      const code = codes[k];
      if (code === NO_DATA_CODE) continue;
      const m = (code >>> 8) - low;
      const c = shareOf[m] > DITHER[dither | (col & 3)] ? otherOf[m] : classOf[m];
      pixelClass[k] = c;
      illuminations[(c << 8) | (code & 0xff)]++;
    }
  }
  // Each class's share of the opaque entries, its shade levels and its palette entries.
  const indexOf = new Uint8Array(classes * ILLUMINATION_STEPS);
  const palette = new Uint8Array(3 * (1 + OPAQUE_ENTRIES));
  let next = 1;
  for (let c = 0; c < classes; c++) {
    const share = Math.floor(OPAQUE_ENTRIES / classes) + (c < OPAQUE_ENTRIES % classes ? 1 : 0);
    const { levelOf, lights, used } = shadeLevels(
      illuminations.subarray(c << 8, (c + 1) << 8),
      share,
      colours.shadowFloor,
      colours.shadeGain,
    );
    for (let b = 0; b < ILLUMINATION_STEPS; b++) indexOf[(c << 8) | b] = next + levelOf[b];
    for (let level = 0; level < used; level++) {
      for (let ch = 0; ch < 3; ch++) {
        const value = tints[3 * c + ch] * lights[level];
        palette[3 * (next + level) + ch] = value >= 255 ? 255 : value | 0;
      }
    }
    next += used;
  }
  for (let row = 0, k = 0; row < height; row++) {
    let at = row * (width + 1);
    scanlines[at++] = 0;
    for (let end = k + width; k < end; k++) {
      const code = codes[k];
      scanlines[at++] = code === NO_DATA_CODE ? 0 : indexOf[(pixelClass[k] << 8) | (code & 0xff)];
    }
  }
  filterSub(scanlines, width, height);
  return palettePng(scanlines, palette.subarray(0, 3 * next), width, height);
}

/**
 * Lloyd's algorithm in one dimension, on a histogram: `values` ascending with `weights` (pixel
 * counts), `groupOf` each value's group to start from (ascending, fewer than `groups`), refined
 * LLOYD_ROUNDS times: each group's weighted mean is computed, each value goes to the nearest
 * mean. Groups stay runs of neighbouring values (numbered afresh in order after the first
 * round; a group left empty disappears). Refines `groupOf` in place and returns it.
 */
function lloyd1d(values, weights, groupOf, groups) {
  const n = values.length;
  const sums = new Float64Array(groups);
  const totals = new Float64Array(groups);
  const centres = new Float64Array(groups);
  for (let round = 0; round < LLOYD_ROUNDS; round++) {
    sums.fill(0);
    totals.fill(0);
    for (let i = 0; i < n; i++) {
      sums[groupOf[i]] += values[i] * weights[i];
      totals[groupOf[i]] += weights[i];
    }
    let known = 0;
    for (let g = 0; g < groups; g++) {
      if (totals[g] > 0) centres[known++] = sums[g] / totals[g];
    }
    if (known < 2) return groupOf;
    // Each value to its nearest centre (centres ascend, so a forward scan finds it).
    let g = 0;
    for (let i = 0; i < n; i++) {
      while (g + 1 < known && Math.abs(centres[g + 1] - values[i]) <= Math.abs(centres[g] - values[i])) g++;
      groupOf[i] = g;
    }
  }
  return groupOf;
}

/**
 * At most `levels` shade levels for one tint class's pixels (`illuminations`: pixels per
 * illumination byte): the bytes present split into equal steps between the lowest and the
 * highest, then refined by Lloyd's algorithm on the pixel counts, so the levels lie closer
 * together where the class's slopes are. `levelOf[byte]` is a byte's level (0 for bytes absent,
 * never looked up), `lights[level]` the light of the level's mean illumination, `used` how many
 * levels remain.
 */
function shadeLevels(illuminations, levels, shadowFloor, shadeGain) {
  const present = [];
  for (let b = 0; b < ILLUMINATION_STEPS; b++) if (illuminations[b] > 0) present.push(b);
  const levelOf = new Uint8Array(ILLUMINATION_STEPS);
  if (present.length === 0) return { levelOf, lights: new Float64Array(0), used: 0 };
  const first = present[0];
  const span = present[present.length - 1] + 1 - first;
  const values = Float64Array.from(present, (b) => b + 0.5);
  const weights = Float64Array.from(present, (b) => illuminations[b]);
  const groupOf = Uint8Array.from(present, (b) => Math.min(levels - 1, Math.floor(((b - first) * levels) / span)));
  lloyd1d(values, weights, groupOf, levels);
  // Renumber the levels present 0, 1, … in order; each level's light is that of its mean illumination.
  const slots = new Int16Array(levels).fill(-1);
  let used = 0;
  for (let i = 0; i < present.length; i++) if (slots[groupOf[i]] < 0) slots[groupOf[i]] = used++;
  const sums = new Float64Array(used);
  const totals = new Float64Array(used);
  for (let i = 0; i < present.length; i++) {
    const level = slots[groupOf[i]];
    sums[level] += values[i] * weights[i];
    totals[level] += weights[i];
    levelOf[present[i]] = level;
  }
  const lights = new Float64Array(used);
  for (let level = 0; level < used; level++) lights[level] = shadowFloor + (shadeGain * sums[level]) / totals[level] / ILLUMINATION_STEPS;
  return { levelOf, lights, used };
}

/**
 * The tint classes of a tile's tint metres (`metres`: pixels per metre of the tint table, the
 * lowest present `low`, the highest `high`). The metres present are placed along the tint
 * table by colour change (from one metre present to the next: the largest channel difference
 * of their tints), split into TINT_CLASSES parts of equal colour change (a class spans many
 * metres where the tint changes slowly, few across a sharp change), then refined by Lloyd's
 * algorithm on their pixel counts. A class's tint is the mean of its pixels' tints. Per metre
 * m (at m − low): `classOf` its class, `otherOf` the neighbouring class on the side it leans
 * to and `shareOf` how far it lies towards that class's centre (0–255 for 0–1, for the dither);
 * `tints` RGB per class, `classes` how many.
 */
function tintClasses(table, metres, low, high) {
  const present = [];
  const along = [];
  let position = 0;
  let previous = -1;
  for (let m = low; m <= high; m++) {
    if (metres[m] === 0) continue;
    if (previous >= 0) {
      const p = 3 * m;
      const q = 3 * previous;
      position += Math.max(Math.abs(table[p] - table[q]), Math.abs(table[p + 1] - table[q + 1]), Math.abs(table[p + 2] - table[q + 2]));
    }
    present.push(m);
    along.push(position);
    previous = m;
  }
  const total = position;
  const values = Float64Array.from(along);
  const weights = Float64Array.from(present, (m) => metres[m]);
  const groupOf = Uint8Array.from(along, (a) => (total === 0 ? 0 : Math.min(TINT_CLASSES - 1, Math.floor((a / total) * TINT_CLASSES))));
  lloyd1d(values, weights, groupOf, TINT_CLASSES);
  // Renumber the classes present 0, 1, … in order.
  const slots = new Int16Array(TINT_CLASSES).fill(-1);
  let classes = 0;
  for (let i = 0; i < present.length; i++) if (slots[groupOf[i]] < 0) slots[groupOf[i]] = classes++;
  const tints = new Float64Array(3 * classes);
  const counts = new Float64Array(classes);
  const classOf = new Uint8Array(high - low + 1);
  for (let i = 0; i < present.length; i++) {
    const c = slots[groupOf[i]];
    const w = weights[i];
    classOf[present[i] - low] = c;
    counts[c] += w;
    for (let ch = 0; ch < 3; ch++) tints[3 * c + ch] += table[3 * present[i] + ch] * w;
  }
  for (let c = 0; c < classes; c++) for (let ch = 0; ch < 3; ch++) tints[3 * c + ch] /= counts[c];
  // Where each metre lies between its class's centre and the nearest other class's centre.
  const centres = new Float64Array(classes);
  for (let i = 0; i < present.length; i++) centres[slots[groupOf[i]]] += values[i] * weights[i];
  for (let c = 0; c < classes; c++) centres[c] /= counts[c];
  const otherOf = new Uint8Array(high - low + 1);
  const shareOf = new Uint8Array(high - low + 1);
  for (let i = 0; i < present.length; i++) {
    const c = slots[groupOf[i]];
    const a = values[i];
    let other = c;
    let share = 0;
    if (a > centres[c] && c + 1 < classes) {
      other = c + 1;
      share = (a - centres[c]) / (centres[c + 1] - centres[c]);
    } else if (a < centres[c] && c > 0) {
      other = c - 1;
      share = (centres[c] - a) / (centres[c] - centres[c - 1]);
    }
    otherOf[present[i] - low] = other;
    shareOf[present[i] - low] = Math.min(255, Math.round(share * 256));
  }
  return { classOf, otherOf, shareOf, tints, classes };
}

/** PNG filter type 1 (Sub) on unfiltered scanlines (filter bytes 0), in place: each index minus its left neighbour's. */
function filterSub(scanlines, width, height) {
  const stride = width + 1;
  for (let row = 0; row < height; row++) {
    const at = row * stride;
    scanlines[at] = 1;
    for (let k = width; k >= 2; k--) scanlines[at + k] = (scanlines[at + k] - scanlines[at + k - 1]) & 0xff;
  }
}

/** Signature, IHDR, PLTE (`palette`, RGB), tRNS (entry 0 transparent), one IDAT of the filtered scanlines, IEND. */
function palettePng(scanlines, palette, width, height, deflateOptions = DEFLATE_OPTIONS) {
  const idat = deflateSync(scanlines, deflateOptions);
  const total = PNG_SIGNATURE.length + (12 + 13) + (12 + palette.length) + (12 + 1) + (12 + idat.length) + 12;
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
    png[at + 11] = 0; // adaptive filtering (a filter type per row)
    png[at + 12] = 0; // no interlace
  });
  // Entry 0 is the transparent one (its colour, black, is never shown).
  chunk('PLTE', palette.length, (at) => png.set(palette, at));
  // Alpha of the first entry only: the entries after it are opaque.
  chunk('tRNS', 1, () => undefined);
  chunk('IDAT', idat.length, (at) => png.set(idat, at));
  chunk('IEND', 0, () => undefined);
  return png;
}

/**
 * Tile rows [firstRow, endRow) on their own, for rendering a tile's parts on several threads:
 * their pixel codes (a new array, NO_DATA_CODE where there is no data). `pngFromParts` joins them.
 */
export function renderTileRows(task, firstRow, endRow) {
  task = uniformTask(task);
  const { elevations: scratchElevations } = scratch();
  const elevations = sampleTileElevations(task.layers, firstRow, endRow + 2, scratchElevations);
  return shadeCodes(elevations, task.cellSizeM, task.sun, task.stops, firstRow, endRow);
}

/** The whole tile's pixel codes from its row parts in order (renderTileRows). */
export function joinParts(parts) {
  const codes = new Uint32Array(TILE_PX * TILE_PX);
  let offset = 0;
  for (const part of parts) {
    codes.set(part, offset);
    offset += part.length;
  }
  if (offset !== codes.length) throw new Error(`Tile parts cover ${offset / TILE_PX} of ${TILE_PX} rows`);
  return codes;
}

/** The PNG of a whole tile from its row parts in order (renderTileRows) and its task's colours. */
export function pngFromParts(parts, task) {
  return encodeTileCodes(joinParts(parts), TILE_PX, TILE_PX, task);
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
 * This thread's working arrays for a tile (its elevations and its pixel codes), reused from tile
 * to tile: fresh ones for every tile, three quarters of a megabyte, kept the garbage collector
 * busy with pauses of several milliseconds. The codes are consumed (encoded) before the next tile.
 */
function scratch() {
  scratchArrays ??= { elevations: new Float64Array(SAMPLES_PX * SAMPLES_PX), codes: new Uint32Array(TILE_PX * TILE_PX) };
  return scratchArrays;
}

/** The whole tile: sampling, hillshade and tint, PNG. */
export function renderTilePng(task) {
  task = uniformTask(task);
  const { elevations: scratchElevations, codes: scratchCodes } = scratch();
  const elevations = sampleTileElevations(task.layers, 0, SAMPLES_PX, scratchElevations);
  const codes = shadeCodes(elevations, task.cellSizeM, task.sun, task.stops, 0, TILE_PX, scratchCodes);
  return encodeTileCodes(codes, TILE_PX, TILE_PX, task);
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
    pngFromParts([renderTileRows(split, 0, TILE_PX / 2), renderTileRows(split, TILE_PX / 2, TILE_PX)], split);
  }
}
