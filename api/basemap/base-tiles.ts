/**
 * Vector tiles of the base map, cut straight from PostGIS with ST_AsMVT (Mapbox Vector Tile 2.1,
 * 4 096 units per tile, 64 units of buffer so lines and labels continue across tile edges).
 *
 * Generalised by zoom, as small-scale maps are: only the more important roads, waterways and
 * places at small scales; areas smaller than a few pixels left out; lines and outlines
 * simplified to about half a pixel (ST_Simplify) before ST_AsMVTGeom snaps them to the tile grid;
 * below zoom 10 areas come from the pre-simplified `*_low` tables built at import.
 */
import { sql, type SQL } from 'drizzle-orm';
import { LRUCache } from 'lru-cache';
import type { Database } from '../db/client';
import { schemaIdentifier } from '../road-graph/road-graph-build';

/** Web Mercator: metres per pixel of a 256-pixel tile at zoom `z` at the equator (EPSG:3857 half-circumference × 2 / 256). */
export function metresPerPixel(z: number): number {
  return 40_075_016.686 / (256 * 2 ** z);
}

/** Road classes from the zoom at which they appear (small scales show the main network only). */
const ROAD_CLASS_MIN_ZOOM: Record<string, number> = {
  motorway: 5,
  trunk: 5,
  primary: 7,
  rail: 8,
  secondary: 9,
  tertiary: 10,
  tram: 11,
  minor: 12,
  busway: 12,
  service: 13,
  track: 13,
  path: 14,
};
const WATERWAY_MIN_ZOOM: Record<string, number> = { river: 8, canal: 10, stream: 12, drain: 14, ditch: 14 };
const PLACE_MIN_ZOOM: Record<string, number> = {
  city: 4,
  town: 7,
  village: 10,
  island: 10,
  suburb: 12,
  quarter: 12,
  hamlet: 12,
  peak: 11,
  pass: 11,
  neighbourhood: 14,
  locality: 14,
  isolated_dwelling: 15,
  islet: 14,
};
/** Below this zoom areas come from the simplified `landuse_low` / `water_low` tables. */
export const LOW_ZOOM_LIMIT = 10;
/** Areas smaller than this many pixels (a square of 2 × 2) are left out of a tile. */
const MIN_AREA_PX = 4;

function kindsAt(table: Record<string, number>, z: number): string[] {
  return Object.entries(table)
    .filter(([, minZoom]) => z >= minZoom)
    .map(([kind]) => kind);
}

function textArray(values: string[]): SQL {
  return values.length === 0
    ? sql`ARRAY[]::text[]`
    : sql`ARRAY[${sql.join(
        values.map((value) => sql`${value}`),
        sql`, `,
      )}]::text[]`;
}

/** The tile as MVT bytes (empty when nothing of the extract lies in it). */
export async function renderBaseTile(db: Database, schemaName: string, z: number, x: number, y: number): Promise<Buffer> {
  const s = schemaIdentifier(schemaName);
  const pixelM = metresPerPixel(z);
  const tolerance = z >= 14 ? 0 : pixelM / 2;
  const minAreaM2 = MIN_AREA_PX * pixelM * pixelM;
  const low = z < LOW_ZOOM_LIMIT;
  const env = sql`ST_TileEnvelope(${z}::int, ${x}::int, ${y}::int)`;
  const clip = sql`ST_TileEnvelope(${z}::int, ${x}::int, ${y}::int, margin => ${64 / 4096}::float8)`;
  const simplified = (column: SQL) => (tolerance > 0 ? sql`ST_Simplify(${column}, ${tolerance}::float8)` : column);
  const mvtGeom = (column: SQL) => sql`ST_AsMVTGeom(${simplified(column)}, ${env}, 4096, 64, true)`;
  const layer = (name: string, body: SQL) =>
    sql`coalesce((SELECT ST_AsMVT(t, ${name}, 4096, 'geom') FROM (${body}) t WHERE t.geom IS NOT NULL), ''::bytea)`;

  const landuse = layer(
    'landuse',
    sql`SELECT class, kind, name, ${mvtGeom(sql`geom`)} AS geom FROM ${s}.${sql.raw(low ? 'landuse_low' : 'landuse')}
        WHERE geom && ${clip} AND ST_Area(geom) >= ${minAreaM2}::float8 AND ${z} >= 6`,
  );
  const water = layer(
    'water',
    sql`SELECT kind, name, ${mvtGeom(sql`geom`)} AS geom FROM ${s}.${sql.raw(low ? 'water_low' : 'water')}
        WHERE geom && ${clip} AND ST_Area(geom) >= ${minAreaM2}::float8`,
  );
  const waterways = layer(
    'waterways',
    sql`SELECT kind, name, ${mvtGeom(sql`geom`)} AS geom FROM ${s}.waterways
        WHERE geom && ${clip} AND kind = ANY(${textArray(kindsAt(WATERWAY_MIN_ZOOM, z))})`,
  );
  const roads = layer(
    'roads',
    sql`SELECT class, kind, name, ref, is_link AS link, bridge, tunnel, layer, bus_access AS bus, ${mvtGeom(sql`geom`)} AS geom FROM ${s}.roads
        WHERE geom && ${clip} AND class = ANY(${textArray(kindsAt(ROAD_CLASS_MIN_ZOOM, z))})
        ORDER BY layer, way_id`,
  );
  const places = layer(
    'places',
    sql`SELECT kind, name, population, elevation_m AS ele,
          CASE WHEN kind IN ('peak', 'pass') AND elevation_m IS NOT NULL THEN name || ' ' || round(elevation_m)::int || ' m' ELSE name END AS label,
          ST_AsMVTGeom(geom, ${env}, 4096, 64, true) AS geom FROM ${s}.places
        WHERE geom && ${clip} AND kind = ANY(${textArray(kindsAt(PLACE_MIN_ZOOM, z))})
        ORDER BY coalesce(population, 0) DESC, osm_id`,
  );
  const [row] = await db.execute<{ tile: Buffer }>(sql`SELECT ${landuse} || ${water} || ${waterways} || ${roads} || ${places} AS tile`);
  return Buffer.from(row?.tile ?? Buffer.alloc(0));
}

/**
 * Rendered tiles in memory, bounded by bytes (least recently used go first). Keys carry the
 * active import's version, so tiles of a replaced extract are never served and age out.
 */
export class BaseTileCache {
  private readonly cache: LRUCache<string, Buffer>;

  constructor(maxBytes: number) {
    // An empty tile still takes an entry: count it as one byte.
    this.cache = new LRUCache<string, Buffer>({ maxSize: maxBytes, sizeCalculation: (tile) => Math.max(1, tile.length) });
  }

  get(version: string, z: number, x: number, y: number): Buffer | undefined {
    return this.cache.get(`${version}/${z}/${x}/${y}`);
  }

  set(version: string, z: number, x: number, y: number, tile: Buffer): void {
    this.cache.set(`${version}/${z}/${x}/${y}`, tile);
  }

  get sizeBytes(): number {
    return this.cache.calculatedSize;
  }
}
