import { doublePrecision, index, integer, jsonb, pgTable, text, timestamp, uuid } from 'drizzle-orm/pg-core';
import type { LoggedTripAlignment, LoggedTripChannels, LoggedTripGps } from '@shared/domain/logged-trips';
import type { CalibrationResult } from '@shared/domain/calibrations';
import { users } from './people';
import { roadRoutes } from './road-routes';
import { vehicleProfiles } from './vehicle-profiles';

/**
 * A logged trip of one vehicle, as laid on its replay line at upload: the replay line (with the
 * elevations used), the measurements at each of its points, and where it came from. The trip
 * keeps its own line, so it replays the same whatever later happens to the route it matched.
 */
export const loggedTrips = pgTable(
  'logged_trips',
  {
    id: uuid().primaryKey().defaultRandom(),
    vehicleProfileId: uuid()
      .notNull()
      .references(() => vehicleProfiles.id, { onDelete: 'restrict' }),
    name: text().notNull(),
    fileName: text().notNull(),
    /** The first row's time when the file gave timestamps. */
    startedAt: timestamp({ withTimezone: true }),
    samples: integer().notNull(),
    durationS: doublePrecision().notNull(),
    lengthM: doublePrecision().notNull(),
    routeId: uuid().references(() => roadRoutes.id, { onDelete: 'set null' }),
    routeVersion: integer(),
    routeName: text().notNull(),
    routeCreated: text({ enum: ['matched', 'given', 'created'] }).notNull(),
    direction: text({ enum: ['forward', 'reverse'] }).notNull(),
    fromM: doublePrecision().notNull(),
    toM: doublePrecision().notNull(),
    /** Payload during the trip, kg; null when unknown (neither given nor logged as passengers). */
    payloadKg: doublePrecision(),
    payloadSource: text({ enum: ['given', 'passengers', 'unknown'] }).notNull(),
    ambientC: doublePrecision(),
    elevationSource: text({ enum: ['route', 'terrain', 'file'] }).notNull(),
    startSoc: doublePrecision(),
    channels: jsonb().$type<LoggedTripChannels>().notNull(),
    columns: jsonb().$type<string[]>().notNull(),
    ignoredColumns: jsonb().$type<string[]>().notNull(),
    gps: jsonb().$type<LoggedTripGps>().notNull(),
    alignment: jsonb().$type<LoggedTripAlignment>().notNull(),
    uploadedById: uuid().references(() => users.id, { onDelete: 'set null' }),
    uploadedByName: text().notNull(),
    /** Stable key of trips loaded by the demo seed; null otherwise. */
    seedKey: text().unique(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
  },
  (table) => [index('logged_trips_vehicle_profile_id_idx').on(table.vehicleProfileId)],
);
export type LoggedTripRow = typeof loggedTrips.$inferSelect;

/** A fit of a vehicle profile to logged trips, run in the job queue; accepted or rejected by an analyst. */
export const calibrations = pgTable(
  'calibrations',
  {
    id: uuid().primaryKey().defaultRandom(),
    vehicleProfileId: uuid()
      .notNull()
      .references(() => vehicleProfiles.id, { onDelete: 'restrict' }),
    /** Profile version the fit started from. */
    profileVersion: integer().notNull(),
    status: text({ enum: ['queued', 'running', 'done', 'failed'] })
      .notNull()
      .default('queued'),
    failureReason: text(),
    /** The trips fitted on (ids and names kept even if a trip is deleted later). */
    loggedTrips: jsonb().$type<{ id: string; name: string }[]>().notNull(),
    parameters: jsonb().$type<string[]>().notNull(),
    result: jsonb().$type<CalibrationResult>(),
    decision: text({ enum: ['accepted', 'rejected'] }),
    decidedAt: timestamp({ withTimezone: true }),
    decidedByName: text(),
    /** Profile version the accepted fit became. */
    acceptedVersion: integer(),
    /** Network run re-running the profile's scenarios after acceptance. */
    rerunBatchId: uuid(),
    createdById: uuid().references(() => users.id, { onDelete: 'set null' }),
    createdByName: text().notNull(),
    createdAt: timestamp({ withTimezone: true }).notNull().defaultNow(),
    startedAt: timestamp({ withTimezone: true }),
    finishedAt: timestamp({ withTimezone: true }),
  },
  (table) => [index('calibrations_vehicle_profile_id_idx').on(table.vehicleProfileId)],
);
export type CalibrationRow = typeof calibrations.$inferSelect;
