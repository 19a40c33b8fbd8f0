import * as z from 'zod';
import { riskLevelSchema, safetySettingsSchema } from './analysis';
import { directionSchema } from './scenarios';
import { DAY_TYPES } from './service-days';
import { SEASONS } from './vehicle-profiles';

/**
 * The board's one-page network summary, computed from scenarios marked "in service" with their
 * routes' trips per day and service days, and the money and emission factors an admin sets.
 */

/** Days of each day type in each season in a year: the weights of the annual service-day basis. */
const seasonDaysSchema = z.object({
  winter: z.number().int().min(0).max(366),
  mild: z.number().int().min(0).max(366),
  summer: z.number().int().min(0).max(366),
});
export const dayCountsSchema = z.object({
  weekday: seasonDaysSchema,
  saturday: seasonDaysSchema,
  'sunday-holiday': seasonDaysSchema,
});
export type DayCounts = z.infer<typeof dayCountsSchema>;

/** Sum of a year's day counts (365, or 366 in a leap year, when they are right). */
export function totalDays(counts: DayCounts): number {
  let total = 0;
  for (const dayType of DAY_TYPES) for (const season of SEASONS) total += counts[dayType][season];
  return total;
}

/**
 * Shipped day counts: winter December–February (90 days), summer June–August (92), mild the
 * rest (183); 250 weekdays, 52 Saturdays and 63 Sundays and public holidays (a common calendar
 * with about 11 holidays on weekdays), shared out over the seasons in proportion. Set your own.
 */
export const DEFAULT_DAY_COUNTS: DayCounts = {
  weekday: { winter: 62, mild: 125, summer: 63 },
  saturday: { winter: 13, mild: 26, summer: 13 },
  'sunday-holiday': { winter: 15, mild: 32, summer: 16 },
};

export const REFERENCE_CONSUMPTION_UNITS = ['l-diesel', 'kwh'] as const;

/**
 * The vehicle the network's CO₂ is compared against (what the electric fleet replaces): its
 * consumption per km and the CO₂ of one unit of what it consumes, with the source.
 */
export const co2ReferenceVehicleSchema = z.object({
  name: z.string().trim().min(1).max(160),
  /** Consumption per km in `consumptionUnit` (litres of diesel, or kWh-equivalent). */
  consumptionPerKm: z.number().min(0.01).max(10),
  consumptionUnit: z.enum(REFERENCE_CONSUMPTION_UNITS),
  /** CO₂ per unit consumed, kg (per litre, or per kWh-equivalent). */
  emissionFactorKgPerUnit: z.number().min(0).max(10),
  source: z.string().trim().min(1).max(400),
});
export type Co2ReferenceVehicle = z.infer<typeof co2ReferenceVehicleSchema>;

/**
 * Shipped reference vehicle: illustrative figures to be replaced by the authority's own fleet
 * data. 0.45 l/km is of the order a 12 m diesel city bus uses on hilly routes (from memory, not
 * checked); 2.68 kg CO₂ per litre of diesel burnt is the usual tank-to-wheel factor (from memory:
 * 10.21 kg per US gallon in the US EPA's emission factors for greenhouse gas inventories).
 */
export const DEFAULT_CO2_REFERENCE_VEHICLE: Co2ReferenceVehicle = {
  name: 'Diesel city bus, 12 m (illustrative placeholder)',
  consumptionPerKm: 0.45,
  consumptionUnit: 'l-diesel',
  emissionFactorKgPerUnit: 2.68,
  source:
    'Illustrative placeholder, from memory and not checked: about 45 l/100 km for a 12 m diesel city bus on hilly routes, and 2.68 kg CO2 per litre ' +
    '(the US EPA emission factors give 10.21 kg per US gallon). Replace with your own fleet’s consumption and a named factor.',
};

export const networkSettingsSchema = z.object({
  /** Price of one kWh of traction energy, in `currency`. */
  energyTariffPerKWh: z.number().min(0).max(10),
  currency: z.string().trim().length(3).toUpperCase(),
  tariffSource: z.string().trim().min(1).max(300),
  /** Emissions of one kWh from the grid, kg CO₂ per kWh. */
  gridEmissionFactorKgPerKWh: z.number().min(0).max(2),
  emissionFactorSource: z.string().trim().min(1).max(300),
  /** Ambient temperature of every descent's worst credible case, °C. */
  worstCaseAmbientC: safetySettingsSchema.shape.worstCaseAmbientC,
  /** Margin the speed and SOC advice keeps below the brakes' fade threshold, K. */
  fadeMarginK: safetySettingsSchema.shape.fadeMarginK,
  /** Road design limit: stretches drawn steeper are not drivable as drawn, %. */
  maxRoadGradePercent: safetySettingsSchema.shape.maxRoadGradePercent,
  /** A speed profile below this speed for `crawlDistanceM` is not drivable as drawn, km/h. */
  crawlSpeedKph: safetySettingsSchema.shape.crawlSpeedKph,
  crawlDistanceM: safetySettingsSchema.shape.crawlDistanceM,
  /** Days of each day type in each season: the weights of the annual figures from service days. */
  dayCounts: dayCountsSchema,
  /** What the network's CO₂ is compared against. */
  co2ReferenceVehicle: co2ReferenceVehicleSchema,
});
export type NetworkSettings = z.infer<typeof networkSettingsSchema>;

/**
 * PUT /api/settings/network: the same fields, but a safety setting left out keeps its stored value
 * (a client that only knows the money and emission factors must not reset the safety assessment).
 */
export const networkSettingsUpdateSchema = networkSettingsSchema.extend({
  worstCaseAmbientC: safetySettingsSchema.shape.worstCaseAmbientC.unwrap().optional(),
  fadeMarginK: safetySettingsSchema.shape.fadeMarginK.unwrap().optional(),
  maxRoadGradePercent: safetySettingsSchema.shape.maxRoadGradePercent.unwrap().optional(),
  crawlSpeedKph: safetySettingsSchema.shape.crawlSpeedKph.unwrap().optional(),
  crawlDistanceM: safetySettingsSchema.shape.crawlDistanceM.unwrap().optional(),
  /** Left out: kept. Must add up to 365 (366 in a leap year), else 422. */
  dayCounts: dayCountsSchema.optional(),
  co2ReferenceVehicle: co2ReferenceVehicleSchema.optional(),
});
export type NetworkSettingsUpdate = z.infer<typeof networkSettingsUpdateSchema>;

/** GET /api/settings/network: the settings and who last set them (null: the shipped placeholders). */
export const networkSettingsViewSchema = networkSettingsSchema.extend({
  /** Whether these are still the shipped illustrative placeholders nobody has replaced. */
  isPlaceholder: z.boolean(),
  updatedAt: z.iso.datetime({ offset: true }).nullable(),
  updatedByName: z.string().nullable(),
});
export type NetworkSettingsView = z.infer<typeof networkSettingsViewSchema>;

export const routeYearSchema = z.object({
  routeId: z.uuid(),
  routeName: z.string(),
  scenarioId: z.uuid(),
  scenarioName: z.string(),
  vehicleProfileName: z.string(),
  /**
   * The scenario's direction. A one-way scenario counts that direction once per round trip (the
   * route's trips per day are round trips); mark a round-trip scenario in service for both ways.
   */
  direction: directionSchema,
  /** When the scenario's result was computed (the latest in-service result of the route is used). */
  computedAt: z.iso.datetime({ offset: true }),
  tripsPerDay: z.number(),
  serviceDaysPerYear: z.number(),
  /** Distance driven in a year, km. */
  annualKm: z.number(),
  /** Energy regeneration puts back into the batteries (or the line) in a year, kWh. */
  annualRegenKWh: z.number(),
  /** Braking energy the friction brakes turn into heat in a year, kWh. */
  annualFrictionBrakeKWh: z.number(),
  /** Net energy drawn from batteries or the line in a year, kWh. */
  annualNetKWh: z.number(),
  kWhPerKm: z.number(),
});
export type RouteYear = z.infer<typeof routeYearSchema>;

export const boardSummarySchema = z.object({
  generatedAt: z.iso.datetime({ offset: true }),
  /**
   * The factors in use; `isPlaceholder` while they are still the shipped illustrative values
   * nobody has replaced: every figure resting on them (value, CO₂) must say so where it is shown.
   */
  settings: networkSettingsSchema
    .pick({ energyTariffPerKWh: true, currency: true, tariffSource: true, gridEmissionFactorKgPerKWh: true, emissionFactorSource: true })
    .extend({ isPlaceholder: z.boolean() }),
  routes: z.array(routeYearSchema),
  totals: z.object({
    annualKm: z.number(),
    annualRegenKWh: z.number(),
    annualFrictionBrakeKWh: z.number(),
    annualNetKWh: z.number(),
    /** annualRegenKWh × tariff. */
    regenValue: z.number(),
    /** annualRegenKWh × grid emission factor, kg. */
    co2AvoidedKg: z.number(),
  }),
  /** Review items still waiting for a safety officer (raised, in review, reopened), by risk. */
  openSafetyItems: z.object({
    elevated: z.number().int(),
    high: z.number().int(),
    critical: z.number().int(),
  }),
  /**
   * High and critical descents whose risk a safety officer accepted: not open, but still in
   * service at that risk, so the board sees them as a figure of their own.
   */
  acceptedRisks: z.object({
    high: z.number().int(),
    critical: z.number().int(),
  }),
  /** The steepest descents in service, one line per stretch of road and direction. */
  steepestDescents: z.array(
    z.object({
      reviewId: z.uuid().nullable(),
      routeName: z.string(),
      direction: directionSchema,
      startM: z.number(),
      endM: z.number(),
      dropM: z.number(),
      meanGradePercent: z.number(),
      risk: riskLevelSchema,
    }),
  ),
  caution: z.string(),
  /** The annual energy, money and CO₂ on one stated basis (service days when any is in service). */
  annual: z.lazy(() => annualBasisSchema),
});
export type BoardSummary = z.infer<typeof boardSummarySchema>;

export const batchRunIdParamsSchema = z.object({ batchRunId: z.uuid() });
export const BATCH_ITEM_STATUSES = ['queued', 'running', 'done', 'failed'] as const;

export const batchRunSchema = z.object({
  id: z.uuid(),
  status: z.enum(['queued', 'running', 'done']),
  total: z.number().int(),
  done: z.number().int(),
  failed: z.number().int(),
  startedBy: z.string(),
  /** Why the run was started when not by hand (e.g. an accepted calibration of a vehicle profile). */
  reason: z.string().nullable(),
  createdAt: z.iso.datetime({ offset: true }),
  finishedAt: z.iso.datetime({ offset: true }).nullable(),
  items: z.array(
    z.object({
      scenarioId: z.uuid(),
      scenarioName: z.string(),
      status: z.enum(BATCH_ITEM_STATUSES),
      error: z.string().nullable(),
    }),
  ),
});
export type BatchRun = z.infer<typeof batchRunSchema>;
export const batchRunListSchema = z.object({ items: z.array(batchRunSchema.omit({ items: true })) });

export const ANNUAL_BASES = ['service-days', 'scenarios'] as const;

/**
 * The network's year on one basis. `service-days`: Σ over the in-service service days of their
 * last stored run × the days of their day type and season in a year (network settings);
 * `scenarios`: the in-service scenarios × trips per day × service days per year (the routes'
 * schedules), used while no service day is in service. `basisText` says which, in plain words.
 */
export const annualBasisSchema = z.object({
  basis: z.enum(ANNUAL_BASES),
  basisText: z.string(),
  /** Net battery (or line) energy of all trips and layovers in a year, kWh. */
  netEnergyKWh: z.number(),
  /**
   * Braking energy regenerated, and taken by the friction brakes, in a year, kWh. Null on the
   * service-days basis while a counted day's stored run predates these figures (rerun it).
   */
  regenEnergyKWh: z.number().nullable(),
  frictionBrakeEnergyKWh: z.number().nullable(),
  /** Energy drawn from the grid in a year (charger losses included where known), kWh. */
  gridEnergyKWh: z.number(),
  /** gridEnergyKWh × tariff, in the settings' currency. */
  energyCost: z.number(),
  /** gridEnergyKWh × grid emission factor, kg. */
  co2Kg: z.number(),
  /** Distance driven in a year, km. */
  annualKm: z.number(),
  /** The same distance driven by the reference vehicle. */
  baseline: co2ReferenceVehicleSchema.extend({ co2Kg: z.number(), co2SavedKg: z.number() }),
  /** Service days counted, with their weight (service-days basis; empty otherwise). */
  serviceDays: z.array(
    z.object({
      id: z.uuid(),
      name: z.string(),
      dayType: z.enum(DAY_TYPES),
      season: z.enum(SEASONS),
      daysPerYear: z.number().int(),
      computedAt: z.iso.datetime({ offset: true }),
      isStale: z.boolean(),
      infeasibleBlocks: z.number().int(),
      dayNetEnergyKWh: z.number(),
      dayGridEnergyKWh: z.number(),
      dayKm: z.number(),
    }),
  ),
  /** Day types and seasons with days in the year but no in-service run: counted as zero, said here. */
  notCovered: z.array(z.object({ dayType: z.enum(DAY_TYPES), season: z.enum(SEASONS), daysPerYear: z.number().int() })),
  /** Highest charging power per charger over the in-service days (service-days basis). */
  peakCharging: z.array(
    z.object({
      chargerKey: z.string(),
      chargerName: z.string(),
      kind: z.enum(['depot', 'terminus']),
      /** Peak grid power during the day (vehicles charging there at once summed), W. */
      daytimePeakW: z.number(),
      /** Depot chargers: every block returning there charging at once after pull-in, W (an upper bound). */
      overnightPeakW: z.number().nullable(),
    }),
  ),
  /** What moves the annual figures most, largest first. */
  sensitivity: z.array(
    z.object({
      factor: z.string(),
      change: z.string(),
      /** Change of the annual energy cost. */
      energyCostDelta: z.number(),
      /** Change of the annual CO₂ saved against the reference vehicle, kg. */
      co2SavedDeltaKg: z.number(),
    }),
  ),
  /** How the sensitivity table is computed and what it leaves out. */
  sensitivityMethod: z.string(),
});
export type AnnualBasis = z.infer<typeof annualBasisSchema>;
