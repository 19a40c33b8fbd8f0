// Benchmark of the base map and the road graph (README, Benchmarks):
//
//   node --import tsx scripts/bench-basemap.ts [parts…]      parts: import tiles paths (default all)
//
// Needs `node scripts/db.mjs start` (it uses a database of its own, descentry_bench, created and
// emptied here), osm2pgsql and osmium-tool (Debian) and, for the tile comparison, GDAL's ogr2ogr.
//
// - import: synthetic street grids (generated here as OSM XML, written as .osm.pbf by osmium)
//   of three sizes go through the real pipeline (upload accepted → osm2pgsql → road graph →
//   ready); reports seconds and peak memory (this process and osm2pgsql, sampled every 50 ms)
//   per MB of .osm.pbf.
// - tiles: every zoom-14 tile and the zoom-12 tiles over the largest grid, rendered by the API's
//   renderBaseTile (cold: nothing cached in the API; PostgreSQL's own buffers warm, as in a
//   serving database) and read back from the API's tile cache, against ogr2ogr -f MVT (GDAL's
//   MVT driver) writing the same zoom from the same tables on the same machine.
// - paths: shortest-path queries per second (POST /api/road-network/path's engine) between
//   random points on the demo region's roads, and on the largest grid.
import { execFileSync, spawnSync } from 'node:child_process';
import { createWriteStream, mkdirSync, readdirSync, readFileSync, rmSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { sql } from 'drizzle-orm';
import { databaseUrl, ensureDatabase, pgSettings } from './db.mjs';
import { loadConfig } from '../api/config';
import { createDatabase } from '../api/db/client';
import { migrateDatabase } from '../api/db/migrate';
import { users } from '../api/db/schema/index';
import { acceptBasemapUpload, waitForInlineBasemapJobs } from '../api/basemap/basemap-service';
import { BaseTileCache, renderBaseTile } from '../api/basemap/base-tiles';
import { findRoadPath } from '../api/road-graph/road-graph-path';
import { runtimeOf } from '../api/app-runtime';
import { demoOsmExtractXml } from '../api/demo/demo-osm-extract';

const parts = process.argv.slice(2).length ? process.argv.slice(2) : ['import', 'tiles', 'paths'];
const WORK = '.var/bench/basemap';
mkdirSync(WORK, { recursive: true });
ensureDatabase('descentry_bench');
const url = databaseUrl('descentry_bench');
await migrateDatabase(url);
const config = loadConfig({
  ...process.env,
  DATABASE_URL: url,
  SESSION_SECRET: 'bench-secret-bench-secret-bench-secret-00',
  DATA_DIR: join(WORK, 'data'),
  NODE_ENV: 'test',
});
const { db, close } = createDatabase(url);
const deps = { db, config };
const [person] = await db
  .insert(users)
  .values({ email: `bench-${Date.now()}@bench.example`, name: 'Benchmark', role: 'analyst', status: 'active', passwordHash: 'x' })
  .returning();
const analyst = { id: person!.id, email: person!.email, name: person!.name, role: 'analyst' as const };

/** Grid sizes (blocks per side of 100 m) for the import runs; the last one is used for tiles and paths. */
const GRIDS = (process.env['BENCH_GRIDS'] ?? '100,200,300').split(',').map(Number);

async function main() {
  if (parts.includes('import')) await benchImports();
  if (parts.includes('tiles')) await benchTiles();
  if (parts.includes('paths')) await benchPaths();
  await runtimeOf(deps).close();
  await close();
}

// ---------------------------------------------------------------- import

async function benchImports() {
  console.log('\nImport (synthetic street grids, .osm.pbf through the upload pipeline)');
  console.log('| grid | .osm.pbf MB | nodes | ways | ready after s | s per MB | peak RSS osm2pgsql MB | peak RSS API process MB |');
  console.log('| --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: |');
  for (const blocks of GRIDS) {
    const pbf = await writeGridExtract(blocks);
    const sizeMb = statSync(pbf.path).size / 1024 ** 2;
    const upload = join(WORK, `upload-${blocks}.part`);
    writeFileSync(upload, readFileSync(pbf.path));
    const peaks = { osm2pgsql: 0, self: 0 };
    const sampler = setInterval(() => {
      peaks.self = Math.max(peaks.self, process.memoryUsage().rss);
      peaks.osm2pgsql = Math.max(peaks.osm2pgsql, rssOf('osm2pgsql'));
    }, 50);
    const started = performance.now();
    await acceptBasemapUpload(deps, analyst, { path: upload, size: statSync(upload).size, originalFileName: `grid-${blocks}.osm.pbf` });
    await waitForInlineBasemapJobs(deps);
    const seconds = (performance.now() - started) / 1000;
    clearInterval(sampler);
    const [row] = await db.execute<{ status: string; failure_reason: string | null }>(
      sql`SELECT status, failure_reason FROM basemap_imports ORDER BY created_at DESC LIMIT 1`,
    );
    if (row?.status !== 'ready') throw new Error(`import failed: ${row?.failure_reason}`);
    console.log(
      `| ${blocks} × ${blocks} blocks | ${sizeMb.toFixed(1)} | ${pbf.nodes.toLocaleString('en')} | ${pbf.ways.toLocaleString('en')} | ${seconds.toFixed(1)} | ${(seconds / sizeMb).toFixed(1)} | ${(peaks.osm2pgsql / 1024 ** 2).toFixed(0)} | ${(peaks.self / 1024 ** 2).toFixed(0)} |`,
    );
  }
}

/** Resident memory of every process with this command name, bytes (from /proc). */
function rssOf(command: string): number {
  let total = 0;
  for (const pid of readdirSync('/proc').filter((name) => /^\d+$/.test(name))) {
    try {
      if (readFileSync(`/proc/${pid}/comm`, 'utf8').trim() !== command) continue;
      const match = /VmRSS:\s+(\d+) kB/.exec(readFileSync(`/proc/${pid}/status`, 'utf8'));
      if (match) total += Number(match[1]) * 1024;
    } catch {
      // Expected: the process ended between listing and reading.
    }
  }
  return total;
}

/**
 * A street grid as OSM XML (then .osm.pbf with osmium): `blocks` × `blocks` blocks of 100 m with
 * a node every 25 m, every tenth street a secondary road, every seventh one-way, a land-use area
 * per block, a stream along every twentieth street, a village every 20 × 20 blocks. Placed near
 * 10° E 47° N; deterministic.
 */
async function writeGridExtract(blocks: number): Promise<{ path: string; nodes: number; ways: number }> {
  const pbfPath = join(WORK, `grid-${blocks}.osm.pbf`);
  const xmlPath = join(WORK, `grid-${blocks}.osm`);
  const metresPerDegLat = 111_320;
  const metresPerDegLon = metresPerDegLat * Math.cos((47 * Math.PI) / 180);
  // Surveyed positions are never on a perfect grid: up to ±4 m of deterministic jitter, which
  // also keeps the PBF's delta coding from packing the grid unrealistically small.
  let seed = blocks * 2_654_435_761;
  const jitter = () => {
    seed = (Math.imul(seed ^ (seed >>> 15), 2_246_822_519) + 3_266_489_917) | 0;
    return ((seed >>> 0) / 4_294_967_295 - 0.5) * 8;
  };
  const lon = (x: number) => (10 + (x + jitter()) / metresPerDegLon).toFixed(7);
  const lat = (y: number) => (47 + (y + jitter()) / metresPerDegLat).toFixed(7);
  const step = 25;
  const perSide = blocks * 4 + 1;
  const nodeId = (i: number, j: number) => i * perSide + j + 1;
  const out = createWriteStream(xmlPath);
  const lines: string[] = ['<?xml version="1.0" encoding="UTF-8"?>', '<osm version="0.6" generator="Descentry benchmark grid">'];
  const flush = () => {
    out.write(lines.join('\n') + '\n');
    lines.length = 0;
  };
  let nodes = 0;
  let ways = 0;
  // Street-grid nodes: only on streets (rows or columns that are multiples of 4).
  for (let i = 0; i < perSide; i++) {
    for (let j = 0; j < perSide; j++) {
      if (i % 4 !== 0 && j % 4 !== 0) continue;
      lines.push(`<node id="${nodeId(i, j)}" version="1" lat="${lat(i * step)}" lon="${lon(j * step)}"/>`);
      nodes++;
    }
    if (lines.length > 10_000) flush();
  }
  // Block corners for land use, inset 8 m, and village nodes.
  let extraId = perSide * perSide + 10;
  const blockNodes: number[][] = [];
  for (let bi = 0; bi < blocks; bi++) {
    for (let bj = 0; bj < blocks; bj++) {
      const x0 = bj * 100 + 8;
      const y0 = bi * 100 + 8;
      const ids = [extraId++, extraId++, extraId++, extraId++];
      lines.push(
        `<node id="${ids[0]}" version="1" lat="${lat(y0)}" lon="${lon(x0)}"/>`,
        `<node id="${ids[1]}" version="1" lat="${lat(y0)}" lon="${lon(x0 + 84)}"/>`,
        `<node id="${ids[2]}" version="1" lat="${lat(y0 + 84)}" lon="${lon(x0 + 84)}"/>`,
        `<node id="${ids[3]}" version="1" lat="${lat(y0 + 84)}" lon="${lon(x0)}"/>`,
      );
      nodes += 4;
      blockNodes.push(ids);
      if (bi % 20 === 10 && bj % 20 === 10) {
        lines.push(
          `<node id="${extraId++}" version="1" lat="${lat(y0 + 40)}" lon="${lon(x0 + 40)}"><tag k="place" v="village"/><tag k="name" v="Grid ${bi}-${bj}"/></node>`,
        );
        nodes++;
      }
    }
    if (lines.length > 10_000) flush();
  }
  let wayId = 1;
  for (let street = 0; street <= blocks; street++) {
    const index = street * 4;
    const highway = street % 10 === 0 ? 'secondary' : 'residential';
    const oneway = street % 7 === 3 ? '<tag k="oneway" v="yes"/>' : '';
    const row = Array.from({ length: perSide }, (_, j) => `<nd ref="${nodeId(index, j)}"/>`).join('');
    const column = Array.from({ length: perSide }, (_, i) => `<nd ref="${nodeId(i, index)}"/>`).join('');
    lines.push(`<way id="${wayId++}" version="1">${row}<tag k="highway" v="${highway}"/><tag k="name" v="Row ${street}"/>${oneway}</way>`);
    lines.push(`<way id="${wayId++}" version="1">${column}<tag k="highway" v="${highway}"/><tag k="name" v="Column ${street}"/></way>`);
    ways += 2;
    if (street % 20 === 5) {
      lines.push(`<way id="${wayId++}" version="1">${row}<tag k="waterway" v="stream"/></way>`);
      ways++;
    }
    if (lines.length > 2_000) flush();
  }
  const landuse = ['residential', 'forest', 'meadow', 'farmland', 'industrial'];
  blockNodes.forEach((ids, index) => {
    lines.push(
      `<way id="${wayId++}" version="1">${[...ids, ids[0]].map((id) => `<nd ref="${id}"/>`).join('')}<tag k="landuse" v="${landuse[index % landuse.length]}"/></way>`,
    );
    ways++;
    if (lines.length > 10_000) flush();
  });
  lines.push('</osm>');
  flush();
  await new Promise<void>((resolve) => out.end(resolve));
  execFileSync('osmium', ['cat', '--overwrite', xmlPath, '-o', pbfPath]);
  rmSync(xmlPath, { force: true });
  return { path: pbfPath, nodes, ways };
}

// ---------------------------------------------------------------- tiles

async function benchTiles() {
  runtimeOf(deps).activeBasemap.forget();
  const active = await runtimeOf(deps).activeBasemap.current();
  if (!active) throw new Error('Run the import part first: no active extract');
  const [extent] = await db.execute<{ w: number; s: number; e: number; n: number }>(
    sql`SELECT bbox_west AS w, bbox_south AS s, bbox_east AS e, bbox_north AS n FROM basemap_imports WHERE is_active`,
  );
  console.log(`\nTiles of the active extract (${active.schemaName}), API vs ogr2ogr -f MVT from the same tables`);
  console.log('| zoom | tiles | ours cold ms/tile | ours from the tile cache ms/tile | ogr2ogr ms/tile | ratio cold / GDAL |');
  console.log('| ---: | ---: | ---: | ---: | ---: | ---: |');
  for (const z of [12, 14]) {
    const tiles = tilesCovering(extent!, z);
    const cache = new BaseTileCache(512 * 1024 * 1024);
    // Warm PostgreSQL's buffers once (a serving database has them warm), then time cold API renders.
    for (const [x, y] of tiles) await renderBaseTile(db, active.schemaName, z, x, y);
    const coldStart = performance.now();
    for (const [x, y] of tiles) cache.set(active.version, z, x, y, await renderBaseTile(db, active.schemaName, z, x, y));
    const coldMs = (performance.now() - coldStart) / tiles.length;
    const cachedStart = performance.now();
    for (let pass = 0; pass < 20; pass++) for (const [x, y] of tiles) cache.get(active.version, z, x, y);
    const cachedMs = (performance.now() - cachedStart) / (20 * tiles.length);
    const gdalMs = ogr2ogrTiles(active.schemaName, z, extent!) / tiles.length;
    console.log(
      `| ${z} | ${tiles.length} | ${coldMs.toFixed(2)} | ${cachedMs.toFixed(4)} | ${gdalMs.toFixed(2)} | ${(coldMs / gdalMs).toFixed(2)}× |`,
    );
  }
}

function tilesCovering(box: { w: number; s: number; e: number; n: number }, z: number): Array<[number, number]> {
  const n = 2 ** z;
  const tx = (lon: number) => Math.floor(((lon + 180) / 360) * n);
  const ty = (lat: number) => {
    const r = (lat * Math.PI) / 180;
    return Math.floor(((1 - Math.log(Math.tan(r) + 1 / Math.cos(r)) / Math.PI) / 2) * n);
  };
  const tiles: Array<[number, number]> = [];
  for (let x = tx(box.w); x <= tx(box.e); x++) for (let y = ty(box.n); y <= ty(box.s); y++) tiles.push([x, y]);
  return tiles;
}

/** ogr2ogr writing one zoom of MVT tiles (a folder of .pbf) from the import's five tables; total ms. */
function ogr2ogrTiles(schemaName: string, z: number, box: { w: number; s: number; e: number; n: number }): number {
  const out = join(WORK, `ogr-mvt-${z}`);
  rmSync(out, { recursive: true, force: true });
  const { user, password, port } = pgSettings;
  const pg = `PG:host=127.0.0.1 port=${port} dbname=descentry_bench user=${user} password=${password} schemas=${schemaName} tables=landuse,water,waterways,roads,places`;
  const started = performance.now();
  const result = spawnSync(
    'ogr2ogr',
    [
      '-f',
      'MVT',
      out,
      pg,
      '-spat',
      String(box.w),
      String(box.s),
      String(box.e),
      String(box.n),
      '-spat_srs',
      'EPSG:4326',
      '-dsco',
      `MINZOOM=${z}`,
      '-dsco',
      `MAXZOOM=${z}`,
      '-dsco',
      'FORMAT=DIRECTORY',
      '-dsco',
      'COMPRESS=NO',
      '-dsco',
      'MAX_SIZE=5000000',
    ],
    { encoding: 'utf8' },
  );
  const ms = performance.now() - started;
  if (result.status !== 0) throw new Error(`ogr2ogr failed: ${result.stderr}`);
  return ms;
}

// ---------------------------------------------------------------- paths

async function benchPaths() {
  console.log('\nShortest paths (findRoadPath: snapping + pgr_withPoints + geometry), one at a time');
  console.log('| graph | edges | pairs | queries | queries per second | median ms |');
  console.log('| --- | ---: | --- | ---: | ---: | ---: |');
  // The largest grid (written by the import part), imported again to be the active graph.
  const grid = join(WORK, `grid-${GRIDS.at(-1)}.osm.pbf`);
  const upload = join(WORK, 'grid-again.part');
  writeFileSync(upload, readFileSync(grid));
  await acceptBasemapUpload(deps, analyst, { path: upload, size: statSync(upload).size, originalFileName: 'grid.osm.pbf' });
  await waitForInlineBasemapJobs(deps);
  await pathRun(`street grid ${GRIDS.at(-1)} × ${GRIDS.at(-1)}`, 200, 'near');
  await pathRun(`street grid ${GRIDS.at(-1)} × ${GRIDS.at(-1)}`, 20, 'any');
  // The demo region: its invented extract through the same pipeline.
  const demo = join(WORK, 'demo.part');
  writeFileSync(demo, demoOsmExtractXml());
  await acceptBasemapUpload(deps, analyst, { path: demo, size: statSync(demo).size, originalFileName: 'korvel-valley-demo.osm' });
  await waitForInlineBasemapJobs(deps);
  await pathRun('demo region (Korvel valley)', 400, 'any');
}

/** `near`: the two points of a pair lie 300 m to 2 km apart (clicks in the route editor); `any`: anywhere. */
async function pathRun(label: string, queries: number, spread: 'near' | 'any') {
  runtimeOf(deps).activeBasemap.forget();
  const active = (await runtimeOf(deps).activeBasemap.current())!;
  const s = sql.raw(`"${active.schemaName}"`);
  const [{ n } = { n: 0 }] = await db.execute<{ n: number }>(sql`SELECT count(*)::int AS n FROM ${s}.graph_edges`);
  // Points on the roads: the midpoints of up to 2 000 edges; pairs drawn from them by a fixed
  // rule (deterministic), `queries` of them.
  const points = [
    ...(await db.execute<{ lon: number; lat: number }>(sql`
    SELECT ST_X(p) AS lon, ST_Y(p) AS lat FROM (SELECT ST_LineInterpolatePoint(geom, 0.5) AS p FROM ${s}.graph_edges ORDER BY (id * 7919) % 104729 LIMIT 2000) q`)),
  ].map((row) => [row.lon, row.lat] as [number, number]);
  const metres = (a: [number, number], b: [number, number]) =>
    Math.hypot((a[0] - b[0]) * 111_320 * Math.cos((a[1] * Math.PI) / 180), (a[1] - b[1]) * 111_320);
  const pairs: Array<readonly [[number, number], [number, number]]> = [];
  for (let i = 0; pairs.length < queries && i < queries * 20; i++) {
    const from = points[(i * 7) % points.length]!;
    const to =
      spread === 'any'
        ? points[(i * 13 + 5) % points.length]!
        : points.find((candidate) => metres(from, candidate) >= 300 && metres(from, candidate) <= 2_000 && candidate !== from);
    if (to) pairs.push([from, to]);
  }
  const times: number[] = [];
  let found = 0;
  const started = performance.now();
  for (const [from, to] of pairs) {
    const t = performance.now();
    try {
      await findRoadPath(deps, { from, to });
      found++;
    } catch {
      // Expected now and then: one-way streets leave no path between two points.
    }
    times.push(performance.now() - t);
  }
  const seconds = (performance.now() - started) / 1000;
  times.sort((a, b) => a - b);
  console.log(
    `| ${label} | ${n.toLocaleString('en')} | ${spread === 'near' ? '300 m – 2 km apart' : 'anywhere'} | ${times.length} (${found} with a path) | ${(times.length / seconds).toFixed(1)} | ${times[Math.floor(times.length / 2)]!.toFixed(1)} |`,
  );
}

await main();
