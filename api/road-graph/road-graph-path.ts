/**
 * Shortest paths a bus may drive, with pgRouting's pgr_withPoints on the road graph
 * (road-graph-build.ts): each given point is first moved to the closest point of the closest
 * edge, and the path starts and ends there, part-way along that edge, rather than at its nearest
 * junction. A path through `via` points is the chain of the shortest legs between them.
 */
import { sql, type SQL } from 'drizzle-orm';
import { PgDialect } from 'drizzle-orm/pg-core';
import { PATH_MAX_SNAP_DISTANCE_M, type RoadNetworkPath } from '@shared/domain/road-routes';
import type { AppDeps } from '../app-deps';
import { runtimeOf } from '../app-runtime';
import type { Database } from '../db/client';
import { isMissingRelation, type ActiveBasemap, type ActiveBasemapReader } from '../basemap/active-basemap';
import { HttpError, NotFoundError } from '../http/http-error';
import { schemaIdentifier } from './road-graph-build';

type Position = [number, number];

interface SnappedPoint {
  edgeId: number;
  fraction: number;
  distanceM: number;
  /** The edge's end vertex when the point lies on it (pgr_withPoints needs points strictly inside an edge). */
  vertex: string | null;
}

/** Closer than this to an edge's end, a point is taken to be that end vertex, m. */
const AT_VERTEX_M = 0.01;

interface LegPiece {
  coordinates: Position[];
  lengthM: number;
  ascentM: number | null;
  descentM: number | null;
}

/**
 * A leg first searches the edges within this margin around its two points (a bounded graph keeps
 * pgRouting fast on a large region), then, when no path lies inside, the whole graph.
 */
const SEARCH_MARGIN_M = 3_000;
const SEARCH_MARGIN_SHARE = 0.5;

const dialect = new PgDialect();

/** Shortest path from `from` through each `via` to `to`; 422 when a point is too far or no path exists. */
export async function findRoadPath(deps: AppDeps, request: { from: Position; to: Position; via?: Position[] }): Promise<RoadNetworkPath> {
  const active = runtimeOf(deps).activeBasemap;
  try {
    return await pathOnActiveGraph(deps.db, active, request);
  } catch (error) {
    // Expected only right after another process switched to a new extract and dropped the old
    // one: read the active extract again and answer from it.
    if (!isMissingRelation(error)) throw error;
    active.forget();
    return pathOnActiveGraph(deps.db, active, request);
  }
}

async function pathOnActiveGraph(
  db: Database,
  active: ActiveBasemapReader,
  request: { from: Position; to: Position; via?: Position[] },
): Promise<RoadNetworkPath> {
  const base = await active.current();
  if (!(await graphHasEdges(db, base))) {
    throw new NotFoundError('A road network (import an OpenStreetMap extract or upload a reference network)');
  }
  const points = [request.from, ...(request.via ?? []), request.to];
  const names = points.map((_, index) => (index === 0 ? 'from' : index === points.length - 1 ? 'to' : `via.${index - 1}`));
  const snapped: SnappedPoint[] = [];
  for (const [index, point] of points.entries()) {
    const nearest = await snapToGraph(db, base, point);
    if (!nearest || nearest.distanceM > PATH_MAX_SNAP_DISTANCE_M) {
      const distance = nearest ? `${Math.round(nearest.distanceM)} m` : 'far';
      throw new HttpError(
        422,
        'too_far_from_road',
        `The point “${names[index]}” (${point[1].toFixed(5)}, ${point[0].toFixed(5)}) is ${distance} from the nearest road a bus may use; the limit is ${PATH_MAX_SNAP_DISTANCE_M} m`,
        { field: names[index], distanceM: nearest ? Math.round(nearest.distanceM) : null, limitM: PATH_MAX_SNAP_DISTANCE_M },
      );
    }
    snapped.push(nearest);
  }

  const coordinates: Position[] = [];
  let lengthM = 0;
  let ascentM: number | null = 0;
  let descentM: number | null = 0;
  for (let leg = 0; leg < points.length - 1; leg++) {
    const pieces = await shortestLeg(db, base, snapped[leg]!, snapped[leg + 1]!, points[leg]!, points[leg + 1]!);
    if (!pieces) {
      throw new HttpError(
        422,
        'no_path',
        `No road a bus may use joins “${names[leg]}” and “${names[leg + 1]}” (one-way streets and access restrictions for buses included)`,
        { from: names[leg], to: names[leg + 1] },
      );
    }
    for (const piece of pieces) {
      for (const position of piece.coordinates) {
        const last = coordinates[coordinates.length - 1];
        if (!last || last[0] !== position[0] || last[1] !== position[1]) coordinates.push(position);
      }
      lengthM += piece.lengthM;
      ascentM = ascentM === null || piece.ascentM === null ? null : ascentM + piece.ascentM;
      descentM = descentM === null || piece.descentM === null ? null : descentM + piece.descentM;
    }
  }
  // Two points on the same spot of one edge: a path of no length, still a valid line.
  if (coordinates.length === 1) coordinates.push([...coordinates[0]!]);
  return {
    geometry: { type: 'LineString', coordinates },
    lengthM: round(lengthM, 2),
    snapDistancesM: snapped.map((point) => round(point.distanceM, 2)),
    ascentM: ascentM === null ? null : round(ascentM, 1),
    descentM: descentM === null ? null : round(descentM, 1),
  };
}

async function graphHasEdges(db: Database, base: ActiveBasemap | null): Promise<boolean> {
  const overlay = await db.execute<{ found: boolean }>(
    sql`SELECT EXISTS (SELECT 1 FROM road_graph_overlay_edges WHERE ${baseCondition(base)}) AS found`,
  );
  if (overlay[0]?.found) return true;
  if (!base) return false;
  const imported = await db.execute<{ found: boolean }>(
    sql`SELECT EXISTS (SELECT 1 FROM ${schemaIdentifier(base.schemaName)}.graph_edges) AS found`,
  );
  return imported[0]?.found ?? false;
}

function baseCondition(base: ActiveBasemap | null): SQL {
  return base ? sql`base_import_id = ${base.importId}` : sql`base_import_id IS NULL`;
}

/** The graph's edges as one relation (id, source, target, cost, reverse_cost, geom[, ascent/descent]) for SQL. */
/**
 * `where` (over `e`) is repeated inside both parts, so each part uses its own indexes (a filter
 * outside a UNION is not always pushed into it).
 */
function usableEdgesSql(base: ActiveBasemap | null, where: (geometry: SQL) => SQL = () => sql`true`): SQL {
  const overlay = sql`SELECT e.id, e.source, e.target, e.cost, e.reverse_cost, e.length_m, e.ascent_m, e.descent_m, e.geometry AS geom
    FROM road_graph_overlay_edges e WHERE e.${sql.raw(base ? 'base_import_id = ' : 'base_import_id IS NULL')}${base ? sql`${base.importId}` : sql``} AND ${where(sql`e.geometry`)}`;
  if (!base) return overlay;
  const s = schemaIdentifier(base.schemaName);
  return sql`
    SELECT e.id, e.source, e.target, e.cost, e.reverse_cost, e.length_m, e.ascent_m, e.descent_m, e.geom FROM ${s}.graph_edges e
    WHERE ${where(sql`e.geom`)} AND NOT EXISTS (SELECT 1 FROM road_graph_overlay_edges o WHERE o.base_import_id = ${base.importId} AND o.replaces_edge_id = e.id)
    UNION ALL ${overlay}`;
}

/** The closest point of the closest edge: candidates by the spatial index, ranked on the ellipsoid. */
async function snapToGraph(db: Database, base: ActiveBasemap | null, [lon, lat]: Position): Promise<SnappedPoint | null> {
  const point = sql`ST_SetSRID(ST_MakePoint(${lon}::float8, ${lat}::float8), 4326)`;
  const overlay = sql`(SELECT id, geometry AS geom, length_m, source, target FROM road_graph_overlay_edges WHERE ${baseCondition(base)} ORDER BY geometry <-> ${point} LIMIT 8)`;
  const candidates = base
    ? sql`(SELECT e.id, e.geom, e.length_m, e.source, e.target FROM ${schemaIdentifier(base.schemaName)}.graph_edges e
          WHERE NOT EXISTS (SELECT 1 FROM road_graph_overlay_edges o WHERE o.base_import_id = ${base.importId} AND o.replaces_edge_id = e.id)
          ORDER BY e.geom <-> ${point} LIMIT 8) UNION ALL ${overlay}`
    : overlay;
  const rows = await db.execute<{ id: number; fraction: number; distance_m: number; length_m: number; source: string; target: string }>(sql`
    SELECT c.id::float8 AS id, ST_LineLocatePoint(c.geom, ${point}) AS fraction, ST_Distance(c.geom::geography, ${point}::geography) AS distance_m,
      c.length_m, c.source::text AS source, c.target::text AS target
    FROM (${candidates}) c ORDER BY distance_m, c.id LIMIT 1`);
  const row = rows[0];
  if (!row) return null;
  const fraction = clamp01(row.fraction);
  // Vertex ids use all 64 bits: they stay text on this side (a JS number would round them).
  const vertex = fraction * row.length_m < AT_VERTEX_M ? row.source : (1 - fraction) * row.length_m < AT_VERTEX_M ? row.target : null;
  return { edgeId: Number(row.id), fraction, distanceM: row.distance_m, vertex };
}

/** One leg: the edges within a box around its points first, the whole graph when no path lies inside. */
async function shortestLeg(
  db: Database,
  base: ActiveBasemap | null,
  start: SnappedPoint,
  end: SnappedPoint,
  startAt: Position,
  endAt: Position,
): Promise<LegPiece[] | null> {
  const box = searchBox(startAt, endAt);
  return (await legWithin(db, base, start, end, box)) ?? (await legWithin(db, base, start, end, null));
}

async function legWithin(
  db: Database,
  base: ActiveBasemap | null,
  start: SnappedPoint,
  end: SnappedPoint,
  box: [number, number, number, number] | null,
): Promise<LegPiece[] | null> {
  const samePlace = start.vertex !== null ? start.vertex === end.vertex : start.edgeId === end.edgeId && start.fraction === end.fraction;
  if (samePlace) {
    const [row] = await db.execute<{ geojson: string }>(
      sql`SELECT ST_AsGeoJSON(ST_LineInterpolatePoint(geom, ${start.fraction}::float8), 7) AS geojson FROM (${usableEdgesSql(base, () => sql`e.id = ${start.edgeId}`)}) e`,
    );
    const at = (JSON.parse(row!.geojson) as { coordinates: Position }).coordinates;
    return [{ coordinates: [at], lengthM: 0, ascentM: 0, descentM: 0 }];
  }
  // pgRouting takes its inputs as SQL text; every value in it is a number or an id of ours.
  const edgesText = sqlText(
    box
      ? sql`SELECT id, source, target, cost, reverse_cost FROM (${usableEdgesSql(base, (geometry) => sql`${geometry} && ST_MakeEnvelope(${box[0]}::float8, ${box[1]}::float8, ${box[2]}::float8, ${box[3]}::float8, 4326)`)}) e`
      : sql`SELECT id, source, target, cost, reverse_cost FROM (${usableEdgesSql(base)}) e`,
  );
  // Points inside an edge are pgRouting "points" (pids 1 and 2, nodes −1 and −2 in its answer);
  // points on a vertex are that vertex.
  const points = [
    ...(start.vertex === null ? [`(1::bigint, ${start.edgeId}::bigint, ${start.fraction}::float8, 'b'::char)`] : []),
    ...(end.vertex === null ? [`(2::bigint, ${end.edgeId}::bigint, ${end.fraction}::float8, 'b'::char)`] : []),
  ];
  const startNode = start.vertex ?? '-1';
  const endNode = end.vertex ?? '-2';
  const routeSql =
    points.length > 0
      ? sql`SELECT path_seq, node, edge FROM pgr_withPoints(${edgesText}, ${`SELECT * FROM (VALUES ${points.join(', ')}) AS p(pid, edge_id, fraction, side)`}, ${startNode}::bigint, ${endNode}::bigint, directed => true, driving_side => 'b', details => false)`
      : sql`SELECT path_seq, node, edge FROM pgr_dijkstra(${edgesText}, ${startNode}::bigint, ${endNode}::bigint, directed => true)`;
  const route = [
    ...(await db.execute<{ path_seq: number; node: string; edge: string }>(
      sql`SELECT path_seq, node::text AS node, edge::text AS edge FROM (${routeSql}) r ORDER BY path_seq`,
    )),
  ];
  if (route.length === 0) return null;
  const edgeIds = route.map((step) => step.edge).filter((edge) => !edge.startsWith('-'));
  const steps = route.map(
    (step, i) => sql`(${step.path_seq}::int, ${step.node}::bigint, ${step.edge}::bigint, ${route[i + 1]?.node ?? null}::bigint)`,
  );
  const rows = await db.execute<{ geojson: string; length_m: number; ascent_m: number | null; descent_m: number | null }>(sql`
    WITH steps(path_seq, node, edge, next_node) AS (VALUES ${sql.join(steps, sql`, `)}),
    edges AS (
      SELECT * FROM (${usableEdgesSql(base, () => sql`e.id = ANY(${`{${edgeIds.join(',')}}`}::bigint[])`)}) e
    ), spans AS (
      SELECT st.path_seq, e.geom, e.length_m, e.ascent_m, e.descent_m,
        CASE WHEN st.node = -1 THEN ${start.fraction}::float8 WHEN st.node = -2 THEN ${end.fraction}::float8 WHEN st.node = e.source THEN 0 ELSE 1 END AS f_from,
        CASE WHEN st.next_node = -1 THEN ${start.fraction}::float8 WHEN st.next_node = -2 THEN ${end.fraction}::float8 WHEN st.next_node = e.target THEN 1 ELSE 0 END AS f_to
      FROM steps st JOIN edges e ON e.id = st.edge
    )
    SELECT ST_AsGeoJSON(CASE WHEN f_from <= f_to THEN ST_LineSubstring(geom, f_from, f_to) ELSE ST_Reverse(ST_LineSubstring(geom, f_to, f_from)) END, 7) AS geojson,
      abs(f_to - f_from) * length_m AS length_m,
      abs(f_to - f_from) * CASE WHEN f_from <= f_to THEN ascent_m ELSE descent_m END AS ascent_m,
      abs(f_to - f_from) * CASE WHEN f_from <= f_to THEN descent_m ELSE ascent_m END AS descent_m
    FROM spans ORDER BY path_seq`);
  if (rows.length === 0) return null;
  return [...rows].map((row) => ({
    coordinates: (JSON.parse(row.geojson) as { coordinates: Position[] }).coordinates,
    lengthM: row.length_m,
    ascentM: row.ascent_m,
    descentM: row.descent_m,
  }));
}

/** Inlines a query's parameters (numbers and ids we generated) to hand pgRouting its SQL text. */
function sqlText(query: SQL): string {
  const { sql: text, params } = dialect.sqlToQuery(query);
  return text.replace(/\$(\d+)/g, (_, index: string) => {
    const value = params[Number(index) - 1];
    if (typeof value === 'number' && Number.isFinite(value)) return String(value);
    if (typeof value === 'string' && /^[0-9a-f-]{36}$/.test(value)) return `'${value}'`;
    throw new Error(`Unexpected value in a pgRouting query: ${String(value)}`);
  });
}

/** A box around two points with a margin (half their distance, at least SEARCH_MARGIN_M). */
function searchBox(a: Position, b: Position): [number, number, number, number] {
  const metresPerDegreeLat = 111_320;
  const latitude = ((a[1] + b[1]) / 2) * (Math.PI / 180);
  const metresPerDegreeLon = Math.max(1_000, metresPerDegreeLat * Math.cos(latitude));
  const spanM = Math.hypot((a[0] - b[0]) * metresPerDegreeLon, (a[1] - b[1]) * metresPerDegreeLat);
  const marginM = Math.max(SEARCH_MARGIN_M, SEARCH_MARGIN_SHARE * spanM);
  const dLon = marginM / metresPerDegreeLon;
  const dLat = marginM / metresPerDegreeLat;
  return [Math.min(a[0], b[0]) - dLon, Math.min(a[1], b[1]) - dLat, Math.max(a[0], b[0]) + dLon, Math.max(a[1], b[1]) + dLat];
}

function clamp01(value: number): number {
  return Math.min(1, Math.max(0, value));
}

function round(value: number, digits: number): number {
  const factor = 10 ** digits;
  return Math.round(value * factor) / factor;
}
