/**
 * Elevation along each edge of the road graph from the uploaded terrain: the elevation at both
 * ends, the climb and the drop along the edge's drawing direction (elevations every
 * GRADE_SPACING_M at most, so a short rise between two distant vertices is not missed). Edges
 * outside every ready terrain model, or partly outside, keep null: no elevation is invented.
 */
import { sql, type SQL } from 'drizzle-orm';
import type { AppDeps } from '../app-deps';
import { terrainRuntimeFor } from '../terrain/terrain-runtime';
import { schemaIdentifier } from './road-graph-build';

/** Longest stretch between two elevation samples along an edge, m (the terrain's 10–30 m cells make finer pointless for a road's grade). */
export const GRADE_SPACING_M = 50;
/** Edges sampled per step (bounded memory whatever the graph's size). */
const BATCH_EDGES = 2_000;

/** Which edges to fill: an imported graph, or the overlay of one base (null: no extract). */
export type GradedEdges = { kind: 'imported'; schemaName: string } | { kind: 'overlay'; baseImportId: string | null };

/** Samples the terrain for every edge of `target`; returns how many edges got elevations. */
export async function sampleEdgeElevations(
  deps: AppDeps,
  target: GradedEdges,
  onProgress?: (fraction: number) => Promise<void> | void,
): Promise<number> {
  const table = target.kind === 'imported' ? sql`${schemaIdentifier(target.schemaName)}.graph_edges` : sql`road_graph_overlay_edges`;
  const geom = target.kind === 'imported' ? sql`geom` : sql`geometry`;
  const scope =
    target.kind === 'imported'
      ? sql`true`
      : target.baseImportId
        ? sql`base_import_id = ${target.baseImportId}`
        : sql`base_import_id IS NULL`;
  const clear = sql`UPDATE ${table} SET elevation_start_m = NULL, elevation_end_m = NULL, ascent_m = NULL, descent_m = NULL WHERE ${scope}`;
  const sample = deps.sampleElevations;
  const models = sample ? (await terrainRuntimeFor(deps).readyCatalogue()).models : [];
  if (!sample || models.length === 0) {
    await deps.db.execute(clear);
    return 0;
  }
  const covered = sql.join(
    models.map(({ bbox: [w, s, e, n] }) => sql`${geom} && ST_MakeEnvelope(${w}::float8, ${s}::float8, ${e}::float8, ${n}::float8, 4326)`),
    sql` OR `,
  );
  // Edges outside every model lose their elevations now; the others are overwritten batch by
  // batch, so paths read the old values rather than none while a re-sampling runs.
  await deps.db.execute(sql`${clear} AND NOT (${covered})`);
  const [{ total } = { total: 0 }] = await deps.db.execute<{ total: number }>(
    sql`SELECT count(*)::int AS total FROM ${table} WHERE ${scope} AND (${covered})`,
  );
  let lastId = -1;
  let done = 0;
  let graded = 0;
  for (;;) {
    const rows = await deps.db.execute<{ id: number; geojson: string }>(sql`
      SELECT id::float8 AS id, ST_AsGeoJSON(ST_Segmentize(${geom}::geography, ${GRADE_SPACING_M})::geometry, 7) AS geojson
      FROM ${table} WHERE ${scope} AND (${covered}) AND id > ${lastId} ORDER BY id LIMIT ${BATCH_EDGES}`);
    if (rows.length === 0) break;
    const lines = [...rows].map((row) => ({
      id: Number(row.id),
      coordinates: (JSON.parse(row.geojson) as { coordinates: [number, number][] }).coordinates,
    }));
    const elevations = await sample(lines.flatMap((line) => line.coordinates));
    let offset = 0;
    const values: SQL[] = [];
    for (const line of lines) {
      const along = elevations.slice(offset, offset + line.coordinates.length);
      offset += line.coordinates.length;
      const profile = edgeProfile(along);
      values.push(
        sql`(${line.id}::bigint, ${profile?.startM ?? null}::float8, ${profile?.endM ?? null}::float8, ${profile?.ascentM ?? null}::float8, ${profile?.descentM ?? null}::float8)`,
      );
      if (profile) graded++;
    }
    await deps.db.execute(sql`
      UPDATE ${table} t SET elevation_start_m = v.start_m, elevation_end_m = v.end_m, ascent_m = v.ascent_m, descent_m = v.descent_m
      FROM (VALUES ${sql.join(values, sql`, `)}) AS v(id, start_m, end_m, ascent_m, descent_m) WHERE t.id = v.id`);
    lastId = lines[lines.length - 1]!.id;
    done += lines.length;
    await onProgress?.(total > 0 ? Math.min(1, done / total) : 1);
  }
  return graded;
}

/** Elevations at both ends and the summed rises and falls between samples; null when any sample has no terrain. */
export function edgeProfile(
  elevationsM: readonly (number | null)[],
): { startM: number; endM: number; ascentM: number; descentM: number } | null {
  if (elevationsM.length < 2 || elevationsM.some((value) => value === null)) return null;
  const values = elevationsM as number[];
  let ascentM = 0;
  let descentM = 0;
  for (let i = 1; i < values.length; i++) {
    const step = values[i]! - values[i - 1]!;
    if (step > 0) ascentM += step;
    else descentM -= step;
  }
  return { startM: values[0]!, endM: values[values.length - 1]!, ascentM, descentM };
}
