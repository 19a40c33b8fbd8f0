/**
 * Routes as GeoJSON (RFC 7946): export as one Feature whose properties carry the route's settings
 * and its stops as a FeatureCollection of Points; import from a Feature, a FeatureCollection
 * (one LineString, optional Point features as stops) or a bare LineString.
 */
import { z } from 'zod';
import { lineStringSchema, positionSchema } from '@shared/domain/analysis';
import { ROUTE_MODES, type RoadRoute, type RoadRouteDraftInput } from '@shared/domain/road-routes';
import { ImportError, lineAt } from './import-error';
import { speedLimitKphSchema } from '@shared/domain/limits';

export function routeToGeoJson(route: RoadRoute) {
  return {
    type: 'Feature' as const,
    id: route.id,
    geometry: route.geometry,
    properties: {
      name: route.name,
      description: route.description,
      mode: route.mode,
      version: route.version,
      lengthM: route.lengthM,
      defaultSpeedLimitKph: route.defaultSpeedLimitKph,
      speedLimits: route.speedLimits,
      tripsPerDay: route.tripsPerDay,
      serviceDaysPerYear: route.serviceDaysPerYear,
      stops: {
        type: 'FeatureCollection' as const,
        features: route.stops.map((stop) => ({
          type: 'Feature' as const,
          geometry: { type: 'Point' as const, coordinates: [stop.lon, stop.lat] },
          properties: { name: stop.name, dwellS: stop.dwellS, atM: stop.atM },
        })),
      },
    },
  };
}

const stopPropertiesSchema = z.object({
  name: z.string().trim().min(1).max(120).optional(),
  dwellS: z.number().min(0).max(3_600).optional(),
});
const pointSchema = z.object({ type: z.literal('Point'), coordinates: positionSchema });
const settingsSchema = z
  .object({
    name: z.string().trim().min(1).max(120),
    description: z.string().max(2_000),
    mode: z.enum(ROUTE_MODES),
    defaultSpeedLimitKph: speedLimitKphSchema,
    speedLimits: z.array(z.object({ fromM: z.number(), toM: z.number(), speedKph: z.number() })),
    tripsPerDay: z.number().min(0).max(500),
    serviceDaysPerYear: z.number().int().min(0).max(366),
  })
  .partial();

type Json = Record<string, unknown>;

/** Reads a GeoJSON file into a route draft; throws ImportError naming file, line and field. */
export function geoJsonToDraft(fileName: string, text: string): RoadRouteDraftInput {
  let document: unknown;
  try {
    document = JSON.parse(text);
  } catch (error) {
    // Malformed JSON is the uploader's to fix: say where it broke.
    const message = error instanceof Error ? error.message : String(error);
    const position = /position (\d+)/.exec(message);
    throw new ImportError(
      { file: fileName, line: position ? lineAt(text, Number(position[1])) : undefined },
      `not valid JSON (${message})`,
    );
  }
  if (!isObject(document)) throw new ImportError({ file: fileName }, 'expected a GeoJSON object');

  let lineFeature: { geometry: unknown; properties: Json; field: string } | undefined;
  const pointFeatures: { feature: Json; field: string }[] = [];
  const take = (feature: Json, field: string) => {
    const geometry = feature['geometry'];
    const type = isObject(geometry) ? geometry['type'] : undefined;
    if (type === 'LineString' || type === 'MultiLineString') {
      if (lineFeature) throw new ImportError({ file: fileName, field }, 'a second line; a route file holds exactly one LineString');
      lineFeature = { geometry, properties: isObject(feature['properties']) ? feature['properties'] : {}, field };
    } else if (type === 'Point') {
      pointFeatures.push({ feature, field });
    } else {
      throw new ImportError({ file: fileName, field: `${field}.geometry.type` }, `expected LineString or Point, got ${String(type)}`);
    }
  };
  if (document['type'] === 'FeatureCollection') {
    const features = document['features'];
    if (!Array.isArray(features)) throw new ImportError({ file: fileName, field: 'features' }, 'must be an array');
    features.forEach((feature, index) => {
      if (!isObject(feature) || feature['type'] !== 'Feature') {
        throw new ImportError({ file: fileName, field: `features.${index}` }, 'must be a GeoJSON Feature');
      }
      take(feature, `features.${index}`);
    });
  } else if (document['type'] === 'Feature') {
    take(document, 'feature');
  } else if (document['type'] === 'LineString' || document['type'] === 'MultiLineString') {
    take({ geometry: document, properties: {} }, 'geometry');
  } else {
    throw new ImportError(
      { file: fileName, field: 'type' },
      `expected Feature, FeatureCollection or LineString, got ${String(document['type'])}`,
    );
  }
  if (!lineFeature) throw new ImportError({ file: fileName }, 'no LineString feature: nothing to import as a route');

  let geometryInput = lineFeature.geometry as Json;
  if (geometryInput['type'] === 'MultiLineString') {
    const parts = geometryInput['coordinates'];
    if (!Array.isArray(parts) || parts.length !== 1) {
      throw new ImportError(
        { file: fileName, field: `${lineFeature.field}.geometry.coordinates` },
        'a MultiLineString route must have exactly one part',
      );
    }
    geometryInput = { type: 'LineString', coordinates: parts[0] };
  }
  const geometry = lineStringSchema.safeParse(geometryInput);
  if (!geometry.success) {
    const issue = geometry.error.issues[0]!;
    throw new ImportError({ file: fileName, field: [`${lineFeature.field}.geometry`, ...issue.path.map(String)].join('.') }, issue.message);
  }
  const settings = settingsSchema.safeParse(lineFeature.properties);
  if (!settings.success) {
    const issue = settings.error.issues[0]!;
    throw new ImportError(
      { file: fileName, field: [`${lineFeature.field}.properties`, ...issue.path.map(String)].join('.') },
      issue.message,
    );
  }

  // Stops: the properties' own FeatureCollection (our export), then any Point features.
  const nested = lineFeature.properties['stops'];
  if (isObject(nested) && Array.isArray(nested['features'])) {
    nested['features'].forEach((feature: unknown, index: number) => {
      if (!isObject(feature))
        throw new ImportError({ file: fileName, field: `${lineFeature!.field}.properties.stops.features.${index}` }, 'must be a Feature');
      pointFeatures.push({ feature, field: `${lineFeature!.field}.properties.stops.features.${index}` });
    });
  }
  const stops = pointFeatures.map(({ feature, field }, index) => {
    const point = pointSchema.safeParse(feature['geometry']);
    if (!point.success) {
      const issue = point.error.issues[0]!;
      throw new ImportError({ file: fileName, field: [`${field}.geometry`, ...issue.path.map(String)].join('.') }, issue.message);
    }
    const properties = stopPropertiesSchema.safeParse(isObject(feature['properties']) ? feature['properties'] : {});
    if (!properties.success) {
      const issue = properties.error.issues[0]!;
      throw new ImportError({ file: fileName, field: [`${field}.properties`, ...issue.path.map(String)].join('.') }, issue.message);
    }
    const [lon, lat] = point.data.coordinates;
    return { name: properties.data.name ?? `Stop ${index + 1}`, lon, lat, dwellS: properties.data.dwellS ?? 20 };
  });

  const { speedLimits, ...rest } = settings.data;
  return {
    ...rest,
    name: rest.name ?? baseName(fileName),
    geometry: geometry.data,
    stops,
    speedLimits: speedLimits ?? [],
  };
}

export function baseName(fileName: string): string {
  const name = fileName
    .replace(/^.*[\\/]/, '')
    .replace(/\.[^.]+$/, '')
    .trim();
  return (name || 'Imported route').slice(0, 120);
}

function isObject(value: unknown): value is Json {
  return typeof value === 'object' && value !== null && !Array.isArray(value);
}
