// Terrain benchmark: sampling, tile rendering and ingestion memory, each against GDAL doing the
// same job on the same machine. Not a test: it prints figures for the README.
//
//   node --import tsx scripts/bench-terrain.ts            (all parts; data cached in .var/bench)
//   node --import tsx scripts/bench-terrain.ts sampling tiles
//
// Needs gdal-bin and python3-gdal (Debian). The ingestion part also needs the private PostgreSQL
// (`node scripts/db.mjs start`); it starts the real API on a free port and uploads a 1 GB file.
import { execFileSync, spawn } from 'node:child_process';
import { createReadStream, existsSync, mkdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { createServer } from 'node:net';
import { join, resolve } from 'node:path';
import { performance } from 'node:perf_hooks';
import proj4 from 'proj4';
import { BlockStore, type TerrainSource } from '../api/terrain/raster/block-store';
import { lookupEpsg } from '../api/terrain/raster/crs-registry';
import { sampleFromModels } from '../api/terrain/raster/elevation-sampler';
import { PyramidBuilder } from '../api/terrain/ingestion/terrain-pyramid';
import type { ReadyTerrain } from '../api/terrain/terrain-runtime';
import { TileCache } from '../api/terrain/tiles/tile-cache';
import { renderTerrainTile } from '../api/terrain/tiles/tile-renderer';

const BENCH_DIR = resolve('.var/bench');
const PYTHON = existsSync('/usr/bin/python3') ? '/usr/bin/python3' : 'python3';
const SIZE_PX = 10_000;
const PIXEL_M = 10;
const ORIGIN: [number, number] = [600_000, 5_200_000];
const ROUTE_POINTS = 100_000;
/** Each measurement is repeated, ours and GDAL's alternating, and the medians are reported. */
const RUNS = 3;
/** Tile runs are short (a second or two) and move more with the machine's other load: more of them. */
const TILE_RUNS = 5;
/** Passes over a zoom's tiles within one run (see benchTiles). */
const PASSES = 4;
const parts = new Set(process.argv.slice(2).length ? process.argv.slice(2) : ['sampling', 'tiles', 'ingestion']);
const results: string[] = [];

mkdirSync(BENCH_DIR, { recursive: true });
const bigTiff = join(BENCH_DIR, 'dem-10000-float32-deflate.tif');
ensureBigTiff();
const source = benchSource();
const blocks = () => new BlockStore({ cacheBytes: 256 * 1024 * 1024, threads: 2 });

if (parts.has('sampling')) await benchSampling();
if (parts.has('tiles')) await benchTiles();
if (parts.has('ingestion')) await benchIngestion();

console.log('\n## Terrain benchmark results\n');
console.log(
  `Machine: ${execFileSync('nproc').toString().trim()} cores, Node ${process.version}, GDAL ${execFileSync('gdalinfo', ['--version']).toString().trim()}\n`,
);
for (const line of results) console.log(line);
process.exit(0);

// ---------------------------------------------------------------------------------------------

async function benchSampling(): Promise<void> {
  const route = routeThroughGrid(ROUTE_POINTS);
  const routeFile = join(BENCH_DIR, 'route.json');
  writeFileSync(routeFile, JSON.stringify(route));

  // Ours and GDAL's alternate, each from the same state: a fresh process (GDAL) or a fresh block
  // cache whose threads have started (ours; thread start-up, like the interpreter's, is not timed).
  const coldRuns: number[] = [];
  const warmRuns: number[] = [];
  const gdalRuns: number[] = [];
  let ours: Array<number | null> = [];
  let gdal = { seconds: 0, values: [] as Array<number | null> };
  for (let run = 0; run < RUNS; run++) {
    const store = blocks();
    await store.startThreads();
    const started = performance.now();
    ours = await sampleFromModels(store, [source], route, 'bilinear');
    coldRuns.push(performance.now() - started);
    const warmStart = performance.now();
    await sampleFromModels(store, [source], route, 'bilinear');
    warmRuns.push(performance.now() - warmStart);
    await store.close();

    // GDAL doing the same job: osr transforms the points, the needed 256 × 256 blocks are read
    // with ReadAsArray (GDAL decodes them), bilinear in numpy.
    gdal = JSON.parse(
      execFileSync(PYTHON, ['-c', gdalSamplerScript(), bigTiff, routeFile], { maxBuffer: 64 * 1024 * 1024 }).toString(),
    ) as { seconds: number; values: Array<number | null> };
    gdalRuns.push(gdal.seconds * 1000);
  }
  const coldMs = median(coldRuns);
  const warmMs = median(warmRuns);
  let worst = 0;
  ours.forEach((value, i) => {
    const reference = gdal.values[i];
    if (value !== null && reference !== null && reference !== undefined)
      worst = Math.max(worst, Math.abs(value - reference) / Math.abs(reference));
  });
  const gdalMs = median(gdalRuns);
  results.push(
    `Sampling ${ROUTE_POINTS.toLocaleString('en')} route points (bilinear, UTM, 10 000 × 10 000 Float32 tiled DEFLATE): ` +
      `ours ${coldMs.toFixed(0)} ms cold / ${warmMs.toFixed(0)} ms with decoded blocks cached; ` +
      `GDAL (python3-gdal, same windows) ${gdalMs.toFixed(0)} ms; ratio ${(coldMs / gdalMs).toFixed(2)}× (goal ≤ 2×); ` +
      `largest relative difference ${worst.toExponential(1)}; medians of ${RUNS} alternating runs ` +
      `(ours cold ${runList(coldRuns)} ms, GDAL ${runList(gdalRuns)} ms)`,
  );
}

async function benchTiles(): Promise<void> {
  // Reduced pyramid, as ingestion builds it (timed: it is most of ingestion).
  const overviewDir = join(BENCH_DIR, 'overviews');
  rmSync(overviewDir, { recursive: true, force: true });
  mkdirSync(overviewDir, { recursive: true });
  const store = blocks();
  const pyramidStart = performance.now();
  const pyramid = await PyramidBuilder.create(overviewDir, SIZE_PX, SIZE_PX);
  for (let row = 0; row < SIZE_PX; row += 512) {
    const rows = Math.min(512, SIZE_PX - row);
    await pyramid.addRows(await store.window(source, [0, row, SIZE_PX, row + rows]), rows);
  }
  source.overviews = await pyramid.finish();
  source.overviewDir = overviewDir;
  const pyramidMs = performance.now() - pyramidStart;
  await store.close();
  results.push(`Pyramid build during ingestion (decode + 2× reductions of 10⁸ pixels): ${(pyramidMs / 1000).toFixed(1)} s`);

  // gdaldem hillshade over the whole grid (GDAL's time per pixel) alternating with our tiles.
  // Ours run as in a serving API: one block store whose threads have started (start-up, ≈ 0.2 s
  // per process, is not a tile's cost); "cold" is each zoom with nothing of the model decoded or
  // cached (block cache emptied, worker file handles and overview files closed, tile cache
  // empty). Medians over the runs.
  const zooms = [10, 14] as const;
  const stealStart = cpuTimes();
  const gdalRuns: number[] = [];
  const runs = new Map(zooms.map((zoom) => [zoom, { cold: [] as number[], warm: [] as number[], fromCache: [] as number[] }]));
  const hillshadeOut = join(BENCH_DIR, 'gdaldem-hillshade.tif');
  const renderStore = blocks();
  await renderStore.startThreads();
  for (let run = 0; run < TILE_RUNS; run++) {
    const gdalStart = performance.now();
    execFileSync('gdaldem', ['hillshade', '-q', bigTiff, hillshadeOut, '-az', '315', '-alt', '45']);
    gdalRuns.push(((performance.now() - gdalStart) * 1e6) / (SIZE_PX * SIZE_PX));
    rmSync(hillshadeOut, { force: true });

    for (const zoom of zooms) {
      const tiles = tilesOver(zoom, tileCount(zoom));
      const cacheDir = join(BENCH_DIR, `tiles-${zoom}`);
      const cache = new TileCache(cacheDir, 16 * 1024 ** 3);
      // Each run renders the tiles PASSES times over (cold: from nothing each time), so that a
      // run lasts about as long as a gdaldem run rather than a tenth of a second.
      let coldMs = 0;
      for (let pass = 0; pass < PASSES; pass++) {
        rmSync(cacheDir, { recursive: true, force: true });
        await renderStore.forget(source);
        // As the server does: each tile is written to the disk cache after it is served, while
        // the next one renders (so the writes' work counts); the cold time ends with the last
        // tile served.
        const coldStart = performance.now();
        const writes: Array<Promise<void>> = [];
        for (const [x, y] of tiles) {
          const png = await renderTerrainTile(renderStore, [source], zoom, x, y);
          if (png) writes.push(cache.write('bench', zoom, x, y, png));
        }
        coldMs += performance.now() - coldStart;
        await Promise.all(writes);
      }
      // The same tiles again with their blocks decoded and cached (the tile cache not consulted).
      const warmStart = performance.now();
      for (let pass = 0; pass < PASSES; pass++) for (const [x, y] of tiles) await renderTerrainTile(renderStore, [source], zoom, x, y);
      const warmMs = (performance.now() - warmStart) / PASSES;
      coldMs /= PASSES;
      const cachedStart = performance.now();
      for (const [x, y] of tiles) await cache.read('bench', zoom, x, y);
      const cachedMs = performance.now() - cachedStart;
      const nsPerPx = (ms: number) => (ms * 1e6) / (tiles.length * 256 * 256);
      const zoomRuns = runs.get(zoom)!;
      zoomRuns.cold.push(nsPerPx(coldMs));
      zoomRuns.warm.push(nsPerPx(warmMs));
      zoomRuns.fromCache.push(tiles.length / (cachedMs / 1000));
    }
  }
  await renderStore.close();
  results.push(`CPU time taken by the host from this machine (steal) during the tile runs: ${stealShare(stealStart, cpuTimes())}`);
  const gdalNsPerPx = median(gdalRuns);
  for (const zoom of zooms) {
    const count = tileCount(zoom);
    const { cold, warm, fromCache } = runs.get(zoom)!;
    const tilesPerS = (nsPerPx: number) => (1e9 / (nsPerPx * 256 * 256)).toFixed(1);
    results.push(
      `Tiles at zoom ${zoom} (${count} tiles, one at a time, ${PASSES} passes per run): ` +
        `cold ${tilesPerS(median(cold))} tiles/s = ${median(cold).toFixed(0)} ns per output pixel ` +
        `(decode, reprojection, hillshade, tint, PNG; ratio ${(median(cold) / gdalNsPerPx).toFixed(2)}×), ` +
        `blocks cached ${tilesPerS(median(warm))} tiles/s = ${median(warm).toFixed(0)} ns per pixel ` +
        `(ratio ${(median(warm) / gdalNsPerPx).toFixed(2)}×), ` +
        `${median(fromCache).toFixed(0)} tiles/s from the disk tile cache; ` +
        `gdaldem hillshade ${gdalNsPerPx.toFixed(1)} ns per pixel (goal ≤ 2×); medians of ${TILE_RUNS} alternating runs ` +
        `(cold ${runList(cold)}, cached ${runList(warm)}, gdaldem ${runList(gdalRuns)} ns/px)`,
    );
  }
}

function tileCount(zoom: number): number {
  return zoom === 10 ? 16 : 48;
}

/** Linux's CPU time counters (all CPUs): total and steal (time the hypervisor gave to others). */
function cpuTimes(): { total: number; steal: number } {
  if (!existsSync('/proc/stat')) return { total: 0, steal: 0 };
  const fields = readFileSync('/proc/stat', 'utf8').split('\n')[0]!.trim().split(/\s+/).slice(1).map(Number);
  return { total: fields.slice(0, 8).reduce((sum, value) => sum + value, 0), steal: fields[7] ?? 0 };
}

function stealShare(start: { total: number; steal: number }, end: { total: number; steal: number }): string {
  const total = end.total - start.total;
  return total > 0 ? `${(((end.steal - start.steal) / total) * 100).toFixed(0)} %` : 'not measured';
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const middle = Math.floor(sorted.length / 2);
  return sorted.length % 2 === 1 ? sorted[middle]! : (sorted[middle - 1]! + sorted[middle]!) / 2;
}

function runList(values: number[]): string {
  return values.map((value) => value.toFixed(0)).join(' / ');
}

async function benchIngestion(): Promise<void> {
  const gigabyte = join(BENCH_DIR, 'dem-16000-float32-raw.tif');
  if (!existsSync(gigabyte)) {
    execFileSync('gdal_create', [
      '-of',
      'GTiff',
      '-outsize',
      '16000',
      '16000',
      '-bands',
      '1',
      '-ot',
      'Float32',
      '-burn',
      '1200',
      '-a_srs',
      'EPSG:32632',
      '-a_ullr',
      '500000',
      '5300000',
      '660000',
      '5140000',
      '-a_nodata',
      '-9999',
      '-co',
      'TILED=YES',
      gigabyte,
    ]);
  }
  const { databaseUrl, ensureDatabase } = (await import('./db.mjs')) as {
    databaseUrl: (name: string) => string;
    ensureDatabase: (name: string) => void;
  };
  execFileSync('psql', [databaseUrl('postgres'), '-qc', 'DROP DATABASE IF EXISTS descentry_bench WITH (FORCE)']);
  ensureDatabase('descentry_bench');
  const port = await freePort();
  const env = {
    ...process.env,
    NODE_ENV: 'development',
    PORT: String(port),
    PUBLIC_URL: `http://127.0.0.1:${port}`,
    DATABASE_URL: databaseUrl('descentry_bench'),
    SESSION_SECRET: 'bench-secret-bench-secret-bench-secret-00',
    DATA_DIR: join(BENCH_DIR, 'api-data'),
    WEB_DIR: '',
    RUN_WORKERS: 'true',
  };
  rmSync(env.DATA_DIR, { recursive: true, force: true });
  const server = spawn(process.execPath, ['--import', 'tsx', 'api/main.ts'], { env, stdio: ['ignore', 'ignore', 'inherit'] });
  try {
    await waitFor(async () => (await fetch(`${env.PUBLIC_URL}/api/health`).catch(() => null))?.ok === true, 60_000);
    const cookie = await signInAsAnalyst(env.DATABASE_URL, env.PUBLIC_URL);
    // The idle process (tsx, the API's modules; decoder threads start with the first decode).
    const idleKb = Number(/VmRSS:\s+(\d+)/.exec(readFileSync(`/proc/${server.pid}/status`, 'utf8'))?.[1] ?? 0);
    const started = performance.now();
    const upload = await uploadStreaming(`${env.PUBLIC_URL}/api/terrain`, gigabyte, cookie);
    const uploadMs = performance.now() - started;
    const { id } = JSON.parse(upload) as { id: string };
    let status = 'processing';
    await waitFor(async () => {
      const response = await fetch(`${env.PUBLIC_URL}/api/terrain/${id}`, { headers: { cookie } });
      status = ((await response.json()) as { status: string }).status;
      return status !== 'processing';
    }, 15 * 60_000);
    const totalMs = performance.now() - started;
    const peakKb = Number(/VmHWM:\s+(\d+)/.exec(readFileSync(`/proc/${server.pid}/status`, 'utf8'))?.[1] ?? 0);
    results.push(
      `Ingestion of a ${(statSync(gigabyte).size / 1e9).toFixed(2)} GB GeoTIFF (16 000 × 16 000 Float32) through POST /api/terrain: ` +
        `upload ${(uploadMs / 1000).toFixed(1)} s, ready after ${(totalMs / 1000).toFixed(1)} s (status ${status}); ` +
        `peak RSS of the API process ${(peakKb / 1024).toFixed(0)} MB (goal < 400 MB; ${(idleKb / 1024).toFixed(0)} MB idle before the upload)`,
    );
  } finally {
    server.kill('SIGTERM');
  }
}

// ---------------------------------------------------------------------------------------------

function ensureBigTiff(): void {
  if (existsSync(bigTiff)) return;
  console.log(`Writing ${bigTiff} with GDAL (once)…`);
  execFileSync(PYTHON, ['-c', gdalWriterScript(), bigTiff, String(SIZE_PX), String(PIXEL_M), String(ORIGIN[0]), String(ORIGIN[1])], {
    stdio: 'inherit',
  });
}

function benchSource(): ReadyTerrain {
  const crs = lookupEpsg(32632)!;
  const source: TerrainSource = {
    id: 'bench',
    version: 'v1',
    path: bigTiff,
    overviewDir: join(BENCH_DIR, 'overviews'),
    widthPx: SIZE_PX,
    heightPx: SIZE_PX,
    blockWidthPx: 256,
    blockHeightPx: 256,
    originX: ORIGIN[0],
    originY: ORIGIN[1],
    pixelSizeX: PIXEL_M,
    pixelSizeY: -PIXEL_M,
    resolutionM: PIXEL_M,
    proj4Definition: crs.proj4Definition,
    isGeographic: false,
    nodata: -9999,
    dataType: 'Float32',
    verticalScaleToM: 1,
    overviews: [],
  };
  return { ...source, name: 'bench', bbox: [-180, -90, 180, 90] };
}

/** A winding route at 10 m spacing that wanders across the grid (seeded, reproducible). */
function routeThroughGrid(count: number): Array<[number, number]> {
  const crs = lookupEpsg(32632)!;
  const toWgs84 = (x: number, y: number) => proj4Inverse(crs.proj4Definition, x, y);
  let seed = 42;
  const random = () => (seed = (seed * 1103515245 + 12345) % 2 ** 31) / 2 ** 31;
  let x = ORIGIN[0] + 5000;
  let y = ORIGIN[1] - 5000;
  let heading = 0.3;
  const extent = SIZE_PX * PIXEL_M;
  const points: Array<[number, number]> = [];
  for (let i = 0; i < count; i++) {
    heading += (random() - 0.5) * 0.15;
    x += 10 * Math.cos(heading);
    y += 10 * Math.sin(heading);
    if (x < ORIGIN[0] + 1000 || x > ORIGIN[0] + extent - 1000) heading = Math.PI - heading;
    if (y > ORIGIN[1] - 1000 || y < ORIGIN[1] - extent + 1000) heading = -heading;
    points.push(toWgs84(x, y));
  }
  return points;
}

function proj4Inverse(definition: string, x: number, y: number): [number, number] {
  return proj4(definition, 'EPSG:4326', [x, y]) as [number, number];
}

function tilesOver(zoom: number, count: number): Array<[number, number]> {
  const crs = lookupEpsg(32632)!;
  const [lon, lat] = proj4Inverse(crs.proj4Definition, ORIGIN[0] + (SIZE_PX * PIXEL_M) / 2, ORIGIN[1] - (SIZE_PX * PIXEL_M) / 2);
  const n = 2 ** zoom;
  const cx = Math.floor(((lon + 180) / 360) * n);
  const latRad = (lat * Math.PI) / 180;
  const cy = Math.floor(((1 - Math.log(Math.tan(latRad) + 1 / Math.cos(latRad)) / Math.PI) / 2) * n);
  const side = Math.ceil(Math.sqrt(count));
  const tiles: Array<[number, number]> = [];
  for (let j = 0; j < side && tiles.length < count; j++) {
    for (let i = 0; i < side && tiles.length < count; i++) tiles.push([cx - Math.floor(side / 2) + i, cy - Math.floor(side / 2) + j]);
  }
  return tiles;
}

async function signInAsAnalyst(databaseUrl: string, publicUrl: string): Promise<string> {
  const { createDatabase } = await import('../api/db/client');
  const { users } = await import('../api/db/schema/index');
  const { hashPassword } = await import('../api/auth/passwords');
  const { db, close } = createDatabase(databaseUrl, { max: 1 });
  const password = 'bench-password-0000';
  await db.insert(users).values({
    email: 'bench-analyst@descentry.example',
    name: 'Bench analyst',
    role: 'analyst',
    status: 'active',
    passwordHash: await hashPassword(password),
  });
  await close();
  const response = await fetch(`${publicUrl}/api/auth/login`, {
    method: 'POST',
    headers: { 'content-type': 'application/json' },
    body: JSON.stringify({ email: 'bench-analyst@descentry.example', password }),
  });
  return (response.headers.get('set-cookie') ?? '')
    .split(',')
    .map((c) => c.split(';')[0])
    .join('; ');
}

/** multipart/form-data streamed from disk (the benchmark itself must not hold the file either). */
async function uploadStreaming(url: string, path: string, cookie: string): Promise<string> {
  const boundary = `----descentry-bench-${Date.now()}`;
  const head = Buffer.from(
    `--${boundary}\r\nContent-Disposition: form-data; name="name"\r\n\r\nBench 1 GB\r\n` +
      `--${boundary}\r\nContent-Disposition: form-data; name="file"; filename="bench.tif"\r\nContent-Type: image/tiff\r\n\r\n`,
  );
  const tail = Buffer.from(`\r\n--${boundary}--\r\n`);
  const size = head.length + statSync(path).size + tail.length;
  async function* body() {
    yield head;
    for await (const chunk of createReadStream(path, { highWaterMark: 1024 * 1024 })) yield chunk as Buffer;
    yield tail;
  }
  const response = await fetch(url, {
    method: 'POST',
    headers: { cookie, 'content-type': `multipart/form-data; boundary=${boundary}`, 'content-length': String(size) },
    body: ReadableStream.from(body()),
    duplex: 'half',
  } as RequestInit & { duplex: 'half' });
  const text = await response.text();
  if (response.status !== 201) throw new Error(`upload answered ${response.status}: ${text}`);
  return text;
}

async function waitFor(check: () => Promise<boolean>, timeoutMs: number): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  while (!(await check())) {
    if (Date.now() > deadline) throw new Error('timed out');
    await new Promise((r) => setTimeout(r, 500));
  }
}

function freePort(): Promise<number> {
  return new Promise((resolvePort) => {
    const server = createServer();
    server.listen(0, '127.0.0.1', () => {
      const { port } = server.address() as { port: number };
      server.close(() => resolvePort(port));
    });
  });
}

/** python3-gdal: writes the 10 000 × 10 000 grid band by band. */
function gdalWriterScript(): string {
  return `
import sys
import numpy as np
from osgeo import gdal, osr
path, size, px, ox, oy = sys.argv[1], int(sys.argv[2]), float(sys.argv[3]), float(sys.argv[4]), float(sys.argv[5])
ds = gdal.GetDriverByName('GTiff').Create(path, size, size, 1, gdal.GDT_Float32, options=['TILED=YES', 'COMPRESS=DEFLATE', 'BIGTIFF=IF_SAFER'])
srs = osr.SpatialReference(); srs.ImportFromEPSG(32632); ds.SetProjection(srs.ExportToWkt())
ds.SetGeoTransform((ox, px, 0, oy, 0, -px))
band = ds.GetRasterBand(1); band.SetNoDataValue(-9999)
for r0 in range(0, size, 1024):
    rows = min(1024, size - r0)
    yy, xx = np.mgrid[r0:r0 + rows, 0:size]
    z = 1200 + 700 * np.sin(xx / 700.0) * np.cos(yy / 530.0) + 0.05 * xx - 0.03 * yy + 25 * np.sin((xx + yy) / 37.0)
    band.WriteArray(z.astype(np.float32), 0, r0)
ds = None
`;
}

/** python3-gdal doing the sampling job: the reference the ratio is taken against. */
function gdalSamplerScript(): string {
  return `
import sys, json, time, math
import numpy as np
from osgeo import gdal, osr
path, route = sys.argv[1], sys.argv[2]
points = json.load(open(route))
start = time.perf_counter()
ds = gdal.Open(path); band = ds.GetRasterBand(1); gt = ds.GetGeoTransform(); nodata = band.GetNoDataValue()
src = osr.SpatialReference(); src.ImportFromEPSG(4326); src.SetAxisMappingStrategy(osr.OAMS_TRADITIONAL_GIS_ORDER)
dst = osr.SpatialReference(); dst.ImportFromWkt(ds.GetProjection()); dst.SetAxisMappingStrategy(osr.OAMS_TRADITIONAL_GIS_ORDER)
xy = np.array(osr.CoordinateTransformation(src, dst).TransformPoints(points))
px = (xy[:, 0] - gt[0]) / gt[1] - 0.5; py = (xy[:, 1] - gt[3]) / gt[5] - 0.5
c0 = np.floor(px).astype(int); r0 = np.floor(py).astype(int); fx = px - c0; fy = py - r0
out = np.full(len(points), np.nan)
blocks = {}
def value(c, r):
    key = (c // 256, r // 256)
    block = blocks.get(key)
    if block is None:
        bx, by = key
        w = min(256, ds.RasterXSize - bx * 256); h = min(256, ds.RasterYSize - by * 256)
        block = band.ReadAsArray(bx * 256, by * 256, w, h).astype(np.float64)
        blocks[key] = block
    return block[r % 256, c % 256]
for i in range(len(points)):
    c, r = int(c0[i]), int(r0[i])
    v = [value(c, r), value(c + 1, r), value(c, r + 1), value(c + 1, r + 1)]
    out[i] = v[0]*(1-fx[i])*(1-fy[i]) + v[1]*fx[i]*(1-fy[i]) + v[2]*(1-fx[i])*fy[i] + v[3]*fx[i]*fy[i]
seconds = time.perf_counter() - start
print(json.dumps({'seconds': seconds, 'values': [None if math.isnan(v) else float(v) for v in out]}))
`;
}
