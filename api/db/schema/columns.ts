import { sql } from 'drizzle-orm';
import { customType, text, timestamp, uuid } from 'drizzle-orm/pg-core';

export const timestamps = {
  createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  updatedAt: timestamp({ withTimezone: true })
    .notNull()
    .defaultNow()
    .$onUpdate(() => new Date()),
};

/**
 * A restorable delete: the row stays, hidden from every list and lookup, until the maintenance
 * sweep removes it for good DELETED_RETENTION_DAYS later (shared/domain/deleted-items.ts).
 */
export const deletion = {
  deletedAt: timestamp({ withTimezone: true }),
  deletedById: uuid(),
  deletedByName: text(),
};

type GeoJsonGeometry = { type: string; coordinates: unknown };

/**
 * A PostGIS geometry column in WGS 84. Drizzle's built-in `geometry()` handles points only, so
 * this writes GeoJSON through ST_GeomFromGeoJSON and reads it back as GeoJSON text: select it
 * with `sql<string>\`ST_AsGeoJSON(...)\`` where the JSON is needed.
 */
export function geometryColumn<TGeometry extends GeoJsonGeometry>(geometryType: string) {
  return customType<{ data: TGeometry; driverData: string }>({
    dataType() {
      return `geometry(${geometryType},4326)`;
    },
    toDriver(value) {
      return sql`ST_SetSRID(ST_GeomFromGeoJSON(${JSON.stringify(value)}), 4326)`;
    },
  });
}
