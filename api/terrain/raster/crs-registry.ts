import { readFileSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import proj4 from 'proj4';

/** A coordinate reference system we can transform WGS 84 longitude/latitude into and back. */
export interface CrsDefinition {
  /** "EPSG:<code>" */
  crs: string;
  code: number;
  name: string;
  proj4Definition: string;
  isGeographic: boolean;
}

export type Projector = {
  /** WGS 84 [lon, lat] degrees → model [x, y]. */
  forward(point: readonly [number, number]): [number, number];
  /** Model [x, y] → WGS 84 [lon, lat] degrees. */
  inverse(point: readonly [number, number]): [number, number];
};

const require = createRequire(import.meta.url);
// epsg-index ships one JSON file per EPSG code under s/; reading only the one we need keeps
// the 8 000-code index out of memory.
const EPSG_INDEX_DIR = join(dirname(require.resolve('epsg-index/package.json')), 's');

interface EpsgIndexEntry {
  code: string;
  kind: string;
  name: string;
  proj4: string | null;
}

/**
 * The definition of an EPSG code from the `epsg-index` package, or null when the code is unknown
 * or has no proj4 form (such codes cannot be transformed here).
 */
export function lookupEpsg(code: number): CrsDefinition | null {
  if (!Number.isInteger(code) || code <= 0) return null;
  let entry: EpsgIndexEntry;
  try {
    // Expected failure: the code has no file in the index (unknown or deprecated code).
    entry = JSON.parse(readFileSync(join(EPSG_INDEX_DIR, `${code}.json`), 'utf8')) as EpsgIndexEntry;
  } catch {
    return null;
  }
  // Only horizontal grids: projected or 2-D geographic. Vertical, geocentric, compound and
  // engineering systems cannot place a pixel on the map.
  if (!entry.proj4 || !HORIZONTAL_KINDS.has(entry.kind)) return null;
  return {
    crs: `EPSG:${code}`,
    code,
    name: entry.name,
    proj4Definition: entry.proj4,
    isGeographic: /\+proj=longlat\b/.test(entry.proj4),
  };
}

const HORIZONTAL_KINDS = new Set(['CRS-PROJCRS', 'CRS-GEOGCRS']);

const projectors = new Map<string, Projector>();

/** A (memoised) converter between WGS 84 and the given proj4 definition. */
export function projectorFor(proj4Definition: string): Projector {
  let projector = projectors.get(proj4Definition);
  if (!projector) {
    const converter = proj4('EPSG:4326', proj4Definition);
    projector = {
      forward: (point) => converter.forward([point[0], point[1]]) as [number, number],
      inverse: (point) => converter.inverse([point[0], point[1]]) as [number, number],
    };
    projectors.set(proj4Definition, projector);
  }
  return projector;
}
