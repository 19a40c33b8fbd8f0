/**
 * API contract of the calculation engine: zod schemas (request parsing, response parsing in the
 * web client, OpenAPI generation) and their inferred types. All quantities are SI; names carry
 * their unit. Defaults for optional vehicle fields come from the 12 m battery bus class
 * (see `shared/engine/vehicle-presets.ts` for their sources).
 */
import * as z from 'zod';
import {
  DEFAULT_ACCELERATION_MPS2,
  DEFAULT_ASCENT_THRESHOLD_M,
  DEFAULT_CURVATURE_WINDOW_M,
  DEFAULT_DECELERATION_MPS2,
  DEFAULT_DESCENT_GAP_TOLERANCE_M,
  DEFAULT_DESCENT_GRADE_THRESHOLD_PERCENT,
  DEFAULT_DESCENT_MIN_LENGTH_M,
  DEFAULT_LATERAL_ACCELERATION_MPS2,
  DEFAULT_MAX_GAP_FILL_M,
  DEFAULT_SMOOTHING_WINDOW_M,
  DEFAULT_SPACING_M,
  DEFAULT_CRAWL_DISTANCE_M,
  DEFAULT_CRAWL_SPEED_KPH,
  DEFAULT_FADE_MARGIN_K,
  DEFAULT_MAX_ROAD_GRADE_PERCENT,
  DEFAULT_WORST_CASE_AMBIENT_C,
} from '../engine/constants';
import { PROFILE_SERIES_NAMES, type ProfileSeriesName } from '../engine/profile-series';
import { DEFAULT_START_SOC, VEHICLE_LIMITS as L, rangeSchema, socSchema } from './limits';

const efficiency = rangeSchema(L.efficiency);
const share = rangeSchema(L.share);

/** Friction brake construction; selects the fade bands used for the risk level. */
export const brakeTypeSchema = z.enum(['disc', 'drum']);
export type BrakeType = z.infer<typeof brakeTypeSchema>;

/**
 * The endurance brake besides regeneration. A braking resistor is fed by the traction motor, so it
 * shares the motor's force and power envelope; a hydrodynamic or eddy-current retarder is a
 * machine of its own with a force that falls away at low speed.
 */
export const retarderTypeSchema = z.enum(['none', 'braking-resistor', 'hydrodynamic', 'eddy-current']);
export type RetarderType = z.infer<typeof retarderTypeSchema>;

/** Road vehicles run on tyres, rail vehicles on steel wheels; selects the adhesion table. */
export const runningGearSchema = z.enum(['road', 'rail']);
export type RunningGear = z.infer<typeof runningGearSchema>;

/** Where traction energy comes from and regenerated energy goes. */
export const powerSourceSchema = z.enum(['battery', 'overhead-line']);
export type PowerSource = z.infer<typeof powerSourceSchema>;

/** Vehicle profile, all SI. */
export const vehicleSchema = z
  .object({
    /** Mass of the empty vehicle ready for service, kg. */
    curbMassKg: rangeSchema(L.curbMassKg),
    /** Passengers and load, kg. Vehicle mass m = curbMassKg + payloadKg. */
    payloadKg: rangeSchema(L.payloadKg),
    frontalAreaM2: rangeSchema(L.frontalAreaM2),
    dragCoefficient: rangeSchema(L.dragCoefficient),
    rollingResistanceCoefficient: rangeSchema(L.rollingResistanceCoefficient),
    /** Extra equivalent mass of rotating parts as a share of m: inertia = (1 + factor)·m·a. */
    rotatingMassFactor: rangeSchema(L.rotatingMassFactor),
    /** Peak traction power at the wheel, W. */
    tractionPowerW: rangeSchema(L.tractionPowerW),
    /** Peak regenerative braking power at the wheel, W. 0 means no regeneration at all. */
    regenPowerW: rangeSchema(L.regenPowerW),
    /** Battery (or line) → wheel efficiency while motoring. */
    drivetrainEfficiency: efficiency,
    /** Wheel → battery (or line) efficiency while regenerating. */
    regenEfficiency: efficiency,
    /** Usable battery energy, Wh. May be 0 for overhead-line vehicles without storage. */
    batteryCapacityWh: rangeSchema(L.batteryCapacityWh),
    /** Battery charge-power limit below the SOC taper, W. */
    maxChargePowerW: rangeSchema(L.maxChargePowerW),
    /** Auxiliary power (heating, cooling, lighting, compressors), drawn all the time, W. */
    auxPowerW: rangeSchema(L.auxPowerW),
    /** Tractive force limit at the wheel (motor torque), N. Also caps the regen force. */
    maxTractionForceN: rangeSchema(L.maxTractionForceN).default(35_000),
    brakeType: brakeTypeSchema.default('disc'),
    /** Thermal mass of all friction brakes taken together (discs/drums with hubs), J/K. */
    brakeThermalMassJPerK: rangeSchema(L.brakeThermalMassJPerK).default(92_000),
    /** Cooled surface of all friction brakes taken together, m². */
    brakeCoolingAreaM2: rangeSchema(L.brakeCoolingAreaM2).default(1.6),
    /** Share of friction-brake heat that goes into the discs or drums. */
    brakeHeatShare: share.default(0.95),
    brakeEmissivity: share.default(0.6),
    /** Endurance brake (retarder or braking resistor) power limit at the wheel, W; 0 = none. */
    retarderPowerW: rangeSchema(L.retarderPowerW).default(0),
    /**
     * Kind of endurance brake. Absent: a braking resistor when `retarderPowerW` > 0, else none
     * (a resistor is the cautious reading: it can never brake beyond the motor).
     */
    retarderType: retarderTypeSchema.optional(),
    /**
     * Regenerative braking power the machine can hold indefinitely, W. Absent: the peak rating
     * `regenPowerW` (no derating). Must not exceed `regenPowerW`.
     */
    regenContinuousPowerW: rangeSchema(L.regenContinuousPowerW).optional(),
    /** How long the peak regeneration rating may be held before the continuous rating applies, s. */
    regenPeakHoldS: rangeSchema(L.regenPeakHoldS).default(60),
    /** Share of the vehicle's weight on the driven (motored) axles; caps regeneration by adhesion. */
    drivenAxleLoadShare: share.default(0.6),
    /** Share of the friction braking done by the rear brake group. */
    rearBrakeShare: share.default(0.6),
    /** Share of the brakes' thermal mass and cooled surface in the rear group. */
    rearBrakeThermalMassShare: rangeSchema(L.rearBrakeThermalMassShare).default(0.5),
    /** Permissible (technically and legally allowed) gross mass, kg. Absent: not stated. */
    permissibleGrossMassKg: rangeSchema(L.permissibleGrossMassKg).optional(),
    runningGear: runningGearSchema.default('road'),
    /** Overhead-line vehicles: share of regenerated power the line can take (receptivity). */
    lineReceptivity: share.default(0.5),
    powerSource: powerSourceSchema.default('battery'),
    /** SOC above which the charge-power limit falls linearly. */
    socTaperStart: share.default(0.85),
    /** SOC at which the charge-power limit reaches zero; the battery never charges above it. */
    socCeiling: share.default(0.95),
    /** Speed below which regeneration fades out (linearly, to nothing at standstill) and the friction brakes take over, m/s. */
    regenMinSpeedMps: rangeSchema(L.regenMinSpeedMps).default(5 / 3.6),
    /**
     * Ambient temperature from which the battery takes its full charge power, °C; below it the
     * charge-power limit falls linearly to `coldChargeShareAtMinus20C` at −20 °C (cells are
     * protected from lithium plating when cold; shared/engine/README.md §3.1).
     */
    coldChargeFullFromC: rangeSchema(L.coldChargeFullFromC).default(10),
    /** Share of the charge-power limit left at −20 °C and below; 1 = no derating (a pack kept warm). */
    coldChargeShareAtMinus20C: share.default(1),
    /**
     * Usable capacity left at the end of the battery's life as a share of the new battery's
     * (service-day runs at end of life). Absent: 0.8, the end of life common practice takes.
     */
    endOfLifeCapacityFraction: rangeSchema(L.endOfLifeFraction).optional(),
    /** Charge-power limit left at the end of the battery's life as a share of the new battery's. Absent: 1. */
    endOfLifeChargePowerFraction: rangeSchema(L.endOfLifeFraction).optional(),
  })
  .superRefine((vehicle, ctx) => {
    if (vehicle.socTaperStart > vehicle.socCeiling) {
      ctx.addIssue({
        code: 'custom',
        path: ['socTaperStart'],
        message: 'must not exceed socCeiling',
      });
    }
    if (vehicle.regenContinuousPowerW !== undefined && vehicle.regenContinuousPowerW > vehicle.regenPowerW) {
      ctx.addIssue({
        code: 'custom',
        path: ['regenContinuousPowerW'],
        message: 'must not exceed the peak rating regenPowerW',
      });
    }
    if (vehicle.permissibleGrossMassKg !== undefined && vehicle.curbMassKg + vehicle.payloadKg > vehicle.permissibleGrossMassKg + 1e-6) {
      ctx.addIssue({
        code: 'custom',
        path: ['payloadKg'],
        message:
          `vehicle mass ${Math.round(vehicle.curbMassKg + vehicle.payloadKg)} kg (curb + payload) exceeds the permissible ` +
          `gross mass of ${Math.round(vehicle.permissibleGrossMassKg)} kg`,
      });
    }
    if (vehicle.powerSource === 'battery' && vehicle.batteryCapacityWh <= 0) {
      ctx.addIssue({
        code: 'custom',
        path: ['batteryCapacityWh'],
        message: 'must be > 0 for a battery vehicle',
      });
    }
  });
export type Vehicle = z.infer<typeof vehicleSchema>;
export type VehicleInput = z.input<typeof vehicleSchema>;

/** Running surface of a run. */
export const surfaceSchema = z.enum(['dry', 'wet', 'snow', 'ice']);
export type Surface = z.infer<typeof surfaceSchema>;

/** Conditions of one run. */
export const conditionsSchema = z.object({
  /** Ambient air temperature, °C. Absent: the ISA temperature at each point's altitude. */
  ambientC: z.number().min(-60).max(60).optional(),
  /** State of charge at the start of the route, 0–1. */
  startSoc: socSchema.default(DEFAULT_START_SOC),
  /** Brake temperature at the start, °C. Absent: ambient. */
  initialBrakeTempC: z.number().min(-60).max(1_000).optional(),
  /**
   * Running surface. Rail vehicles read these as dry rail, wet rail, contaminated rail (leaves,
   * grease) and the worst rail.
   */
  surface: surfaceSchema.default('dry'),
});
export type Conditions = z.infer<typeof conditionsSchema>;

/** One speed-limit stretch, metres along the route. */
export const speedLimitStretchSchema = z
  .object({
    fromM: z.number().min(0),
    toM: z.number().min(0),
    speedKph: z.number().positive().max(300),
  })
  .refine((stretch) => stretch.toM > stretch.fromM, { message: 'toM must exceed fromM', path: ['toM'] });
export type SpeedLimitStretch = z.infer<typeof speedLimitStretchSchema>;

/** A stop with its dwell time. */
export const stopSchema = z.object({
  atM: z.number().min(0),
  /** Dwell time, s (from memory: 15–30 s at an urban stop). */
  dwellS: z.number().min(0).max(86_400).default(20),
  name: z.string().max(200).optional(),
});
export type Stop = z.infer<typeof stopSchema>;

/**
 * Safety settings of an analysis (a network run takes them from the network settings): the worst
 * credible case, the margin advice keeps below fade, and where the model stops holding.
 */
export const safetySettingsSchema = z.object({
  /** Ambient temperature of the worst credible case, °C. */
  worstCaseAmbientC: z.number().min(-20).max(60).default(DEFAULT_WORST_CASE_AMBIENT_C),
  /** Margin the advice keeps below the fade threshold, K. */
  fadeMarginK: z.number().min(0).max(300).default(DEFAULT_FADE_MARGIN_K),
  /** Road design limit: steeper stretches are not drivable as drawn, % (absolute grade). */
  maxRoadGradePercent: z.number().min(1).max(60).default(DEFAULT_MAX_ROAD_GRADE_PERCENT),
  /** A speed profile below this speed … km/h … */
  crawlSpeedKph: z.number().min(0).max(30).default(DEFAULT_CRAWL_SPEED_KPH),
  /** … for at least this distance marks a stretch not drivable as drawn, m. */
  crawlDistanceM: z.number().min(10).max(10_000).default(DEFAULT_CRAWL_DISTANCE_M),
  /**
   * Heaviest mass of the worst credible case, kg. Absent: the vehicle's permissible gross mass,
   * or its run mass when none is stated (the result then says so).
   */
  worstCaseMassKg: z.number().positive().max(300_000).optional(),
});
export type SafetySettings = z.infer<typeof safetySettingsSchema>;

/** Analysis options; every one has a documented default. */
export const optionsSchema = z.object({
  /** Resampling spacing, m. */
  spacingM: z.number().min(1).max(200).default(DEFAULT_SPACING_M),
  /** One speed limit for the whole route, or stretches (outside them: the largest given limit). */
  speedLimitKph: z.union([z.number().positive().max(300), z.array(speedLimitStretchSchema).min(1)]).default(50),
  stops: z.array(stopSchema).default([]),
  /** Elevation smoothing window, m; 0 switches smoothing off. */
  smoothingWindowM: z.number().min(0).max(5_000).default(DEFAULT_SMOOTHING_WINDOW_M),
  smoothingMethod: z.enum(['moving-average', 'savitzky-golay']).default('moving-average'),
  /** Speed cap applied where the grade is below `descentGradeThresholdPercent`, km/h. */
  descentSpeedCapKph: z.number().positive().max(300).optional(),
  /** Grade below which a stretch counts as descending, % (negative). */
  descentGradeThresholdPercent: z.number().min(-30).max(0).default(DEFAULT_DESCENT_GRADE_THRESHOLD_PERCENT),
  descentMinLengthM: z.number().min(0).max(100_000).default(DEFAULT_DESCENT_MIN_LENGTH_M),
  /** Flats or short rises up to this length do not split a descent, m. */
  descentGapToleranceM: z.number().min(0).max(5_000).default(DEFAULT_DESCENT_GAP_TOLERANCE_M),
  lateralAccelerationMps2: z.number().positive().max(5).default(DEFAULT_LATERAL_ACCELERATION_MPS2),
  accelerationMps2: z.number().positive().max(5).default(DEFAULT_ACCELERATION_MPS2),
  decelerationMps2: z.number().positive().max(10).default(DEFAULT_DECELERATION_MPS2),
  /** Limit the felt deceleration d + g·sin θ on descents to `decelerationMps2` (shared/engine/README.md §7.2 option). */
  slopeAwareDeceleration: z.boolean().default(false),
  curvatureWindowM: z.number().min(0).max(1_000).default(DEFAULT_CURVATURE_WINDOW_M),
  /** Hysteresis for total ascent/descent, m. */
  ascentThresholdM: z.number().min(0).max(100).default(DEFAULT_ASCENT_THRESHOLD_M),
  /** Longest terrain gap filled by linear interpolation, m; longer gaps are refused. */
  maxGapFillM: z.number().min(0).max(10_000).default(DEFAULT_MAX_GAP_FILL_M),
  /** Whether the vehicle starts and ends at rest (terminals). */
  startAtRest: z.boolean().default(true),
  endAtRest: z.boolean().default(true),
  safety: safetySettingsSchema.default(safetySettingsSchema.parse({})),
});
export type AnalysisOptions = z.infer<typeof optionsSchema>;
export type AnalysisOptionsInput = z.input<typeof optionsSchema>;

/** POST /api/analysis/road-load body. */
export const roadLoadRequestSchema = z.object({
  vehicle: vehicleSchema,
  speedMps: z.number().min(0).max(150),
  /** 100·tan θ, positive uphill. */
  gradePercent: z.number().min(-100).max(100),
  accelerationMps2: z.number().min(-20).max(20).default(0),
  altitudeM: z.number().min(-1_000).max(11_000).default(0),
  ambientC: z.number().min(-60).max(60).optional(),
});
export type RoadLoadRequest = z.infer<typeof roadLoadRequestSchema>;
export type RoadLoadRequestInput = z.input<typeof roadLoadRequestSchema>;

export const roadLoadResponseSchema = z.object({
  rollingN: z.number(),
  aeroN: z.number(),
  gradeN: z.number(),
  inertiaN: z.number(),
  tractionN: z.number(),
  tractionPowerW: z.number(),
  airDensityKgM3: z.number(),
});
export type RoadLoadResponse = z.infer<typeof roadLoadResponseSchema>;

const longitude = z.number().min(-180).max(180);
const latitude = z.number().min(-90).max(90);
/** GeoJSON position (RFC 7946): [lon, lat] or [lon, lat, elevation m]. */
export const positionSchema = z.union([z.tuple([longitude, latitude]), z.tuple([longitude, latitude, z.number().min(-1_000).max(11_000)])]);

/** GeoJSON LineString (RFC 7946), WGS 84. */
export const lineStringSchema = z.object({
  type: z.literal('LineString'),
  coordinates: z.array(positionSchema).min(2),
  bbox: z.array(z.number()).optional(),
});
export type LineString = z.infer<typeof lineStringSchema>;

/** POST /api/analysis/preview body. */
export const previewRequestSchema = z.object({
  route: lineStringSchema,
  vehicle: vehicleSchema,
  conditions: conditionsSchema.default({ startSoc: DEFAULT_START_SOC, surface: 'dry' }),
  options: optionsSchema.default(optionsSchema.parse({})),
});
export type PreviewRequest = z.infer<typeof previewRequestSchema>;
export type PreviewRequestInput = z.input<typeof previewRequestSchema>;

export const riskLevelSchema = z.enum(['low', 'elevated', 'high', 'critical']);
export type RiskLevel = z.infer<typeof riskLevelSchema>;

/** Route totals for one direction. Energies in Wh. */
export const summarySchema = z.object({
  /** Geodesic (horizontal) length, m. */
  lengthM: z.number(),
  /** Length along the road surface (slope length), m. */
  slopeLengthM: z.number(),
  ascentM: z.number(),
  descentM: z.number(),
  durationS: z.number(),
  /** Wheel energy while driving (positive wheel power only). */
  tractionEnergyWh: z.number(),
  /** Wheel energy while braking (all braking systems together). */
  brakingEnergyWh: z.number(),
  /** Energy into the battery (or line) from regeneration, after regenEfficiency. */
  regenEnergyWh: z.number(),
  /** Energy absorbed at the wheel by the friction brakes. */
  frictionBrakeEnergyWh: z.number(),
  /** Energy absorbed at the wheel by the retarder or braking resistor. */
  retarderEnergyWh: z.number(),
  auxEnergyWh: z.number(),
  /** Energy drawn from the battery (or line) minus energy put back: traction/η + aux − regen. */
  batteryNetEnergyWh: z.number(),
  kWhPerKm: z.number(),
  peakBrakeTempC: z.number(),
  gsrsPeakBrakeTempC: z.number(),
  startSoc: z.number(),
  endSoc: z.number(),
  /** Energy the battery could not supply because it was empty (SOC held at 0). */
  energyShortfallWh: z.number(),
  /** Length over which the needed tractive force exceeded the vehicle's traction envelope, m. */
  tractionLimitedM: z.number(),
});
export type Summary = z.infer<typeof summarySchema>;

/** Per-point arrays, all the same length (one entry per resampled point). */
export const profileSchema = z.object(
  // One array per series of the engine's table (shared/engine/profile-series.ts), in its order.
  Object.fromEntries(PROFILE_SERIES_NAMES.map((name) => [name, z.array(z.number())])) as {
    [Name in ProfileSeriesName]: z.ZodArray<z.ZodNumber>;
  },
);
export type Profile = z.infer<typeof profileSchema>;

/** The name of one per-point series of the profile. */
export const profileSeriesSchema = profileSchema.keyof();
export type ProfileSeries = z.infer<typeof profileSeriesSchema>;

/**
 * The per-point profile as a client asked for it (`ProfileView`): possibly only some series and
 * fewer points; `distanceM` is always there, so every value can be placed along the route.
 */
export const profileSubsetSchema = profileSchema.partial().required({ distanceM: true });
export type ProfileSubset = z.infer<typeof profileSubsetSchema>;

/**
 * Query options of the endpoints that answer a per-point profile (preview, scenario result):
 * `profileStepM` keeps about one point per that many metres (each step's first, hottest and
 * fastest points, and the last point, each value rounded to the CSV export's precision);
 * `series` keeps only the named series (comma-separated). Without them the answer is the full
 * profile, as before.
 */
export const profileViewQuerySchema = z.object({
  profileStepM: z.coerce
    .number()
    .min(1, 'profileStepM must be at least 1 m')
    .max(10_000, 'profileStepM must be at most 10 000 m')
    .optional()
    .meta({
      description:
        'Keep about one point per this many metres (1–10 000); the hottest and fastest point of each step stay in; values are rounded to the precision of the CSV export',
    }),
  series: z
    .string()
    .transform((text) =>
      text
        .split(',')
        .map((name) => name.trim())
        .filter((name) => name.length > 0),
    )
    .pipe(z.array(profileSeriesSchema).min(1, 'name at least one series'))
    .optional()
    .meta({
      description: `Only these per-point series, comma-separated (distanceM is always included): ${profileSchema.keyof().options.join(', ')}`,
    }),
});
export type ProfileView = z.infer<typeof profileViewQuerySchema>;

/**
 * What the speed advice of a descent means. `'not-drivable'`: part of the descent is not drivable
 * as drawn (see `drivability`), so the model does not hold there and no speed is advised.
 */
export const speedAdviceSchema = z.enum(['limit', 'no-limit-needed', 'not-holdable', 'not-drivable']);

/** Why a descent has no highest SOC at the top. */
export const maxTopSocReasonSchema = z.enum([
  /** Even with an empty battery the brakes pass the advisory limit (threshold − margin). */
  'no-soc-keeps-brakes-cool',
  /** Overhead-line vehicle: the SOC of an on-board battery does not change what regeneration takes. */
  'no-battery',
  /** The vehicle has no regeneration. */
  'no-regeneration',
  /** Part of the descent is not drivable as drawn; no advice is given. */
  'not-drivable',
]);
export type MaxTopSocReason = z.infer<typeof maxTopSocReasonSchema>;

/** Hotter axle group: front and rear friction-brake temperatures, °C. */
export const axleTemperaturesSchema = z.object({ front: z.number(), rear: z.number() });

/** The adverse conditions the worst credible case takes together. */
export const worstCaseConditionsSchema = z.object({
  /** Regeneration is unavailable (battery or inverter trip, full pack, line over-voltage, dewirement). */
  regenerationAvailable: z.literal(false),
  /** Whether a braking resistor (fed by the motor) is lost with it; independent retarders stay. */
  brakingResistorAvailable: z.boolean(),
  /** Whether an independent retarder (hydrodynamic, eddy-current) keeps working. */
  retarderAvailable: z.boolean(),
  /** SOC at the top: the battery's ceiling (null: no battery). */
  socAtTop: z.number().nullable(),
  /** Vehicle mass, kg, and where it comes from. */
  massKg: z.number(),
  massBasis: z.enum(['stated', 'permissible-gross-mass', 'run-mass']),
  ambientC: z.number(),
  /** Brake temperature at the top of the descent: carried from the worst-case run before it, °C. */
  brakeTempAtTopC: z.number(),
  surface: surfaceSchema,
});
export type WorstCaseConditions = z.infer<typeof worstCaseConditionsSchema>;

export const worstCaseSchema = z.object({
  /** Peak temperature of the hotter brake group, °C. */
  peakBrakeTempC: z.number(),
  peakBrakeTempByAxleC: axleTemperaturesSchema.optional(),
  risk: riskLevelSchema,
  /** Highest constant speed keeping the hotter brake group under threshold − margin, whole km/h rounded down. */
  maxSafeSpeedKph: z.number().nullable(),
  speedAdvice: speedAdviceSchema,
  conditions: worstCaseConditionsSchema,
});
export type WorstCase = z.infer<typeof worstCaseSchema>;

export const SENSITIVITY_INPUTS = ['soc', 'mass', 'brake-cooling', 'brake-thermal-mass', 'regen-continuous'] as const;
export const sensitivityInputSchema = z.enum(SENSITIVITY_INPUTS);
export type SensitivityInput = z.infer<typeof sensitivityInputSchema>;

/**
 * Peak brake temperature (hotter group, regeneration working) with one input moved down and up:
 * SOC ±5 points, mass ±10 %, brake cooling ±30 %, brake thermal mass ±20 %; regen-continuous
 * compares the peak rating (low) with the continuous rating held all the way (high).
 */
export const sensitivityEntrySchema = z.object({
  input: sensitivityInputSchema,
  lowPeakBrakeTempC: z.number(),
  highPeakBrakeTempC: z.number(),
});
export type SensitivityEntry = z.infer<typeof sensitivityEntrySchema>;

export const DRIVABILITY_REASONS = ['steeper-than-road-limit', 'beyond-traction', 'beyond-braking-adhesion', 'crawl'] as const;
export const drivabilityStretchSchema = z.object({
  fromM: z.number(),
  toM: z.number(),
  reason: z.enum(DRIVABILITY_REASONS),
  /** Plain words: what was exceeded and by how much. */
  detail: z.string(),
});
export type DrivabilityStretch = z.infer<typeof drivabilityStretchSchema>;

export const drivabilitySchema = z.object({
  /** False when any stretch is not drivable as drawn. */
  drivable: z.boolean(),
  stretches: z.array(drivabilityStretchSchema),
});
export type Drivability = z.infer<typeof drivabilitySchema>;

export const adhesionSchema = z.object({
  surface: surfaceSchema,
  /** Adhesion coefficient the surface gives (see shared/engine/adhesion.ts for the sources). */
  availableMu: z.number(),
  /** Highest adhesion needed to hold the descent's speed and make a service stop, on all wheels. */
  requiredMu: z.number(),
  /** Where it occurs, m along the route. */
  requiredAtM: z.number(),
  /** False: holding speed plus a service stop needs more adhesion than the surface gives. */
  sufficient: z.boolean(),
  /** Whether adhesion on the driven axle capped regeneration somewhere on the descent. */
  regenLimitedByAdhesion: z.boolean(),
});
export type Adhesion = z.infer<typeof adhesionSchema>;

export const descentSchema = z.object({
  startM: z.number(),
  endM: z.number(),
  lengthM: z.number(),
  /** Height lost, m (positive). */
  dropM: z.number(),
  /** Mean grade, % — negative on a descent (gradePercent is positive uphill). */
  meanGradePercent: z.number(),
  /** Steepest segment grade, % — the most negative value. */
  maxGradePercent: z.number(),
  /** m·g·drop, Wh. */
  gravityEnergyWh: z.number(),
  /** Wheel braking energy on the descent (all braking systems), Wh. */
  brakingEnergyWh: z.number(),
  regenEnergyWh: z.number(),
  frictionBrakeEnergyWh: z.number(),
  retarderEnergyWh: z.number(),
  /** Peak of the whole-vehicle brake lump on the run (regeneration working), °C. */
  peakBrakeTempC: z.number(),
  /**
   * Heavy-truck grade-rating reference temperature (GSRS constants for 5-axle trucks), °C. Shown
   * only as what it is; never used for the risk or the advice.
   */
  gsrsPeakBrakeTempC: z.number(),
  /**
   * Risk shown for the descent: the worst credible case's (`worstCase.risk`) when present; the
   * nominal run's risk is `nominalRisk`. Results stored before the worst case existed hold the
   * nominal risk here.
   */
  risk: riskLevelSchema,
  /** Risk of the nominal run (hotter brake group, regeneration working). */
  nominalRisk: riskLevelSchema.optional(),
  /** Brake temperature at which fade becomes likely for this brake type, °C. */
  fadeThresholdC: z.number(),
  /** Margin the advice keeps below the fade threshold, K (advice holds the brakes at or below fadeThresholdC − fadeMarginK). */
  fadeMarginK: z.number().optional(),
  /** Peak temperature of each brake group on the nominal run, °C. */
  peakBrakeTempByAxleC: axleTemperaturesSchema.optional(),
  /**
   * Highest constant descent speed keeping the brakes at or below the fade threshold minus the
   * margin, regeneration working, in whole km/h rounded down. null with `speedAdvice:
   * 'no-limit-needed'` (every speed up to the search ceiling is fine), `'not-holdable'` (even
   * walking pace overheats the brakes) or `'not-drivable'`.
   */
  maxSafeSpeedKph: z.number().nullable(),
  speedAdvice: speedAdviceSchema,
  /**
   * Highest SOC at the top (whole percent, rounded down) that keeps the hotter brake group at or
   * below the fade threshold minus the margin with regeneration working; null with a
   * `maxTopSocReason` when no SOC does (or SOC plays no part).
   */
  maxTopSoc: z.number().nullable(),
  maxTopSocReason: maxTopSocReasonSchema.nullable().optional(),
  /** The same descent under the worst credible case (see `worstCaseConditionsSchema`). */
  worstCase: worstCaseSchema.optional(),
  sensitivity: z.array(sensitivityEntrySchema).optional(),
  /** The input whose low–high spread of peak temperature is the widest. */
  sensitivityDominantInput: sensitivityInputSchema.optional(),
  drivability: drivabilitySchema.optional(),
  adhesion: adhesionSchema.optional(),
  socAtTop: z.number(),
  /** Net braking energy exceeds the UN R13 Type-II reference descent for this mass. */
  beyondTypeApprovalReference: z.boolean(),
});
export type Descent = z.infer<typeof descentSchema>;

export const uncoveredStretchSchema = z.object({
  fromM: z.number(),
  toM: z.number(),
  /** Whether the gap was filled by linear interpolation. */
  filled: z.boolean(),
});
export type UncoveredStretchReport = z.infer<typeof uncoveredStretchSchema>;

export const previewResponseSchema = z.object({
  summary: summarySchema,
  profile: profileSchema,
  descents: z.array(descentSchema),
  uncoveredStretches: z.array(uncoveredStretchSchema).optional(),
  /** Stretches of the whole route that are not drivable as drawn. */
  drivability: drivabilitySchema.optional(),
  caution: z.string(),
  engineVersion: z.string(),
});
export type PreviewResponse = z.infer<typeof previewResponseSchema>;

/** The preview as answered with a ProfileView (the full profileSchema without one). */
export const previewViewResponseSchema = previewResponseSchema.extend({ profile: profileSubsetSchema });
