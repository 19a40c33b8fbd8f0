import { createHash } from 'node:crypto';
import { join } from 'node:path';
import { inflateSync } from 'node:zlib';
import { PNG } from 'pngjs';
import { afterAll, describe, expect, it } from 'vitest';
import { ELEVATION_TINT_STOPS, tintInto } from '../../../../api/terrain/tiles/elevation-tint';
import { hornGradient, shade, sunTerms } from '../../../../api/terrain/tiles/hillshade';
import { bilinearValue, guardedLookup } from '../../../../api/terrain/raster/terrain-grid';
import {
  encodeTileCodes,
  NO_DATA_CODE,
  pngFromParts,
  renderTilePng,
  renderTileRows,
  sampleTileElevations,
  SAMPLES_PX,
  shadeAndTint,
  shadeCodes,
  TILE_ENCODING,
  type TileLayer,
  type TileTask,
} from '../../../../api/terrain/tiles/tile-kernel.mjs';
import { gdal, hasGdal, python, tempDir, writeSyntheticGrid } from '../support/gdal';

const SUN = sunTerms({ azimuthDeg: 315, altitudeDeg: 45 });
const NODES = 18;
const STEP = 16;

/** A lattice that maps sample (i, j) to grid coordinates (a + b·i + c·j, d + e·i + f·j): linear, so the kernel's interpolation is exact. */
function affineLattice(
  a: number,
  b: number,
  c: number,
  d: number,
  e: number,
  f: number,
): Pick<TileLayer, 'nodeCols' | 'nodeRows' | 'nodes' | 'step'> {
  const nodeCols = new Float64Array(NODES * NODES);
  const nodeRows = new Float64Array(NODES * NODES);
  for (let nj = 0; nj < NODES; nj++) {
    for (let ni = 0; ni < NODES; ni++) {
      nodeCols[nj * NODES + ni] = a + b * ni * STEP + c * nj * STEP;
      nodeRows[nj * NODES + ni] = d + e * ni * STEP + f * nj * STEP;
    }
  }
  return { nodeCols, nodeRows, nodes: NODES, step: STEP };
}

function relief(widthPx: number, heightPx: number, hole?: [number, number, number, number]): Float32Array {
  const grid = new Float32Array(widthPx * heightPx);
  for (let r = 0; r < heightPx; r++) {
    for (let c = 0; c < widthPx; c++) {
      const inHole = hole && c >= hole[0] && c < hole[2] && r >= hole[1] && r < hole[3];
      grid[r * widthPx + c] = inHole ? NaN : 1100 + 600 * Math.sin(c / 23) * Math.cos(r / 17) + 3 * c - 2 * r;
    }
  }
  return grid;
}

describe('tile kernel', () => {
  it('samples bilinearly like terrain-grid, nodata and the grid edge included', () => {
    const width = 200;
    const height = 150;
    const grid = relief(width, height, [60, 40, 75, 52]);
    // The window is the whole grid with a one-pixel NaN margin, as the renderer cuts it.
    const window = new Float32Array((width + 2) * (height + 2)).fill(NaN);
    for (let r = 0; r < height; r++) window.set(grid.subarray(r * width, (r + 1) * width), (r + 1) * (width + 2) + 1);
    const lattice = affineLattice(-20.31, 0.83, 0.11, -9.713, -0.07, 0.71);
    const layer: TileLayer = {
      window,
      x0: -1,
      y0: -1,
      width: width + 2,
      height: height + 2,
      gridWidth: width,
      gridHeight: height,
      ...lattice,
    };

    const sampled = sampleTileElevations([layer]);

    const geometry = { originX: 0, originY: 0, pixelSizeX: 1, pixelSizeY: 1, widthPx: width, heightPx: height };
    const lookup = guardedLookup(geometry, (c, r) => grid[r * width + c]!);
    let worst = 0;
    let mismatchedNaN = 0;
    let valid = 0;
    for (let j = 0; j < SAMPLES_PX; j++) {
      for (let i = 0; i < SAMPLES_PX; i++) {
        const expected = bilinearValue(geometry, -20.31 + 0.83 * i + 0.11 * j, -9.713 - 0.07 * i + 0.71 * j, lookup);
        const actual = sampled[j * SAMPLES_PX + i]!;
        if (Number.isNaN(expected) !== Number.isNaN(actual)) mismatchedNaN++;
        else if (!Number.isNaN(expected)) {
          valid++;
          worst = Math.max(worst, Math.abs(actual - expected));
        }
      }
    }

    expect(valid).toBeGreaterThan(30_000);
    expect(mismatchedNaN).toBe(0);
    expect(worst).toBeLessThan(1e-6);
  });

  it('renders a tile split into row parts to the same PNG as in one piece, gaps transparent', () => {
    const holes: ([number, number, number, number] | undefined)[] = [undefined, [150, 20, 400, 400], [0, 0, 400, 200]];
    for (const hole of holes) {
      const width = 400;
      const height = 400;
      const layer: TileLayer = {
        window: relief(width, height, hole),
        x0: 0,
        y0: 0,
        width,
        height,
        gridWidth: width,
        gridHeight: height,
        ...affineLattice(5.5, 1.21, 0.07, 27.25, -0.05, 1.13),
      };
      const stops = Float64Array.from(ELEVATION_TINT_STOPS.flatMap((stop) => [stop.elevationM, ...stop.rgb]));
      const task: TileTask = { layers: [layer], cellSizeM: 12, sun: SUN, stops, shadowFloor: 0.3, shadeGain: 0.805 };
      const wholeBytes = Buffer.from(renderTilePng(task));
      const whole = PNG.sync.read(wholeBytes);
      let transparent = 0;
      for (let k = 3; k < whole.data.length; k += 4) if (whole.data[k] === 0) transparent++;
      expect(transparent > 0).toBe(hole !== undefined);
      for (const cuts of [
        [0, 128, 256],
        [0, 1, 100, 255, 256],
      ]) {
        const parts = cuts.slice(1).map((end, k) => renderTileRows(task, cuts[k]!, end));
        expect(Buffer.from(pngFromParts(parts, task)).equals(wholeBytes)).toBe(true);
      }
    }
  });

  it('keeps a pixel whose colour is black opaque: only pixels without data take the transparent entry', () => {
    const elevations = Float64Array.from(relief(SAMPLES_PX, SAMPLES_PX, [10, 10, 20, 20]));
    const black = Float64Array.from([0, 0, 0, 0]);

    const rgb = shadeAndTint(elevations, 10, SUN, black, 0.3, 0.8);
    const codes = shadeCodes(elevations, 10, SUN, black);
    const png = PNG.sync.read(Buffer.from(encodeTileCodes(codes, 256, 256, { stops: black, shadowFloor: 0.3, shadeGain: 0.8 })));

    const pixel = (i: number, j: number) => [...png.data.subarray((j * 256 + i) * 4, (j * 256 + i) * 4 + 4)];
    // The RGB rendering marks no data with black, so a black pixel with data becomes (0, 0, 1) there.
    expect([...rgb.subarray((100 * 256 + 100) * 3, (100 * 256 + 100) * 3 + 3)]).toEqual([0, 0, 1]);
    expect(pixel(100, 100)).toEqual([0, 0, 0, 255]);
    expect(pixel(12, 12)).toEqual([0, 0, 0, 0]);
  });

  it('shades and tints exactly like hillshade.ts and elevation-tint.ts, black where there is no data', () => {
    const elevations = Float64Array.from(relief(SAMPLES_PX, SAMPLES_PX, [100, 120, 140, 150]));
    const stops = Float64Array.from(ELEVATION_TINT_STOPS.flatMap((stop) => [stop.elevationM, ...stop.rgb]));
    const cellSizeM = 7.5;

    const pixels = shadeAndTint(elevations, cellSizeM, SUN, stops, 0.3, 0.7 * 1.15);

    let differing = 0;
    const rgb = new Uint8Array(3);
    for (let j = 0; j < 256; j++) {
      for (let i = 0; i < 256; i++) {
        const out = (j * 256 + i) * 3;
        const e = elevations[(j + 1) * SAMPLES_PX + i + 1]!;
        let expected = [0, 0, 0];
        if (!Number.isNaN(e)) {
          const light = 0.3 + 0.7 * 1.15 * shade(hornGradient(elevations, SAMPLES_PX, SAMPLES_PX, i + 1, j + 1, cellSizeM, cellSizeM), SUN);
          tintInto(e, rgb, 0);
          expected = [...rgb].map((v) => Math.trunc(Math.min(255, v * light)));
        }
        if (expected.some((v, k) => pixels[out + k] !== v)) differing++;
      }
    }

    expect(differing).toBe(0);
  });

  it('encodes a tile as a palette PNG of at most 256 colours, close to its pixels and transparent exactly where there is no data', () => {
    // Relief with a hole and a grid edge, tinted with the map's stops: tens of thousands of colours.
    const elevations = Float64Array.from(relief(SAMPLES_PX, SAMPLES_PX, [100, 120, 140, 150]));
    const rgb = shadeAndTint(elevations, 7.5, SUN, MAP_STOPS, 0.3, 0.7 * 1.15);
    const colours = new Set<number>();
    for (let p = 0; p < rgb.length; p += 3) colours.add((rgb[p]! << 16) | (rgb[p + 1]! << 8) | rgb[p + 2]!);

    const bytes = Buffer.from(encodeTileCodes(shadeCodes(elevations, 7.5, SUN, MAP_STOPS), 256, 256, MAP_COLOURS));
    // pngjs (npm) decodes it independently: CRCs, chunk order, palette and tRNS all have to be right.
    const png = PNG.sync.read(bytes);

    expect(colours.size).toBeGreaterThan(1000);
    expect(bytes[25]).toBe(3); // IHDR colour type: indexed
    const plteLength = bytes.readUInt32BE(33 + 0);
    expect(bytes.toString('latin1', 37, 41)).toBe('PLTE');
    expect(plteLength / 3).toBeLessThanOrEqual(256);
    const error = colourError(rgb, png.data);
    expect(error.wrongAlpha).toBe(0);
    expect(error.opaque).toBe(256 * 256 - 40 * 30);
    // On this steep relief spanning 1 400 m (the demo's tiles: 1.7 on average, 0.7–2.4 per tile):
    // a mean error under 2.5 levels of 255 per channel; the worst pixel is one the dither sent to
    // the neighbouring tint class (the demo's: 28).
    expect(error.mean).toBeLessThan(2.5);
    expect(error.worst).toBeLessThanOrEqual(32);
  });

  it('decodes pixels of known elevations to their tint times their light', () => {
    // Flat ground, left half at 1 000 m, right half at 1 800 m (two tint stops).
    const elevations = new Float64Array(SAMPLES_PX * SAMPLES_PX);
    for (let j = 0; j < SAMPLES_PX; j++) for (let i = 0; i < SAMPLES_PX; i++) elevations[j * SAMPLES_PX + i] = i < 129 ? 1000 : 1800;

    const png = PNG.sync.read(Buffer.from(encodeTileCodes(shadeCodes(elevations, 10, SUN, MAP_STOPS), 256, 256, MAP_COLOURS)));

    // Flat ground takes cos 45° of the sun's light, 0.3 + 0.805 · 0.7071 = 0.869 of the tint:
    // 0.869 × (178, 186, 118) (the 1 000 m stop) and 0.869 × (196, 150, 108) (the 1 800 m stop),
    // within the one level that keeping the illumination in 8 bits allows.
    const within = (actual: number[], wanted: number[]) => actual.every((v, k) => Math.abs(v - wanted[k]!) <= 1);
    expect(within(rgbAt(png.data, 40, 100), [154, 161, 102])).toBe(true);
    expect(within(rgbAt(png.data, 200, 100), [170, 130, 93])).toBe(true);
    expect(within(rgbAt(png.data, 200, 100), [154, 161, 102])).toBe(false);
  });

  it('decodes pixels of known slopes to their light: sunlit slopes brighter, slopes facing away darker', () => {
    // One tint throughout (a single stop), so the palette is all shade levels. Rows 0–99 face
    // west (rising 3 m per 10 m pixel eastwards), rows 100–199 are flat, rows 200–255 face east.
    const stops = Float64Array.from([0, 200, 160, 120]);
    const elevations = new Float64Array(SAMPLES_PX * SAMPLES_PX);
    for (let j = 0; j < SAMPLES_PX; j++) {
      const rise = j <= 100 ? 3 : j <= 200 ? 0 : -3;
      for (let i = 0; i < SAMPLES_PX; i++) elevations[j * SAMPLES_PX + i] = 1500 + rise * i;
    }

    const png = PNG.sync.read(Buffer.from(encodeTileCodes(shadeCodes(elevations, 10, SUN, stops), 256, 256, { ...MAP_COLOURS, stops })));

    const colour = (dzdx: number) => {
      const light = 0.3 + 0.7 * 1.15 * shade({ dzdx, dzdy: 0 }, SUN);
      return [200, 160, 120].map((v) => Math.trunc(Math.min(255, v * light)));
    };
    const within = (actual: number[], wanted: number[]) => actual.every((v, k) => Math.abs(v - wanted[k]!) <= 1);
    expect(within(rgbAt(png.data, 128, 50), colour(0.3))).toBe(true);
    expect(within(rgbAt(png.data, 128, 150), colour(0))).toBe(true);
    expect(within(rgbAt(png.data, 128, 230), colour(-0.3))).toBe(true);
    expect(rgbAt(png.data, 128, 50)[0]).toBeGreaterThan(rgbAt(png.data, 128, 150)[0]! + 15);
    expect(rgbAt(png.data, 128, 230)[0]).toBeLessThan(rgbAt(png.data, 128, 150)[0]! - 15);
  });

  it('dithers a long gentle slope between its tint classes, so 4 × 4 blocks keep their mean colour (no contour bands)', () => {
    // 0 to 3 100 m from west to east in flat light: 24 tint classes at most across eight tint
    // stops, some 13 levels of colour each, and the pixels in between dithered.
    const elevations = new Float64Array(SAMPLES_PX * SAMPLES_PX);
    for (let j = 0; j < SAMPLES_PX; j++) for (let i = 0; i < SAMPLES_PX; i++) elevations[j * SAMPLES_PX + i] = 12 * i;
    const flatLight = { ...SUN, zFactor: 0 };
    const rgb = shadeAndTint(elevations, 10, flatLight, MAP_STOPS, 0.3, 0.805);
    const png = PNG.sync.read(Buffer.from(encodeTileCodes(shadeCodes(elevations, 10, flatLight, MAP_STOPS), 256, 256, MAP_COLOURS)));

    let blockError = 0;
    let blocks = 0;
    for (let by = 0; by < 256; by += 4) {
      for (let bx = 0; bx < 256; bx += 4) {
        for (let c = 0; c < 3; c++) {
          let difference = 0;
          for (let j = by; j < by + 4; j++)
            for (let i = bx; i < bx + 4; i++) difference += png.data[(j * 256 + i) * 4 + c]! - rgb[(j * 256 + i) * 3 + c]!;
          blockError += Math.abs(difference) / 16;
          blocks++;
        }
      }
    }
    // Single pixels are up to a class's step off (the dither); the blocks' means 0.67 levels on
    // average (1.2 without the dither, each pixel its nearest class).
    expect(colourError(rgb, png.data).worst).toBeGreaterThan(5);
    expect(blockError / blocks).toBeLessThan(0.8);
  });

  it('encodes a tile without data as a small, fully transparent PNG', () => {
    const codes = new Uint32Array(256 * 256).fill(NO_DATA_CODE);
    const bytes = Buffer.from(encodeTileCodes(codes, 256, 256, MAP_COLOURS));
    const png = PNG.sync.read(bytes);

    expect(bytes.length).toBeLessThan(200);
    expect(png.data.every((value, k) => k % 4 !== 3 || value === 0)).toBe(true);
  });

  it('names its encoding: a change in the palette or the indices of a tile needs a new TILE_ENCODING', () => {
    // The decoded palette and indices of a fixed tile (not the deflated bytes, which depend on
    // zlib's version), pinned together with the encoding's name: if this fails because the
    // kernel's output changed on purpose, give TILE_ENCODING a new name (so no disk cache or
    // browser serves a tile of the old encoding) and pin the new digest here.
    const elevations = Float64Array.from(relief(SAMPLES_PX, SAMPLES_PX, [100, 120, 140, 150]));
    const bytes = Buffer.from(encodeTileCodes(shadeCodes(elevations, 7.5, SUN, MAP_STOPS), 256, 256, MAP_COLOURS));
    const digest = createHash('sha256')
      .update(chunkData(bytes, 'PLTE'))
      .update(inflateSync(chunkData(bytes, 'IDAT')))
      .digest('hex');

    expect({ encoding: TILE_ENCODING, digest: digest.slice(0, 16) }).toEqual({
      encoding: 'tint24-shade-dither4-sub-deflate1',
      digest: '5f1074a9dc6dd225',
    });
  });
});

const MAP_STOPS = Float64Array.from(ELEVATION_TINT_STOPS.flatMap((stop) => [stop.elevationM, ...stop.rgb]));
const MAP_COLOURS = { stops: MAP_STOPS, shadowFloor: 0.3, shadeGain: 0.7 * 1.15 };

/** Mean and worst difference per channel (levels of 255) over the opaque pixels of `rgb`, and pixels of the wrong transparency. */
function colourError(rgb: Uint8Array, rgba: Uint8Array): { mean: number; worst: number; opaque: number; wrongAlpha: number } {
  let worst = 0;
  let sum = 0;
  let opaque = 0;
  let wrongAlpha = 0;
  for (let k = 0; k < 256 * 256; k++) {
    const empty = rgb[3 * k] === 0 && rgb[3 * k + 1] === 0 && rgb[3 * k + 2] === 0;
    if (rgba[4 * k + 3] !== (empty ? 0 : 255)) wrongAlpha++;
    if (empty) continue;
    opaque++;
    for (let c = 0; c < 3; c++) {
      const error = Math.abs(rgba[4 * k + c]! - rgb[3 * k + c]!);
      worst = Math.max(worst, error);
      sum += error;
    }
  }
  return { mean: sum / (3 * opaque), worst, opaque, wrongAlpha };
}

/** RGB of pixel (i, j) of decoded RGBA. */
function rgbAt(rgba: Uint8Array, i: number, j: number): number[] {
  return [...rgba.subarray((j * 256 + i) * 4, (j * 256 + i) * 4 + 3)];
}

/** The data of a PNG's chunks of one type, joined. */
function chunkData(png: Buffer, type: string): Buffer {
  const parts: Buffer[] = [];
  for (let offset = 8; offset < png.length;) {
    const length = png.readUInt32BE(offset);
    if (png.toString('latin1', offset + 4, offset + 8) === type) parts.push(png.subarray(offset + 8, offset + 8 + length));
    offset += 12 + length;
  }
  return Buffer.concat(parts);
}

describe.skipIf(!hasGdal)('tile kernel hillshade against gdaldem', () => {
  const temp = tempDir();
  const path = join(temp.dir, 'relief.tif');
  afterAll(() => temp.remove());

  it('matches gdaldem hillshade within one grey level', () => {
    const width = 120;
    const height = 90;
    writeSyntheticGrid({
      path,
      epsg: 32632,
      geoTransform: [600000, 20, 0, 5170000, 0, -20],
      widthPx: width,
      heightPx: height,
      dataType: 'Float32',
    });
    gdal('gdaldem', ['hillshade', '-q', '-az', '315', '-alt', '45', path, join(temp.dir, 'shade.tif')]);
    const { z, out } = python<{ z: number[]; out: number[] }>(
      `
import sys, json
from osgeo import gdal
a = gdal.Open(sys.argv[1]).ReadAsArray(); b = gdal.Open(sys.argv[2]).ReadAsArray()
print(json.dumps({'z': a.astype(float).ravel().tolist(), 'out': b.astype(float).ravel().tolist()}))`,
      [path, join(temp.dir, 'shade.tif')],
    );
    // Sample i, j sits on the centre of grid pixel (i − 1, j − 1); the window has the renderer's
    // one-pixel NaN margin.
    const window = new Float32Array((width + 2) * (height + 2)).fill(NaN);
    for (let r = 0; r < height; r++) window.set(z.slice(r * width, (r + 1) * width), (r + 1) * (width + 2) + 1);
    const layer: TileLayer = {
      window,
      x0: -1,
      y0: -1,
      width: width + 2,
      height: height + 2,
      gridWidth: width,
      gridHeight: height,
      ...affineLattice(-0.5, 1, 0, -0.5, 0, 1),
    };
    const flat = Float64Array.from([0, 254, 254, 254]);

    const pixels = shadeAndTint(sampleTileElevations([layer]), 20, SUN, flat, 0, 1);

    let worst = 0;
    for (let r = 1; r < height - 1; r++) {
      for (let c = 1; c < width - 1; c++) {
        const red = pixels[(r * 256 + c) * 3]!;
        worst = Math.max(worst, Math.abs(1 + red - out[r * width + c]!));
      }
    }
    expect(worst).toBeLessThanOrEqual(1);
  });
});
