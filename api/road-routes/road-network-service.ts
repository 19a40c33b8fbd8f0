/**
 * The reference road network: an analyst uploads GeoJSON lines; planners snap routes to it.
 * An upload replaces the whole network. Paths run along the network with geojson-path-finder;
 * `from` and `to` are first moved to the nearest network vertex (the finder routes between
 * vertices), and how far they moved is returned.
 */
import { asc } from 'drizzle-orm';
import PathFinderModule from 'geojson-path-finder';
import { distance, point } from '@turf/turf';
import type { FeatureCollection, LineString as GeoJsonLineString } from 'geojson';
import { positionSchema, type LineString } from '@shared/domain/analysis';
import type { RoadNetwork, RoadNetworkPath } from '@shared/domain/road-routes';
import type { Database } from '../db/client';
import { roadNetworkLines } from '../db/schema/index';
import { BadRequestError, NotFoundError } from '../http/http-error';
import { flatten, lineLengthM } from './route-geometry';

/**
 * geojson-path-finder ships CommonJS with its class on `exports.default`. Under tsx and vitest the
 * default import is the class; Node's own ESM loader, which runs the bundled server, hands over
 * the whole `exports` object instead. Take the class from either.
 */
const PathFinder = ((PathFinderModule as unknown as { default?: typeof PathFinderModule }).default ?? PathFinderModule) as typeof PathFinderModule;

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
    const props = typeof properties === 'object' && properties !== null && !Array.isArray(properties) ? (properties as Record<string, unknown>) : {};
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

export async function replaceRoadNetwork(db: Database, uploadedById: string | null, lines: ParsedLine[]) {
  await db.transaction(async (tx) => {
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
  });
  return { featureCount: new Set(lines.map((line) => line.featureIndex)).size, lineCount: lines.length };
}

export async function getRoadNetwork(db: Database): Promise<RoadNetwork> {
  const rows = await db
    .select({ featureIndex: roadNetworkLines.featureIndex, partIndex: roadNetworkLines.partIndex, properties: roadNetworkLines.properties, coordinates: roadNetworkLines.coordinates })
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

export async function findNetworkPath(db: Database, from: [number, number], to: [number, number]): Promise<RoadNetworkPath> {
  const network = await getRoadNetwork(db);
  if (network.features.length === 0) throw new NotFoundError('A road network (none has been uploaded)');
  const flat: FeatureCollection<GeoJsonLineString> = {
    type: 'FeatureCollection',
    features: network.features.map((feature) => ({
      type: 'Feature',
      properties: {},
      geometry: { type: 'LineString', coordinates: feature.geometry.coordinates.map(([lon, lat]) => [lon, lat]) },
    })),
  };
  const start = nearestVertex(flat, from);
  const end = nearestVertex(flat, to);
  const finder = new PathFinder(flat);
  const found = finder.findPath(point(start.position), point(end.position));
  if (!found || found.path.length < 2) {
    throw new NotFoundError('A path along the road network between these two points');
  }
  const coordinates = found.path.map((position) => [position[0]!, position[1]!] as [number, number]);
  return {
    geometry: { type: 'LineString', coordinates },
    lengthM: lineLengthM(coordinates),
    snapDistancesM: [start.distanceM, end.distanceM],
  };
}

function nearestVertex(network: FeatureCollection<GeoJsonLineString>, target: [number, number]) {
  let best = { position: target as [number, number], distanceM: Number.POSITIVE_INFINITY };
  for (const feature of network.features) {
    for (const position of feature.geometry.coordinates) {
      const metres = distance(point(target), point(position), { units: 'meters' });
      if (metres < best.distanceM) best = { position: [position[0]!, position[1]!], distanceM: metres };
    }
  }
  return best;
}
