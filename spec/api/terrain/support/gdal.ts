import { execFileSync, spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';

/**
 * GDAL from Debian (gdal-bin, python3-gdal) as the outside reference for the terrain checks.
 * The test command installs both; a machine without gdalinfo skips these checks with a message.
 */
export const hasGdal = spawnSync('gdalinfo', ['--version'], { encoding: 'utf8' }).status === 0;
/** Debian's python3 (with osgeo) rather than whatever python3 comes first on PATH. */
export const PYTHON = existsSync('/usr/bin/python3') ? '/usr/bin/python3' : 'python3';

if (!hasGdal) {
  console.warn('[terrain specs] gdalinfo is not installed: the checks against GDAL are SKIPPED (apt-get install gdal-bin python3-gdal)');
}

export function gdal(command: string, args: string[]): string {
  return execFileSync(command, args, { encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
}

/** Runs a Python script with osgeo.gdal and returns its parsed JSON output. */
export function python<T>(script: string, args: string[] = []): T {
  const out = execFileSync(PYTHON, ['-c', script, ...args], { encoding: 'utf8', maxBuffer: 256 * 1024 * 1024 });
  return JSON.parse(out) as T;
}

export function tempDir(prefix = 'descentry-terrain-'): { dir: string; remove: () => void } {
  const dir = mkdtempSync(join(tmpdir(), prefix));
  return { dir, remove: () => rmSync(dir, { recursive: true, force: true }) };
}

export interface SyntheticGrid {
  path: string;
  epsg: number;
  /** GDAL geotransform: [originX, pixelX, 0, originY, 0, pixelY]. */
  geoTransform: [number, number, number, number, number, number];
  widthPx: number;
  heightPx: number;
  dataType: 'Int16' | 'Float32';
  nodata?: number;
  /** Rectangle [col0, row0, col1, row1) set to nodata. */
  hole?: [number, number, number, number];
  creationOptions?: string[];
  pixelIsPoint?: boolean;
  overviews?: boolean;
}

/**
 * Writes a GeoTIFF with python3-gdal: a smooth synthetic relief (valley + ridges + a linear
 * climb), so that every pixel differs from its neighbours and interpolation errors show.
 */
export function writeSyntheticGrid(grid: SyntheticGrid): void {
  const script = `
import sys, json
import numpy as np
from osgeo import gdal, osr
gdal.UseExceptions()
g = json.loads(sys.argv[1])
w, h = g['widthPx'], g['heightPx']
yy, xx = np.mgrid[0:h, 0:w]
z = 900 + 350*np.sin(xx/17.0) * np.cos(yy/13.0) + 4.5*xx - 2.75*yy + 40*np.sin((xx+yy)/5.3)
if g['dataType'] == 'Int16':
    z = np.round(z).astype(np.int16); gtype = gdal.GDT_Int16
else:
    z = z.astype(np.float32); gtype = gdal.GDT_Float32
if g.get('hole'):
    c0, r0, c1, r1 = g['hole']; z[r0:r1, c0:c1] = g['nodata']
opts = g.get('creationOptions') or []
mem = gdal.GetDriverByName('MEM').Create('', w, h, 1, gtype)
mem.SetGeoTransform(g['geoTransform'])
srs = osr.SpatialReference(); srs.ImportFromEPSG(g['epsg']); mem.SetProjection(srs.ExportToWkt())
band = mem.GetRasterBand(1)
if g.get('nodata') is not None: band.SetNoDataValue(g['nodata'])
band.WriteArray(z)
if g.get('pixelIsPoint'): mem.SetMetadataItem('AREA_OR_POINT', 'Point')
if g.get('overviews'): mem.BuildOverviews('AVERAGE', [2, 4])
out = gdal.GetDriverByName('GTiff').CreateCopy(g['path'], mem, options=opts + (['COPY_SRC_OVERVIEWS=YES'] if g.get('overviews') else []))
out = None
print('{}')
`;
  python(script, [JSON.stringify(grid)]);
}

/** `gdallocationinfo -wgs84 -valonly`, one point per call line (stdin mode answers all at once). */
export function gdalLocationValues(path: string, points: ReadonlyArray<readonly [number, number]>): Array<number | null> {
  const result = spawnSync('gdallocationinfo', ['-wgs84', '-valonly', path], {
    input: points.map(([lon, lat]) => `${lon} ${lat}`).join('\n') + '\n',
    encoding: 'utf8',
  });
  const lines = result.stdout.split('\n');
  return points.map((_, i) => {
    const text = (lines[i] ?? '').trim();
    return text === '' ? null : Number(text);
  });
}

/**
 * Bilinear reference from GDAL-read pixels: python3-gdal transforms each point into the grid
 * (osr, the same PROJ the GDAL tools use), reads the four surrounding pixel centres and
 * interpolates in double precision. Points whose four neighbours are not all inside and valid
 * come back null (they are checked separately).
 */
export function gdalBilinearReference(path: string, points: ReadonlyArray<readonly [number, number]>): Array<number | null> {
  const file = join(tmpdir(), `descentry-points-${process.pid}-${Date.now()}.json`);
  writeFileSync(file, JSON.stringify(points));
  const script = `
import sys, json, math
from osgeo import gdal, osr
gdal.UseExceptions()
ds = gdal.Open(sys.argv[1]); band = ds.GetRasterBand(1)
nodata = band.GetNoDataValue(); arr = band.ReadAsArray().astype('float64')
gt = ds.GetGeoTransform()
src = osr.SpatialReference(); src.ImportFromEPSG(4326); src.SetAxisMappingStrategy(osr.OAMS_TRADITIONAL_GIS_ORDER)
dst = osr.SpatialReference(); dst.ImportFromWkt(ds.GetProjection()); dst.SetAxisMappingStrategy(osr.OAMS_TRADITIONAL_GIS_ORDER)
ct = osr.CoordinateTransformation(src, dst)
pts = json.load(open(sys.argv[2]))
out = []
for lon, lat in pts:
    x, y, _ = ct.TransformPoint(lon, lat)
    px = (x - gt[0]) / gt[1] - 0.5; py = (y - gt[3]) / gt[5] - 0.5
    c0 = math.floor(px); r0 = math.floor(py); fx = px - c0; fy = py - r0
    if c0 < 0 or r0 < 0 or c0 + 1 >= ds.RasterXSize or r0 + 1 >= ds.RasterYSize:
        out.append(None); continue
    v = [arr[r0, c0], arr[r0, c0+1], arr[r0+1, c0], arr[r0+1, c0+1]]
    if nodata is not None and any(q == nodata for q in v):
        out.append(None); continue
    out.append(v[0]*(1-fx)*(1-fy) + v[1]*fx*(1-fy) + v[2]*(1-fx)*fy + v[3]*fx*fy)
print(json.dumps(out))
`;
  try {
    return python<Array<number | null>>(script, [path, file]);
  } finally {
    rmSync(file, { force: true });
  }
}

export interface GdalInfo {
  wgs84Extent?: { type: 'Polygon'; coordinates: number[][][] };
  bands: Array<{ minimum?: number; maximum?: number; computedMin?: number; computedMax?: number; noDataValue?: number }>;
  size: [number, number];
}

export function gdalInfo(path: string, stats = false): GdalInfo {
  return JSON.parse(gdal('gdalinfo', ['-json', ...(stats ? ['-stats'] : []), path])) as GdalInfo;
}
