import * as z from 'zod';

/**
 * Logged trips: what a vehicle's data logger recorded on one trip (speed, position, battery power
 * and more), laid on a route so the engine can replay it and set the model against it.
 */

export const loggedTripIdParamsSchema = z.object({ loggedTripId: z.uuid() });

/** Where the replay's elevations come from. `auto`: the route's own or the terrain, else the file. */
export const ELEVATION_SOURCES = ['auto', 'route', 'file'] as const;

/** Form fields of `POST /api/vehicles/{vehicleProfileId}/logged-trips` besides the file. */
export const loggedTripUploadFieldsSchema = z.object({
  /** Route the trip ran on; absent: the best-matching saved route, or a new route from the track. */
  routeId: z.uuid().optional(),
  /** Payload during the trip, kg; absent: from a `passengers` column, else unknown. */
  payloadKg: z.coerce.number().min(0).max(100_000).optional(),
  /** Ambient temperature, °C; absent: the mean of an `ambient_c` column, else the ISA temperature. */
  ambientC: z.coerce.number().min(-60).max(60).optional(),
  elevationSource: z.enum(ELEVATION_SOURCES).default('auto'),
  /** Name shown in lists; absent: the file name. */
  name: z.string().trim().min(1).max(200).optional(),
});
export type LoggedTripUploadFields = z.infer<typeof loggedTripUploadFieldsSchema>;

/** The multipart form as documented (the file is read by the upload middleware). */
export const loggedTripMultipartSchema = loggedTripUploadFieldsSchema.extend({
  file: z
    .string()
    .meta({ format: 'binary', description: 'The logged trip as CSV (header row, comma-separated, units in the column names)' }),
});

export const loggedTripChannelsSchema = z.object({
  batteryPower: z.boolean(),
  soc: z.boolean(),
  brakeTemperature: z.boolean(),
  elevation: z.boolean(),
  ambient: z.boolean(),
  passengers: z.boolean(),
});
export type LoggedTripChannels = z.infer<typeof loggedTripChannelsSchema>;

/** How the GPS track was cleaned and how well it matched the route. */
export const loggedTripGpsSchema = z.object({
  method: z.string(),
  outliersRemoved: z.number().int(),
  p95OffsetM: z.number(),
  maxOffsetM: z.number(),
  /** Logged distance scaled by this to fit the matched stretch of route. */
  distanceScale: z.number(),
});
export type LoggedTripGps = z.infer<typeof loggedTripGpsSchema>;

/** The replay line and the measurements at each of its points (see shared/engine/trip-alignment.ts). */
export const loggedTripAlignmentSchema = z.object({
  positions: z.array(z.tuple([z.number(), z.number()])),
  elevationM: z.array(z.number()),
  distanceM: z.array(z.number()),
  arriveS: z.array(z.number()),
  dwellS: z.array(z.number()),
  speedMps: z.array(z.number()),
  energyJ: z.array(z.number()).nullable(),
  dwellEnergyJ: z.array(z.number()).nullable(),
  soc: z.array(z.number().nullable()).nullable(),
  brakeTempC: z.array(z.number().nullable()).nullable(),
});
export type LoggedTripAlignment = z.infer<typeof loggedTripAlignmentSchema>;

export const loggedTripSchema = z.object({
  id: z.uuid(),
  vehicleProfileId: z.uuid(),
  name: z.string(),
  fileName: z.string(),
  startedAt: z.iso.datetime({ offset: true }).nullable(),
  samples: z.number().int(),
  durationS: z.number(),
  lengthM: z.number(),
  routeId: z.uuid().nullable(),
  routeVersion: z.number().int().nullable(),
  routeName: z.string(),
  /** How the route was found: matched among the saved routes, given with the upload, or created from the track. */
  routeCreated: z.enum(['matched', 'given', 'created']),
  /** Whether the trip ran the route in its own direction or against it. */
  direction: z.enum(['forward', 'reverse']),
  fromM: z.number(),
  toM: z.number(),
  payloadKg: z.number().nullable(),
  payloadSource: z.enum(['given', 'passengers', 'unknown']),
  ambientC: z.number().nullable(),
  elevationSource: z.enum(['route', 'terrain', 'file']),
  startSoc: z.number().nullable(),
  channels: loggedTripChannelsSchema,
  columns: z.array(z.string()),
  ignoredColumns: z.array(z.string()),
  gps: loggedTripGpsSchema,
  uploadedBy: z.string(),
  createdAt: z.iso.datetime({ offset: true }),
});
export type LoggedTrip = z.infer<typeof loggedTripSchema>;
export const loggedTripListSchema = z.object({ items: z.array(loggedTripSchema) });

/** 201 answer of an upload. */
export const loggedTripCreatedSchema = z.object({
  loggedTripId: z.uuid(),
  samples: z.number().int(),
  durationS: z.number(),
  lengthM: z.number(),
  trip: loggedTripSchema,
});

export const comparisonQuerySchema = z.object({
  /** Compare with the parameters of this (finished) calibration instead of the current profile. */
  calibrationId: z.uuid().optional(),
});

const statisticsSchema = z.object({ rms: z.number(), bias: z.number() });

/** Measured against modelled along one trip. Errors are modelled − measured. */
export const replayComparisonSchema = z.object({
  loggedTripId: z.uuid(),
  vehicleProfileId: z.uuid(),
  /** What the model ran with: the profile's current version, or a calibration's fitted parameters. */
  basis: z.object({ kind: z.enum(['profile', 'calibration']), profileVersion: z.number().int(), calibrationId: z.uuid().nullable() }),
  series: z.object({
    distanceM: z.array(z.number()),
    timeS: z.array(z.number()),
    speedMps: z.array(z.number()),
    elevationM: z.array(z.number()),
    lon: z.array(z.number()),
    lat: z.array(z.number()),
    measuredPowerW: z.array(z.number().nullable()).nullable(),
    modelledPowerW: z.array(z.number()),
    measuredEnergyWh: z.array(z.number()).nullable(),
    modelledEnergyWh: z.array(z.number()),
    measuredSoc: z.array(z.number().nullable()).nullable(),
    modelledSoc: z.array(z.number()),
    measuredBrakeTempC: z.array(z.number().nullable()).nullable(),
    modelledBrakeTempC: z.array(z.number()),
  }),
  power: z
    .object({
      rmsErrorW: z.number(),
      biasW: z.number(),
      measuredEnergyWh: z.number(),
      modelledEnergyWh: z.number(),
      energyErrorPercent: z.number(),
    })
    .nullable(),
  soc: statisticsSchema.nullable(),
  brakeTemperature: statisticsSchema.nullable(),
  caution: z.string(),
});
export type ReplayComparison = z.infer<typeof replayComparisonSchema>;
