/**
 * One import of an OpenStreetMap extract, run by the job queue:
 *
 * 1. reading + indexing: osm2pgsql (Debian's package, flex output, basemap-style.lua) reads the
 *    file from its standard input, so progress is the share of the file's bytes read, and
 *    writes the map tables into the import's own schema. Memory stays bounded whatever the
 *    extract's size: slim mode keeps node positions in PostgreSQL beyond a fixed cache
 *    (BASEMAP_IMPORT_CACHE_MB), and the temporary tables go once the import is done (--drop);
 * 2. road-graph: the roads a bus may use become the routable graph (road-graph-build.ts);
 * 3. generalising: simplified copies of large areas for small-scale tiles;
 * 4. terrain-grades: elevation along each edge from the uploaded terrain, where there is some;
 * 5. switching: in one transaction the reference network is joined to the new graph and the
 *    import becomes the active one. Until that commit the previous extract serves tiles and
 *    paths; afterwards its schema is dropped.
 *
 * A failure at any step drops the new schema and records the reason; the active extract is
 * untouched.
 */
import { spawn, type ChildProcess } from 'node:child_process';
import { createReadStream, existsSync } from 'node:fs';
import { rm } from 'node:fs/promises';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { createGunzip } from 'node:zlib';
import { eq, sql } from 'drizzle-orm';
import type { BasemapImportPhase } from '@shared/domain/basemap';
import type { AppDeps } from '../app-deps';
import { basemapImports } from '../db/schema/index';
import { buildImportedGraph, rebuildOverlay, schemaIdentifier } from '../road-graph/road-graph-build';
import { sampleEdgeElevations } from '../road-graph/road-graph-grades';
import { ROAD_GRAPH_LOCK } from '../road-graph/road-graph-lock';
import { claimBasemapImport, listRetiredSchemas, updateBasemapImport } from './basemap-repository';
import type { OsmFileFormat } from './osm-file';
import { runtimeOf } from '../app-runtime';

export const BASEMAP_IMPORT_JOB = 'basemap-import';
export interface BasemapImportJob {
  importId: string;
}

/** Where each phase starts on the 0–1 progress scale (reading takes most of an import). */
const PHASE_START: Record<BasemapImportPhase, number> = {
  reading: 0,
  indexing: 0.6,
  'road-graph': 0.7,
  generalising: 0.8,
  'terrain-grades': 0.85,
  switching: 0.97,
};
const PHASE_END: Record<BasemapImportPhase, number> = {
  reading: 0.6,
  indexing: 0.7,
  'road-graph': 0.8,
  generalising: 0.85,
  'terrain-grades': 0.97,
  switching: 1,
};

/** Progress is written at most this often (it is also the import's heartbeat). */
const PROGRESS_INTERVAL_MS = 1_000;
/** Areas below this size (m² in Web Mercator) are left out of the small-scale copies; simplified to this many metres. */
const LOW_ZOOM_MIN_AREA_M2 = 250_000;
const LOW_ZOOM_TOLERANCE_M = 40;

export async function runBasemapImport(deps: AppDeps, importId: string): Promise<void> {
  const row = await claimBasemapImport(deps.db, importId);
  if (!row) return;
  const storage = runtimeOf(deps).basemapStorage;
  const schemaName = row.schemaName;
  const s = schemaIdentifier(schemaName);
  let lastWrite = 0;
  const report = async (phase: BasemapImportPhase, withinPhase: number, force = false) => {
    const now = Date.now();
    if (!force && now - lastWrite < PROGRESS_INTERVAL_MS) return;
    lastWrite = now;
    const fraction = PHASE_START[phase] + (PHASE_END[phase] - PHASE_START[phase]) * Math.min(1, Math.max(0, withinPhase));
    await updateBasemapImport(deps.db, importId, { progress: { phase, fraction: Math.round(fraction * 1000) / 1000 } });
  };
  try {
    if (!row.storedPath || !existsSync(storage.absolute(row.storedPath))) {
      throw new ImportError('The uploaded file is no longer there; upload it again');
    }
    await deps.db.execute(sql`DROP SCHEMA IF EXISTS ${s} CASCADE`);
    await deps.db.execute(sql`CREATE SCHEMA ${s}`);
    await runOsm2pgsql(deps, schemaName, storage.absolute(row.storedPath), row.fileFormat as OsmFileFormat, report);

    await report('road-graph', 0, true);
    const graphEdgeCount = await buildImportedGraph(deps.db, schemaName);

    await report('generalising', 0, true);
    await generalise(deps, schemaName);

    await report('terrain-grades', 0, true);
    await sampleEdgeElevations(deps, { kind: 'imported', schemaName }, (fraction) => report('terrain-grades', fraction));

    await report('switching', 0, true);
    const summary = await summarise(deps, schemaName);
    await deps.db.transaction(async (tx) => {
      // One change of the graph at a time: a reference-network upload waits for this switch.
      await tx.execute(sql`SELECT pg_advisory_xact_lock(${ROAD_GRAPH_LOCK})`);
      await rebuildOverlay(tx, { importId, schemaName });
      await tx.update(basemapImports).set({ isActive: false, activatedAt: new Date() }).where(eq(basemapImports.isActive, true));
      await tx
        .update(basemapImports)
        .set({
          ...summary,
          graphEdgeCount,
          status: 'ready',
          isActive: true,
          progress: null,
          finishedAt: new Date(),
          activatedAt: new Date(),
          storedPath: null,
        })
        .where(eq(basemapImports.id, importId));
    });
    runtimeOf(deps).activeBasemap.forget();
    await sampleEdgeElevations(deps, { kind: 'overlay', baseImportId: importId });
    // Requests already reading the old tables finish first (DROP waits for their locks); a process
    // whose copy of the active import is older retries once on the new one (isMissingRelation).
    await retireOldImports(deps);
  } catch (error) {
    await deps.db.execute(sql`DROP SCHEMA IF EXISTS ${s} CASCADE`).catch(() => undefined);
    await updateBasemapImport(deps.db, importId, {
      status: 'failed',
      progress: null,
      finishedAt: new Date(),
      failureReason:
        error instanceof ImportError ? error.message : `The import stopped: ${error instanceof Error ? error.message : String(error)}`,
      storedPath: null,
    });
  } finally {
    if (row.storedPath) await rm(storage.absolute(row.storedPath), { force: true });
  }
}

/** A failure with a message meant for the person who uploaded the file. */
class ImportError extends Error {}

/** Drops the data of imports that no longer serve. */
export async function retireOldImports(deps: AppDeps): Promise<void> {
  for (const retired of await listRetiredSchemas(deps.db)) {
    await deps.db.execute(sql`DELETE FROM road_graph_overlay_edges WHERE base_import_id = ${retired.id}`);
    await deps.db.execute(sql`DROP SCHEMA IF EXISTS ${schemaIdentifier(retired.schemaName)} CASCADE`);
  }
}

/**
 * osm2pgsql 1.8 with our flex style, the file streamed into its standard input (decompressed
 * here for .bz2 and .gz); progress is the share of the file read.
 */
async function runOsm2pgsql(
  deps: AppDeps,
  schemaName: string,
  path: string,
  format: OsmFileFormat,
  report: (phase: BasemapImportPhase, withinPhase: number, force?: boolean) => Promise<void>,
): Promise<void> {
  const url = new URL(deps.config.DATABASE_URL);
  const database = decodeURIComponent(url.pathname.replace(/^\//, ''));
  const args = [
    '--create',
    '--slim',
    '--drop',
    '--output=flex',
    `--style=${styleFilePath()}`,
    `--middle-schema=${schemaName}`,
    `--cache=${deps.config.BASEMAP_IMPORT_CACHE_MB}`,
    `--number-processes=${deps.config.BASEMAP_IMPORT_PROCESSES}`,
    '--log-progress=false',
    `--input-reader=${format === 'pbf' ? 'pbf' : 'xml'}`,
    `--database=${database}`,
    '-',
  ];
  // Connection details travel in libpq's environment variables, so no password shows in `ps`.
  const env = {
    ...process.env,
    DESCENTRY_BASEMAP_SCHEMA: schemaName,
    PGHOST: url.hostname,
    PGPORT: url.port || '5432',
    PGUSER: decodeURIComponent(url.username),
    PGPASSWORD: decodeURIComponent(url.password),
  };
  const child = spawn('osm2pgsql', args, { env, stdio: ['pipe', 'ignore', 'pipe'] });
  const stderrLines: string[] = [];
  let reading = true;
  let stderrBuffer = '';
  child.stderr!.setEncoding('utf8');
  child.stderr!.on('data', (chunk: string) => {
    stderrBuffer += chunk;
    const lines = stderrBuffer.split(/\r?\n|\r/);
    stderrBuffer = lines.pop() ?? '';
    for (const line of lines) {
      if (!line.trim()) continue;
      stderrLines.push(line);
      if (stderrLines.length > 40) stderrLines.shift();
      if (reading && /Reading input files done/.test(line)) {
        reading = false;
        void report('indexing', 0, true);
      }
    }
  });

  const { size } = await import('node:fs/promises').then((fs) => fs.stat(path));
  const file = createReadStream(path, { highWaterMark: 1024 * 1024 });
  let readBytes = 0;
  file.on('data', (chunk) => {
    readBytes += chunk.length;
    if (reading) void report('reading', size > 0 ? readBytes / size : 1);
  });
  const helpers: ChildProcess[] = [];
  // A broken pipe only means osm2pgsql stopped early; its exit code and messages say why.
  child.stdin!.on('error', () => undefined);
  if (format === 'xml.gz') {
    file
      .pipe(createGunzip())
      .on('error', (error) => child.stdin!.destroy(error))
      .pipe(child.stdin!);
  } else if (format === 'xml.bz2') {
    const bunzip = spawn('bzip2', ['-dc'], { stdio: ['pipe', 'pipe', 'ignore'] });
    helpers.push(bunzip);
    bunzip.stdin.on('error', () => undefined);
    file.pipe(bunzip.stdin);
    bunzip.stdout.pipe(child.stdin!);
  } else {
    file.pipe(child.stdin!);
  }

  const exitCode = await new Promise<number>((resolve, reject) => {
    child.on('error', reject);
    child.on('close', (code) => resolve(code ?? 1));
  });
  file.destroy();
  for (const helper of helpers) helper.kill('SIGTERM');
  if (exitCode !== 0) {
    const errors = stderrLines.filter((line) => /ERROR|error/.test(line)).map((line) => line.replace(/^\S+ \S+\s+/, ''));
    throw new ImportError(
      `osm2pgsql could not import the file: ${(errors.length ? errors : stderrLines.slice(-3)).join(' ').slice(0, 600)}`,
    );
  }
}

/**
 * The Lua style sits next to this module; the bundled server (dist/api/main.mjs) runs from the
 * repository root and finds it under api/basemap/.
 */
function styleFilePath(): string {
  const besideModule = fileURLToPath(new URL('./basemap-style.lua', import.meta.url));
  if (existsSync(besideModule)) return besideModule;
  return join(process.cwd(), 'api', 'basemap', 'basemap-style.lua');
}

/** Simplified copies of the larger areas for tiles below zoom 10 (base-tiles.ts). */
async function generalise(deps: AppDeps, schemaName: string): Promise<void> {
  const s = schemaIdentifier(schemaName);
  for (const [table, columns] of [
    ['landuse', sql`class, kind, name`],
    ['water', sql`kind, name`],
  ] as const) {
    const source = sql.raw(table);
    const low = sql.raw(`${table}_low`);
    await deps.db.execute(sql`
      CREATE TABLE ${s}.${low} AS
      SELECT ${columns}, ST_Multi(ST_SimplifyPreserveTopology(geom, ${LOW_ZOOM_TOLERANCE_M}::float8)) AS geom
      FROM ${s}.${source} WHERE ST_Area(geom) >= ${LOW_ZOOM_MIN_AREA_M2}::float8`);
    await deps.db.execute(sql`CREATE INDEX ON ${s}.${low} USING gist (geom)`);
    await deps.db.execute(sql`ANALYZE ${s}.${low}`);
  }
}

/** Counts and the extent (WGS 84) of what was imported. */
async function summarise(deps: AppDeps, schemaName: string) {
  const s = schemaIdentifier(schemaName);
  const [row] = await deps.db.execute<{
    roads: number;
    places: number;
    water: number;
    landuse: number;
    west: number | null;
    south: number | null;
    east: number | null;
    north: number | null;
  }>(sql`
    WITH extent AS (
      SELECT ST_Transform(ST_SetSRID(ST_Extent(geom), 3857), 4326) AS box FROM (
        SELECT geom FROM ${s}.roads UNION ALL SELECT geom FROM ${s}.waterways UNION ALL SELECT geom FROM ${s}.water
        UNION ALL SELECT geom FROM ${s}.landuse UNION ALL SELECT geom FROM ${s}.places
      ) g
    )
    SELECT
      (SELECT count(*)::int FROM ${s}.roads WHERE class NOT IN ('rail', 'tram')) AS roads,
      (SELECT count(*)::int FROM ${s}.places) AS places,
      (SELECT count(*)::int FROM ${s}.water) + (SELECT count(*)::int FROM ${s}.waterways) AS water,
      (SELECT count(*)::int FROM ${s}.landuse) AS landuse,
      ST_XMin(box) AS west, ST_YMin(box) AS south, ST_XMax(box) AS east, ST_YMax(box) AS north
    FROM extent`);
  return {
    roadCount: row?.roads ?? 0,
    placeCount: row?.places ?? 0,
    waterCount: row?.water ?? 0,
    landuseCount: row?.landuse ?? 0,
    bboxWest: row?.west ?? null,
    bboxSouth: row?.south ?? null,
    bboxEast: row?.east ?? null,
    bboxNorth: row?.north ?? null,
  };
}
