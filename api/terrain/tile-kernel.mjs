// The per-pixel work of one terrain map tile: sampling the elevation grid, Horn hillshade, the
// elevation tint and PNG encoding, all in flat typed-array loops without per-pixel objects or
// closures. Plain JavaScript on purpose: the worker threads load it as is (under tsx, vitest and
// the bundled server alike) and the API thread imports the same file.
//
// The API thread prepares a task (tile-renderer.ts): for each model, in the order "finest first",
// a window of its grid (decoded blocks copied side by side, NaN where the grid has no data or
// ends) and a coarse lattice of grid coordinates of the tile's pixels, exact at the nodes.
import { crc32, deflateSync } from 'node:zlib';

export const TILE_PX = 256;
/** Samples per side: the tile's pixels plus a one-pixel border for the 3 × 3 Horn window. */
export const SAMPLES_PX = TILE_PX + 2;

/**
 * Elevations at the centres of the SAMPLES_PX² sample points, row-major, NaN where no layer has
 * data. Bilinear between the four pixel centres around each point; a neighbour that is nodata or
 * off the grid drops out and the remaining weights are renormalised (the same rule as
 * terrain-grid.ts's bilinearValue).
 */
export function sampleTileElevations(layers) {
  const size = SAMPLES_PX;
  const out = new Float64Array(size * size).fill(NaN);
  let missing = size * size;
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
    for (let j = 0; j < size; j++) {
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
          if (w > 0 && z00 === z00) (sum += z00 * w), (weight += w);
          w = fxp * (1 - fyp);
          if (w > 0 && z10 === z10) (sum += z10 * w), (weight += w);
          w = (1 - fxp) * fyp;
          if (w > 0 && z01 === z01) (sum += z01 * w), (weight += w);
          w = fxp * fyp;
          if (w > 0 && z11 === z11) (sum += z11 * w), (weight += w);
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
 * PNG scanlines (filter byte + RGB per row, RGBA when part of the tile has no data) of the
 * shaded, tinted tile. Per pixel:
 * Horn gradient over the 3 × 3 window (a NaN neighbour takes the centre value), illumination
 * = (cos zenith + sin zenith·(q·sin A − p·cos A)) / √(1 + p² + q²) clamped at 0 (as hillshade.ts),
 * light = shadowFloor + shadeGain·illumination, colour = tint byte × light capped at 255;
 * transparent black where the elevation is NaN. Rows use PNG's "Sub" filter (difference to the
 * pixel on the left), which makes smooth relief compress well at a fast deflate level.
 */
export function shadeAndTint(elevations, cellSizeM, sun, stops, shadowFloor, shadeGain) {
  const size = SAMPLES_PX;
  const opaque = isOpaque(elevations);
  const channels = opaque ? 3 : 4;
  const stride = 1 + TILE_PX * channels;
  const raw = new Uint8Array(TILE_PX * stride);
  const { cosZenith, sinZenith, cosAzimuth, sinAzimuth, zFactor } = sun;
  const scaleX = zFactor / (8 * cellSizeM);
  const scaleY = zFactor / (8 * cellSizeM);
  const lastStop = stops.length - 4;
  let segment = 4;
  for (let j = 0; j < TILE_PX; j++) {
    let out = j * stride;
    raw[out++] = 1;
    let lr = 0;
    let lg = 0;
    let lb = 0;
    let la = 0;
    let centre = (j + 1) * size + 1;
    for (let i = 0; i < TILE_PX; i++, centre++) {
      const e = elevations[centre];
      let r = 0;
      let g = 0;
      let b = 0;
      let a = 0;
      if (e === e) {
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
        const p = (cv + 2 * fv + iv - (av + 2 * dv + gv)) * scaleX;
        const q = (gv + 2 * hv + iv - (av + 2 * bv + cv)) * scaleY;
        let illumination = (cosZenith + sinZenith * (-p * cosAzimuth + q * sinAzimuth)) / Math.sqrt(1 + p * p + q * q);
        if (!(illumination > 0)) illumination = 0;
        const light = shadowFloor + shadeGain * illumination;

        // Tint: linear between the stops around e, truncated to bytes (as elevation-tint.ts).
        let tr;
        let tg;
        let tb;
        if (e <= stops[0]) {
          tr = stops[1];
          tg = stops[2];
          tb = stops[3];
        } else if (e > stops[lastStop]) {
          tr = stops[lastStop + 1];
          tg = stops[lastStop + 2];
          tb = stops[lastStop + 3];
        } else {
          // Neighbouring pixels mostly share a segment: start from the last one.
          let k = segment;
          if (!(e > stops[k - 4] && e <= stops[k])) {
            k = 4;
            while (e > stops[k]) k += 4;
            segment = k;
          }
          const l = k - 4;
          const t = (e - stops[l]) / (stops[k] - stops[l]);
          tr = (stops[l + 1] + (stops[k + 1] - stops[l + 1]) * t) | 0;
          tg = (stops[l + 2] + (stops[k + 2] - stops[l + 2]) * t) | 0;
          tb = (stops[l + 3] + (stops[k + 3] - stops[l + 3]) * t) | 0;
        }
        const vr = tr * light;
        const vg = tg * light;
        const vb = tb * light;
        r = vr >= 255 ? 255 : vr | 0;
        g = vg >= 255 ? 255 : vg | 0;
        b = vb >= 255 ? 255 : vb | 0;
        a = 255;
      }
      raw[out++] = r - lr;
      raw[out++] = g - lg;
      raw[out++] = b - lb;
      if (!opaque) raw[out++] = a - la;
      lr = r;
      lg = g;
      lb = b;
      la = a;
    }
  }
  return raw;
}

/** Whether every pixel of the tile has an elevation (then the PNG needs no alpha channel). */
function isOpaque(elevations) {
  for (let j = 1; j <= TILE_PX; j++) {
    const end = j * SAMPLES_PX + TILE_PX;
    for (let k = j * SAMPLES_PX + 1; k <= end; k++) if (elevations[k] !== elevations[k]) return false;
  }
  return true;
}

const PNG_SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/**
 * An RGB or RGBA PNG (8 bits per channel, told apart by the scanlines' length) from ready
 * scanlines: signature, IHDR, one IDAT, IEND. The result owns its whole ArrayBuffer, so a worker
 * can hand it over without a copy.
 */
export function encodePng(scanlines, width, height, deflateLevel = 1) {
  const channels = (scanlines.length / height - 1) / width;
  const idat = deflateSync(scanlines, { level: deflateLevel, memLevel: 9 });
  const total = PNG_SIGNATURE.length + (12 + 13) + (12 + idat.length) + 12;
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
    png[at + 9] = channels === 4 ? 6 : 2; // colour type: RGBA or RGB
    png[at + 10] = 0; // deflate
    png[at + 11] = 0; // adaptive filtering (per-row filter bytes)
    png[at + 12] = 0; // no interlace
  });
  chunk('IDAT', idat.length, (at) => png.set(idat, at));
  chunk('IEND', 0, () => undefined);
  return png;
}

/** The whole tile: sampling, hillshade and tint, PNG. */
export function renderTilePng(task) {
  const elevations = sampleTileElevations(task.layers);
  const scanlines = shadeAndTint(elevations, task.cellSizeM, task.sun, task.stops, task.shadowFloor, task.shadeGain);
  return encodePng(scanlines, TILE_PX, TILE_PX, task.deflateLevel);
}

/**
 * Runs the kernel on a synthetic tile a few times so the JIT has compiled it before real tiles
 * arrive: the first calls of a fresh thread otherwise take 3–5× longer. One tile is partly
 * without data, so both PNG layouts and the renormalised interpolation are exercised. ≈ 50 ms.
 */
export function warmUpKernel(rounds = 12) {
  const width = 200;
  const window = new Float32Array(width * width);
  for (let k = 0; k < window.length; k++) window[k] = 800 + 600 * Math.sin(k / 911) + (k % width);
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
    const layer = { window, x0: partial ? 40 : 0, y0: 0, width, height: width, gridWidth: 10_000, gridHeight: 10_000, nodeCols, nodeRows, nodes, step: 16 };
    renderTilePng({ layers: [layer], cellSizeM: 10, sun, stops, shadowFloor: 0.3, shadeGain: 0.8, deflateLevel: 1 });
  }
}
