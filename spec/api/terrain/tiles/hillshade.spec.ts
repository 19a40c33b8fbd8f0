import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { hornGradient, shade, shadeByte, slopeDeg, sunTerms } from '../../../../api/terrain/tiles/hillshade';
import { gdal, hasGdal, python, tempDir, writeSyntheticGrid } from '../support/gdal';

describe('hornGradient and slopeDeg', () => {
  it('gives 6.017° (10.54 %) on the engine README §6.5 worked example', () => {
    // a…i = 100 101 102 / 103 104 105 / 106 107 108, Δ = 30 m (rows run north → south)
    const grid = [100, 101, 102, 103, 104, 105, 106, 107, 108];

    const gradient = hornGradient(grid, 3, 3, 1, 1, 30, 30);

    expect(gradient.dzdx).toBeCloseTo(0.03333, 5);
    expect(gradient.dzdy).toBeCloseTo(0.1, 10);
    expect(slopeDeg(gradient)).toBeCloseTo(6.017, 3);
  });

  it('fills nodata neighbours with the centre and gives NaN for a nodata centre', () => {
    const grid = [NaN, 10, 10, 10, 10, 10, 10, 10, 10];

    expect(slopeDeg(hornGradient(grid, 3, 3, 1, 1, 10, 10))).toBe(0);
    expect(hornGradient([10, 10, 10, 10, NaN, 10, 10, 10, 10], 3, 3, 1, 1, 10, 10).dzdx).toBeNaN();
  });
});

/**
 * Our Horn slope and hillshade against `gdaldem slope` / `gdaldem hillshade` (GDAL 3.6, Debian)
 * on the same 20 m UTM grid, interior pixels. Tolerances: slope 0.001° (gdaldem writes Float32);
 * hillshade 1 grey level (gdaldem writes bytes, we keep the fraction).
 */
describe.skipIf(!hasGdal)('hillshade and slope against gdaldem', () => {
  const temp = tempDir();
  const path = join(temp.dir, 'relief.tif');
  writeSyntheticGridSafe();

  afterAll(() => temp.remove());

  it('matches gdaldem slope within 0.001°', () => {
    gdal('gdaldem', ['slope', '-q', path, join(temp.dir, 'slope.tif')]);
    const { z, out, w, h } = readPair(join(temp.dir, 'slope.tif'));

    let worst = 0;
    for (let r = 1; r < h - 1; r++) {
      for (let c = 1; c < w - 1; c++) {
        worst = Math.max(worst, Math.abs(slopeDeg(hornGradient(z, w, h, c, r, 20, 20)) - out[r * w + c]!));
      }
    }

    expect(worst).toBeLessThan(0.001);
  });

  it('matches gdaldem hillshade (sun 315°, 45°) within one grey level', () => {
    gdal('gdaldem', ['hillshade', '-q', '-az', '315', '-alt', '45', path, join(temp.dir, 'shade.tif')]);
    const { z, out, w, h } = readPair(join(temp.dir, 'shade.tif'));
    const sun = sunTerms({ azimuthDeg: 315, altitudeDeg: 45 });

    let worst = 0;
    for (let r = 1; r < h - 1; r++) {
      for (let c = 1; c < w - 1; c++) {
        worst = Math.max(worst, Math.abs(shadeByte(shade(hornGradient(z, w, h, c, r, 20, 20), sun)) - out[r * w + c]!));
      }
    }

    expect(worst).toBeLessThanOrEqual(1);
  });

  function writeSyntheticGridSafe() {
    if (!hasGdal) return;
    writeSyntheticGrid({
      path,
      epsg: 32632,
      geoTransform: [600000, 20, 0, 5170000, 0, -20],
      widthPx: 120,
      heightPx: 90,
      dataType: 'Float32',
    });
  }

  function readPair(outPath: string): { z: number[]; out: number[]; w: number; h: number } {
    return python(
      `
import sys, json
from osgeo import gdal
a = gdal.Open(sys.argv[1]).ReadAsArray(); b = gdal.Open(sys.argv[2]).ReadAsArray()
print(json.dumps({'z': a.astype(float).ravel().tolist(), 'out': b.astype(float).ravel().tolist(), 'w': a.shape[1], 'h': a.shape[0]}))`,
      [path, outPath],
    );
  }
});
