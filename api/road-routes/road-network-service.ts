/**
 * The reference road network: an analyst uploads GeoJSON lines (for instance a planned road
 * the imported extract does not have); planners snap routes to it. An upload replaces the whole
 * network, and the road graph's overlay (api/road-graph/road-graph-build.ts) is rebuilt from it
 * in the same transaction, so paths use the new lines at once, joined to the imported roads.
 */
import { asc, sql } from 'drizzle-orm';
import { positionSchema, type LineString } from '@shared/domain/analysis';
import type { RoadNetwork } from '@shared/domain/road-routes';
import type { AppDeps } from '../app-deps';
import type { Database } from '../db/client';
import { roadNetworkLines } from '../db/schema/index';
import { BadRequestError } from '../http/http-error';
import { runtimeOf } from '../app-runtime';
import { rebuildOverlay } from '../road-graph/road-graph-build';
import { sampleEdgeElevations } from '../road-graph/road-graph-grades';
import { ROAD_GRAPH_LOCK } from '../road-graph/road-graph-lock';
import { flatten } from './route-geometry';

/** Largest network accepted in one upload, lines (keeps path finding interactive). */
const MAX_NETWORK_LINES = 50_000;

interface ParsedLine {
  featureIndex: number;
  partIndex: number;
  properties: Record<string, unknown>;
  coordinates: LineString['coordinates'];
}

/** Validates an uploaded network; a bad feature is named by its index. */
export function parseRoadNetwork(document: unknown, fileName?: string): ParsedLine[] {
  const fail = (field: string, message: string, featureIndex?: number): never => {
    throw new BadRequestError(`${fileName ? `${fileName}: ` : ''}${field}: ${message}`, { file: fileName, field, featureIndex });
  };
  if (typeof document !== 'object' || document === null || (document as { type?: unknown }).type !== 'FeatureCollection') {
    fail('type', 'the road network must be a GeoJSON FeatureCollection');
  }
  const features = (document as { features?: unknown }).features;
  if (!Array.isArray(features)) return fail('features', 'must be an array');
  if (features.length === 0) fail('features', 'the road network has no features');
  const lines: ParsedLine[] = [];
  features.forEach((feature: unknown, index: number) => {
    const field = `features.${index}`;
    if (typeof feature !== 'object' || feature === null || (feature as { type?: unknown }).type !== 'Feature') {
      fail(field, 'must be a GeoJSON Feature', index);
    }
    const { geometry, properties } = feature as { geometry?: { type?: unknown; coordinates?: unknown }; properties?: unknown };
    const props =
      typeof properties === 'object' && properties !== null && !Array.isArray(properties) ? (properties as Record<string, unknown>) : {};
    if (!geometry || typeof geometry !== 'object') return fail(`${field}.geometry`, 'is missing', index);
    let parts: unknown[];
    if (geometry.type === 'LineString') parts = [geometry.coordinates];
    else if (geometry.type === 'MultiLineString' && Array.isArray(geometry.coordinates)) parts = geometry.coordinates;
    else return fail(`${field}.geometry.type`, `roads must be LineString or MultiLineString, got ${String(geometry.type)}`, index);
    parts.forEach((part, partIndex) => {
      const partField = geometry.type === 'LineString' ? `${field}.geometry.coordinates` : `${field}.geometry.coordinates.${partIndex}`;
      if (!Array.isArray(part) || part.length < 2) fail(partField, 'a line needs at least two positions', index);
      const coordinates = (part as unknown[]).map((position, positionIndex) => {
        const parsed = positionSchema.safeParse(position);
        if (!parsed.success) fail(`${partField}.${positionIndex}`, 'not a valid [longitude, latitude] position in WGS 84', index);
        return parsed.data!;
      });
      lines.push({ featureIndex: index, partIndex, properties: props, coordinates });
    });
  });
  if (lines.length > MAX_NETWORK_LINES) fail('features', `more than ${MAX_NETWORK_LINES} lines; split the network`);
  return lines;
}

export async function replaceRoadNetwork(deps: AppDeps, uploadedById: string | null, lines: ParsedLine[]) {
  const base = await runtimeOf(deps).activeBasemap.current();
  await deps.db.transaction(async (tx) => {
    await tx.execute(sql`SELECT pg_advisory_xact_lock(${ROAD_GRAPH_LOCK})`);
    await tx.delete(roadNetworkLines);
    for (let i = 0; i < lines.length; i += 500) {
      await tx.insert(roadNetworkLines).values(
        lines.slice(i, i + 500).map((line) => ({
          featureIndex: line.featureIndex,
          partIndex: line.partIndex,
          properties: line.properties,
          coordinates: line.coordinates,
          geometry: flatten({ type: 'LineString', coordinates: line.coordinates }),
          uploadedById,
        })),
      );
    }
    await rebuildOverlay(tx, base ? { importId: base.importId, schemaName: base.schemaName } : null);
  });
  await sampleEdgeElevations(deps, { kind: 'overlay', baseImportId: base?.importId ?? null });
  return { featureCount: new Set(lines.map((line) => line.featureIndex)).size, lineCount: lines.length };
}

export async function getRoadNetwork(db: Database): Promise<RoadNetwork> {
  const rows = await db
    .select({
      featureIndex: roadNetworkLines.featureIndex,
      partIndex: roadNetworkLines.partIndex,
      properties: roadNetworkLines.properties,
      coordinates: roadNetworkLines.coordinates,
    })
    .from(roadNetworkLines)
    .orderBy(asc(roadNetworkLines.featureIndex), asc(roadNetworkLines.partIndex));
  return {
    type: 'FeatureCollection',
    features: rows.map((row) => ({
      type: 'Feature',
      id: `${row.featureIndex}.${row.partIndex}`,
      properties: row.properties,
      geometry: { type: 'LineString', coordinates: row.coordinates },
    })),
  };
}
