import * as z from 'zod';
import { vehicleSchema } from './analysis';

/**
 * Vehicle profiles: the engine's vehicle parameters plus the load and season variants a
 * scenario picks from. Presets (the generic vehicle classes) are read-only; analysts copy them.
 */

export const vehicleProfileIdParamsSchema = z.object({ vehicleProfileId: z.uuid() });

export const LOAD_CASES = ['empty', 'seated', 'full-standing'] as const;
export const loadCaseSchema = z.enum(LOAD_CASES);
export type LoadCase = z.infer<typeof loadCaseSchema>;

export const SEASONS = ['winter', 'mild', 'summer'] as const;
export const seasonSchema = z.enum(SEASONS);
export type Season = z.infer<typeof seasonSchema>;

export const seasonConditionsSchema = z.object({
  ambientC: z.number().min(-60).max(60),
  /** Auxiliary power for this season (heating, cooling, lighting, compressors), W. */
  auxPowerW: z.number().min(0).max(500_000),
});

/**
 * Heating, cooling and ventilation of the cabin, for service-day runs: auxiliary power from the
 * ambient temperature, occupancy and door openings instead of one constant per season. A field
 * left out takes the engine's default (shared/engine/constants.ts DEFAULT_CLIMATE, with its sources
 * in the engine README). Scenario runs keep the season's constant auxiliary power.
 */
export const climateSettingsSchema = z
  .object({
    /** Cabin set point while heating, °C. */
    heatingSetpointC: z.number().min(5).max(30),
    /** Cabin set point while cooling, °C. */
    coolingSetpointC: z.number().min(15).max(35),
    /** Heat-loss coefficient of the body, W/K. */
    bodyUaWPerK: z.number().min(0).max(5_000),
    /** Fresh air taken in by the ventilation, m³/h. */
    freshAirM3PerH: z.number().min(0).max(10_000),
    /** Air exchanged each time the doors open at a stop, m³. */
    doorAirExchangeM3: z.number().min(0).max(100),
    /** Fans, lighting, electronics, compressors: drawn all the time, W. */
    baseLoadW: z.number().min(0).max(100_000),
    /** Rated heat output of the heat pump, W; 0 = no heat pump (resistive heating only). */
    heatPumpHeatW: z.number().min(0).max(200_000),
    /** Heating COP against outdoor temperature (the maker's test points), ascending in ambientC. */
    heatPumpCop: z
      .array(z.object({ ambientC: z.number().min(-40).max(40), cop: z.number().min(1).max(8) }))
      .min(1)
      .max(20)
      .refine((points) => points.every((point, i) => i === 0 || point.ambientC > points[i - 1]!.ambientC), 'ambientC must ascend'),
    /** Lowest ambient at which the heat pump runs, °C; below it the resistive back-up heats alone. */
    heatPumpMinAmbientC: z.number().min(-40).max(20),
    /** Cooling energy efficiency ratio (heat removed ÷ electrical power). */
    coolingEer: z.number().min(0.5).max(8),
    /** Time the cabin is pre-conditioned at the depot before pull-out, s. */
    preconditioningS: z.number().min(0).max(7_200),
    /** Heat capacity of the cabin's air and fittings, J/K. */
    cabinHeatCapacityJPerK: z.number().min(0).max(10_000_000),
  })
  .partial();
export type ClimateSettingsInput = z.infer<typeof climateSettingsSchema>;

const vehicleProfileDraftShape = z.object({
  name: z.string().trim().min(1).max(120),
  description: z.string().trim().max(2_000).default(''),
  /** Id of the generic class this profile derives from (see shared/engine/vehicle-presets.ts). */
  vehicleClass: z.string().max(60),
  /** Engine parameters, SI; `payloadKg` here is ignored in favour of the load case. */
  vehicle: vehicleSchema,
  /** Payload per load case, kg. */
  loadsKg: z.object({ empty: z.number().min(0), seated: z.number().min(0), 'full-standing': z.number().min(0) }),
  /** Mass assumed per passenger, kg, when a scenario gives a passenger count. */
  passengerMassKg: z.number().min(40).max(120).default(70),
  seasons: z.object({ winter: seasonConditionsSchema, mild: seasonConditionsSchema, summer: seasonConditionsSchema }),
  /**
   * Cabin climate for service-day runs; null: the season's constant auxiliary power there too.
   * Left out of a change: the stored climate is kept (a client that does not know it loses nothing).
   */
  climate: climateSettingsSchema.nullable().optional(),
});

export const vehicleProfileDraftSchema = vehicleProfileDraftShape.superRefine(loadsWithinPermissibleMass);

/** Refuses load cases that take the vehicle above its permissible gross mass, naming the load case. */
function loadsWithinPermissibleMass(
  draft: { vehicle: { curbMassKg: number; permissibleGrossMassKg?: number | undefined }; loadsKg: Record<LoadCase, number> },
  ctx: z.RefinementCtx,
): void {
  const limitKg = draft.vehicle.permissibleGrossMassKg;
  if (limitKg === undefined) return;
  for (const loadCase of LOAD_CASES) {
    const massKg = draft.vehicle.curbMassKg + draft.loadsKg[loadCase];
    if (massKg > limitKg + 1e-6) {
      ctx.addIssue({
        code: 'custom',
        path: ['loadsKg', loadCase],
        message: `the ${loadCase} load takes the vehicle to ${Math.round(massKg)} kg, above its permissible gross mass of ${Math.round(limitKg)} kg`,
      });
    }
  }
}
export type VehicleProfileDraft = z.infer<typeof vehicleProfileDraftSchema>;
export type VehicleProfileDraftInput = z.input<typeof vehicleProfileDraftSchema>;

/** Where a profile version came from when it was fitted to logged trips. */
export const profileCalibrationSourceSchema = z.object({
  calibrationId: z.uuid(),
  acceptedAt: z.iso.datetime({ offset: true }),
  acceptedBy: z.string(),
  /** The logged trips the version was fitted on (names kept if a trip is deleted later). */
  loggedTrips: z.array(z.object({ id: z.string(), name: z.string() })),
});
export type ProfileCalibrationSource = z.infer<typeof profileCalibrationSourceSchema>;

export const vehicleProfileSchema = vehicleProfileDraftShape.extend({
  id: z.uuid(),
  /** Whether this is a built-in generic class (read-only). */
  isPreset: z.boolean(),
  /** Saved version number: every save and every accepted calibration adds one. */
  version: z.number().int().min(1),
  /** When the current version is an accepted calibration: which fit and which logged trips. */
  calibration: profileCalibrationSourceSchema.nullable(),
  updatedAt: z.iso.datetime({ offset: true }),
});
export type VehicleProfile = z.infer<typeof vehicleProfileSchema>;
export const vehicleProfileListSchema = z.object({ items: z.array(vehicleProfileSchema) });

/** GET /api/vehicles/:vehicleProfileId/capability query. */
export const capabilityQuerySchema = z.object({
  load: loadCaseSchema.default('seated'),
  season: seasonSchema.default('mild'),
  /** Altitude for the air density, m. */
  altitudeM: z.coerce.number().min(-1_000).max(11_000).default(0),
});
export type CapabilityQuery = z.infer<typeof capabilityQuerySchema>;

/** Capability chart data (shared/engine/capability-curves.ts). Forces in N, positive = traction. */
export const capabilityCurvesSchema = z.object({
  vehicleProfileId: z.uuid(),
  load: loadCaseSchema,
  massKg: z.number(),
  speedsMps: z.array(z.number()),
  tractionEnvelopeN: z.array(z.number()),
  regenEnvelopeN: z.array(z.number()),
  curves: z.array(z.object({ gradePercent: z.number(), accelerationMps2: z.number(), requiredForceN: z.array(z.number()) })),
});
export type CapabilityCurvesResponse = z.infer<typeof capabilityCurvesSchema>;

/** One saved version of a profile (GET /api/vehicles/:vehicleProfileId/versions). */
export const vehicleProfileVersionSchema = z.object({
  version: z.number().int(),
  source: z.enum(['created', 'edited', 'calibration', 'before-history']),
  calibration: profileCalibrationSourceSchema.nullable(),
  savedBy: z.string(),
  savedAt: z.iso.datetime({ offset: true }),
  content: vehicleProfileDraftSchema,
});
export type VehicleProfileVersion = z.infer<typeof vehicleProfileVersionSchema>;
export const vehicleProfileVersionListSchema = z.object({ items: z.array(vehicleProfileVersionSchema) });
