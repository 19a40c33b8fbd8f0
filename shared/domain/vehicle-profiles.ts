import * as z from 'zod';
import { vehicleSchema } from './analysis';
import { CLIMATE_LIMITS as C, COP_POINTS, VEHICLE_LIMITS as L, rangeSchema } from './limits';

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
  ambientC: rangeSchema(L.ambientC),
  /** Auxiliary power for this season (heating, cooling, lighting, compressors), W. */
  auxPowerW: rangeSchema(L.auxPowerW),
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
    heatingSetpointC: rangeSchema(C.heatingSetpointC),
    /** Cabin set point while cooling, °C. */
    coolingSetpointC: rangeSchema(C.coolingSetpointC),
    /** Heat-loss coefficient of the body, W/K. */
    bodyUaWPerK: rangeSchema(C.bodyUaWPerK),
    /** Fresh air taken in by the ventilation, m³/h. */
    freshAirM3PerH: rangeSchema(C.freshAirM3PerH),
    /** Air exchanged each time the doors open at a stop, m³. */
    doorAirExchangeM3: rangeSchema(C.doorAirExchangeM3),
    /** Fans, lighting, electronics, compressors: drawn all the time, W. */
    baseLoadW: rangeSchema(C.baseLoadW),
    /** Rated heat output of the heat pump, W; 0 = no heat pump (resistive heating only). */
    heatPumpHeatW: rangeSchema(C.heatPumpHeatW),
    /** Heating COP against outdoor temperature (the maker's test points), ascending in ambientC. */
    heatPumpCop: z
      .array(z.object({ ambientC: rangeSchema(C.copAmbientC), cop: rangeSchema(C.cop) }))
      .min(COP_POINTS.min)
      .max(COP_POINTS.max)
      .refine((points) => points.every((point, i) => i === 0 || point.ambientC > points[i - 1]!.ambientC), 'ambientC must ascend'),
    /** Lowest ambient at which the heat pump runs, °C; below it the resistive back-up heats alone. */
    heatPumpMinAmbientC: rangeSchema(C.heatPumpMinAmbientC),
    /** Cooling energy efficiency ratio (heat removed ÷ electrical power). */
    coolingEer: rangeSchema(C.coolingEer),
    /** Time the cabin is pre-conditioned at the depot before pull-out, s. */
    preconditioningS: rangeSchema(C.preconditioningS),
    /** Heat capacity of the cabin's air and fittings, J/K. */
    cabinHeatCapacityJPerK: rangeSchema(C.cabinHeatCapacityJPerK),
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
  loadsKg: z.object({ empty: rangeSchema(L.payloadKg), seated: rangeSchema(L.payloadKg), 'full-standing': rangeSchema(L.payloadKg) }),
  /** Mass assumed per passenger, kg, when a scenario gives a passenger count. */
  passengerMassKg: rangeSchema(L.passengerMassKg).default(70),
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
