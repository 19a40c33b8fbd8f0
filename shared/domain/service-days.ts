import * as z from 'zod';
import { riskLevelSchema } from './analysis';
import { rangeSchema, SERVICE_DAY_LIMITS } from './limits';
import { runStatusSchema, scenarioLoadSchema } from './scenarios';
import { seasonSchema } from './vehicle-profiles';

/**
 * A service day: what every vehicle of a network does on one kind of day in one season. Each
 * block is one vehicle's day (pull-out from a depot, trips with layovers between them, pull-in);
 * chargers at the depot and at route ends top the battery up while the vehicle stands. A run
 * simulates every block through the day with the calculation engine, carrying the battery's SOC
 * and the brakes' temperature from one trip to the next.
 */

export const serviceDayIdParamsSchema = z.object({ serviceDayId: z.uuid() });

/** Day types the network settings count per year. */
export const DAY_TYPES = ['weekday', 'saturday', 'sunday-holiday'] as const;
export const dayTypeSchema = z.enum(DAY_TYPES);
export type DayType = z.infer<typeof dayTypeSchema>;

/** Seconds after midnight of the service day; past 24 h for trips that run after midnight (as GTFS). */
export const serviceTimeSSchema = z
  .number()
  .int()
  .min(0)
  .max(36 * 3600);

export const CHARGER_KINDS = ['depot', 'terminus'] as const;
/** A trip runs a route one way; a block's round trips are two trips. */
export const TRIP_DIRECTIONS = ['outbound', 'inbound'] as const;

export const chargerKindSchema = z.enum(CHARGER_KINDS);
export type ChargerKind = z.infer<typeof chargerKindSchema>;

export const chargerSchema = z.object({
  /** Chosen by the client, unique within the service day; blocks and results refer to it. */
  key: z.string().trim().min(1).max(60),
  name: z.string().trim().min(1).max(160),
  kind: chargerKindSchema,
  /** Where it stands, [longitude, latitude] (WGS 84). */
  position: z.tuple([z.number().min(-180).max(180), z.number().min(-90).max(90)]),
  /** Grid-side power the charger delivers, W. */
  powerW: rangeSchema(SERVICE_DAY_LIMITS.chargerPowerW),
  /** Share of grid energy that reaches the battery (charger and battery losses together), 0–1. */
  efficiency: rangeSchema(SERVICE_DAY_LIMITS.chargerEfficiency),
  /** The charger stops at this SOC, 0–1. */
  targetSoc: rangeSchema(SERVICE_DAY_LIMITS.chargerTargetSoc),
  /** Time lost at each stop to connect and disconnect, s. */
  connectS: z.number().min(0).max(600).default(30),
});
export type Charger = z.infer<typeof chargerSchema>;

/** One trip of a block: a saved route version in one direction, leaving at a time, with a load. */
export const blockTripSchema = z.object({
  routeId: z.uuid(),
  routeVersion: z.number().int().min(1).optional(),
  direction: z.enum(TRIP_DIRECTIONS),
  departureS: serviceTimeSSchema,
  load: scenarioLoadSchema.default({ kind: 'case', case: 'seated' }),
  /** GTFS trip_id when the trip came from a feed. */
  gtfsTripId: z.string().max(200).optional(),
});
export type BlockTrip = z.infer<typeof blockTripSchema>;

export const blockSchema = z.object({
  /** GTFS block_id, or a name given on screen; unique within the service day. */
  blockId: z.string().trim().min(1).max(120),
  vehicleProfileId: z.uuid(),
  /** Depot charger (kind 'depot') the vehicle leaves from and returns to; absent: no depot charging. */
  depotChargerKey: z.string().max(60).optional(),
  pullOutS: serviceTimeSSchema,
  pullInS: serviceTimeSSchema,
  /** SOC when the vehicle leaves the depot, 0–1. */
  startSoc: rangeSchema(SERVICE_DAY_LIMITS.startSoc).default(0.95),
  /** Trips in time order; layovers are the gaps between one trip's arrival and the next departure. */
  trips: z.array(blockTripSchema).min(1).max(60),
});
export type Block = z.infer<typeof blockSchema>;

export const BATTERY_AGES = ['beginning-of-life', 'end-of-life'] as const;
export const batteryAgeSchema = z.enum(BATTERY_AGES);
export type BatteryAge = z.infer<typeof batteryAgeSchema>;

export const serviceDayDraftSchema = z.object({
  name: z.string().trim().min(1).max(160),
  dayType: dayTypeSchema,
  season: seasonSchema,
  /** Which point of the battery's life to check the day at. */
  batteryAge: batteryAgeSchema.default('beginning-of-life'),
  /** Lowest SOC a block may reach and still count as worked, 0–1. */
  reserveSoc: rangeSchema(SERVICE_DAY_LIMITS.reserveSoc).default(0.15),
  /** Counted in the board's annual network figures. */
  inService: z.boolean().default(false),
  chargers: z.array(chargerSchema).max(200).default([]),
  blocks: z.array(blockSchema).min(1).max(500),
});
export type ServiceDayDraft = z.infer<typeof serviceDayDraftSchema>;
export type ServiceDayDraftInput = z.input<typeof serviceDayDraftSchema>;

export const serviceDaySchema = serviceDayDraftSchema.extend({
  id: z.uuid(),
  status: runStatusSchema.nullable(),
  failureReason: z.string().nullable(),
  isStale: z.boolean(),
  /** What changed since the stored result was computed, in plain words (empty when not stale). */
  staleReasons: z.array(z.string()),
  computedAt: z.iso.datetime({ offset: true }).nullable(),
  createdBy: z.string(),
  updatedAt: z.iso.datetime({ offset: true }),
});
export type ServiceDay = z.infer<typeof serviceDaySchema>;
export const serviceDayListSchema = z.object({
  items: z.array(
    serviceDaySchema.omit({ blocks: true, chargers: true }).extend({ blockCount: z.number().int(), tripCount: z.number().int() }),
  ),
});

/** A stop at a charger during a layover or at the depot. */
export const chargingEventSchema = z.object({
  chargerKey: z.string(),
  /**
   * 'charging': energy into the battery during a layover; 'preconditioning': the depot charger
   * heating or cooling the cabin before pull-out (no energy into the battery). Absent: charging.
   */
  purpose: z.enum(['charging', 'preconditioning']).optional(),
  startS: z.number(),
  endS: z.number(),
  /** Energy that went into the battery, Wh. */
  energyWh: z.number(),
  /** Energy drawn from the grid, Wh. */
  gridEnergyWh: z.number(),
  socBefore: z.number(),
  socAfter: z.number(),
});

/** A descent of one trip, assessed with the SOC and brake temperature the vehicle arrives with. */
export const serviceDayDescentSchema = z.object({
  tripIndex: z.number().int(),
  routeId: z.uuid(),
  direction: z.enum(TRIP_DIRECTIONS),
  startM: z.number(),
  endM: z.number(),
  dropM: z.number(),
  /** SOC at the top of the descent. */
  arrivalSoc: z.number(),
  /** Brake temperature at the top, carried from what came before, °C. */
  arrivalBrakeTempC: z.number(),
  /** Worst-case peak brake temperature with that arrival state, °C. */
  peakBrakeTempC: z.number(),
  risk: riskLevelSchema,
  /** Risk of the same descent run alone, from a cold start at the scenario's SOC. */
  standaloneRisk: riskLevelSchema,
  /** Whether the risk rose because of what came before (a fuller battery, hotter brakes). */
  worsenedByDay: z.boolean(),
});

/** A block's vehicle as the run used it (battery age, heating and cooling). */
export const blockVehicleSchema = z.object({
  /** Usable battery energy at the day's battery age, Wh. */
  usableCapacityWh: z.number(),
  /** Charge-power limit at the day's battery age, W. */
  maxChargePowerW: z.number(),
  /** 'climate': auxiliary power from the profile's cabin climate; 'season': the season's constant. */
  auxiliarySource: z.enum(['climate', 'season']),
  /** Auxiliary power over the trips, time-weighted mean and highest trip, W (0 when no trip ran). */
  tripAuxPowerW: z.object({ mean: z.number(), max: z.number() }),
  /** Auxiliary power while standing empty with the doors shut (layovers), W. */
  standingAuxPowerW: z.number(),
  /** Of the auxiliary power at standstill, what heats the cabin (0 above the heating set point), W. */
  standingHeatingPowerW: z.number(),
  /** Energy spent pre-conditioning the cabin before pull-out, Wh. */
  preconditioningEnergyWh: z.number(),
});
export type BlockVehicle = z.infer<typeof blockVehicleSchema>;

export const blockResultSchema = z.object({
  blockId: z.string(),
  minSoc: z.number(),
  endSoc: z.number(),
  /** Energy that went into the battery at chargers during the day, Wh. */
  chargedEnergyWh: z.number(),
  /**
   * Net battery energy of the trips and layovers (drawn minus regenerated), Wh. For overhead-line
   * vehicles (whose on-board storage is not modelled) the net energy drawn from the line.
   */
  tripNetEnergyWh: z.number(),
  /**
   * Braking energy of the trips regenerated into the battery or line (at its terminals), and taken
   * by the friction brakes, Wh. Absent from results stored before they were reported.
   */
  regenEnergyWh: z.number().optional(),
  frictionBrakeEnergyWh: z.number().optional(),
  /** Whether the block can be worked: it never falls below the reserve and every trip can be driven. */
  feasible: z.boolean(),
  /** Why not, in plain words (empty when feasible). */
  problems: z.array(z.string()),
  socTrace: z.array(z.object({ timeS: z.number(), soc: z.number() })),
  chargingEvents: z.array(chargingEventSchema),
  descents: z.array(serviceDayDescentSchema),
  /**
   * The vehicle as the day used it: its battery at the day's age and its auxiliary power. Absent
   * from results stored before it was reported.
   */
  vehicle: blockVehicleSchema.optional(),
});
export type BlockResult = z.infer<typeof blockResultSchema>;

export const serviceDayResultSchema = z.object({
  serviceDayId: z.uuid(),
  engineVersion: z.string(),
  computedAt: z.iso.datetime({ offset: true }),
  blocks: z.array(blockResultSchema),
  /** Peak grid power drawn by each charger's site at one time, W. */
  peakChargingPowerW: z.array(z.object({ chargerKey: z.string(), powerW: z.number() })),
  caution: z.string(),
});
export type ServiceDayResult = z.infer<typeof serviceDayResultSchema>;

/** POST /api/service-days/gtfs-blocks: form fields beside the feed (multipart "file"). */
export const gtfsBlocksFieldsSchema = z.object({
  /** calendar.txt / trips.txt service_id of the day to build (e.g. the weekday service). */
  serviceId: z.string().trim().min(1).max(200),
  vehicleProfileId: z.uuid(),
  depotChargerKey: z.string().trim().min(1).max(60).optional(),
});
export const gtfsBlocksMultipartSchema = gtfsBlocksFieldsSchema.extend({
  file: z.string().describe('GTFS feed as a .zip with trips.txt (block_id) and stop_times.txt'),
});
/** What a GTFS feed offers for a service day: each service_id of trips.txt with its trip counts. */
export const gtfsServicesAnswerSchema = z.object({
  services: z.array(
    z.object({
      serviceId: z.string(),
      trips: z.number().int(),
      /** Trips of that service with a block_id (the ones an import keeps). */
      tripsWithBlock: z.number().int(),
      blocks: z.number().int(),
    }),
  ),
});
export const gtfsServicesMultipartSchema = z.object({
  file: z.string().describe('GTFS feed as a .zip with trips.txt'),
});
export const gtfsBlocksAnswerSchema = z.object({
  blocks: z.array(blockSchema),
  /** Trips of that service without a block_id (left out). */
  tripsWithoutBlock: z.number().int(),
});
