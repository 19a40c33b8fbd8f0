import * as z from 'zod';
import { FIT_PARAMETERS } from '../engine/calibration-parameters';

/**
 * Calibrations: a vehicle profile fitted to logged trips (shared/engine/calibration-fit.ts). A
 * finished fit becomes a new version of the profile only when an analyst accepts it.
 */

export const calibrationIdParamsSchema = z.object({ calibrationId: z.uuid() });
export const fitParameterSchema = z.enum(FIT_PARAMETERS);

/** Most logged trips fitted together (bounds the work of one fit). */
export const MAX_CALIBRATION_TRIPS = 20;

/** `POST /api/vehicles/{vehicleProfileId}/calibrations` body. */
export const calibrationRequestSchema = z.object({
  loggedTripIds: z.array(z.uuid()).min(1).max(MAX_CALIBRATION_TRIPS),
  /**
   * Parameters to fit. Default: rolling resistance, drag area, auxiliary power, drivetrain and
   * regeneration efficiency; payload too when a trip's payload is unknown; the brake thermal
   * parameters when a trip logged brake temperatures.
   */
  fit: z.array(fitParameterSchema).min(1).optional(),
});
export type CalibrationRequest = z.infer<typeof calibrationRequestSchema>;

const powerComparisonSchema = z.object({
  rmsErrorW: z.number(),
  biasW: z.number(),
  measuredEnergyWh: z.number(),
  modelledEnergyWh: z.number(),
  energyErrorPercent: z.number(),
});
const errorStatisticsSchema = z.object({ rms: z.number(), bias: z.number() });
const fittedParameterSchema = z.object({
  key: fitParameterSchema,
  initial: z.number(),
  fitted: z.number(),
  low: z.number().nullable(),
  high: z.number().nullable(),
  standardError: z.number().nullable(),
  atBound: z.enum(['lower', 'upper']).nullable(),
});
export const calibrationWarningSchema = z.object({
  code: z.enum(['indistinguishable', 'ill_conditioned', 'at_bound', 'poorly_determined', 'few_samples', 'no_brake_data']),
  message: z.string(),
  parameters: z.array(fitParameterSchema),
});
const tripResidualsSchema = z.object({
  timeS: z.array(z.number()),
  distanceM: z.array(z.number()),
  measuredW: z.array(z.number()),
  modelledW: z.array(z.number()),
  residualW: z.array(z.number()),
});

/** Everything a finished fit found (stored with the calibration). */
export const calibrationResultSchema = z.object({
  parameters: z.array(fittedParameterSchema),
  correlation: z.object({ keys: z.array(fitParameterSchema), matrix: z.array(z.array(z.number())) }).nullable(),
  warnings: z.array(calibrationWarningSchema),
  before: powerComparisonSchema,
  after: powerComparisonSchema,
  trips: z.array(
    z.object({
      loggedTripId: z.string(),
      name: z.string(),
      before: powerComparisonSchema,
      after: powerComparisonSchema,
      brakeBefore: errorStatisticsSchema.nullable(),
      brakeAfter: errorStatisticsSchema.nullable(),
      residuals: tripResidualsSchema,
    }),
  ),
  brake: z
    .object({
      parameters: z.array(fittedParameterSchema),
      before: errorStatisticsSchema,
      after: errorStatisticsSchema,
      correlation: z.number().nullable(),
    })
    .nullable(),
  statistics: z.object({
    steps: z.number(),
    effectiveSteps: z.number(),
    lag1Autocorrelation: z.number(),
    residualStdW: z.number(),
    conditionNumber: z.number().nullable(),
    iterations: z.number(),
    tQuantile: z.number(),
  }),
  roadLoad: z.object({ massKg: z.number(), aN: z.number(), bNPerMps: z.number(), cNPerMps2: z.number(), airDensityKgM3: z.number() }),
  /** Where the fitted auxiliary power goes on acceptance: the season nearest the trips' mean ambient temperature. */
  auxSeason: z.enum(['winter', 'mild', 'summer']).nullable(),
  method: z.string(),
});
export type CalibrationResult = z.infer<typeof calibrationResultSchema>;

export const CALIBRATION_STATUSES = ['queued', 'running', 'done', 'failed'] as const;

export const calibrationSchema = z.object({
  id: z.uuid(),
  vehicleProfileId: z.uuid(),
  vehicleProfileName: z.string(),
  profileVersion: z.number().int(),
  status: z.enum(CALIBRATION_STATUSES),
  failureReason: z.string().nullable(),
  loggedTrips: z.array(z.object({ id: z.string(), name: z.string() })),
  fit: z.array(fitParameterSchema),
  /** Fitted values of the chosen parameters (SI). */
  fitted: z.partialRecord(fitParameterSchema, z.number()).nullable(),
  /** 95 % interval of each (null when the trips cannot determine it). */
  intervals: z.partialRecord(fitParameterSchema, z.tuple([z.number(), z.number()]).nullable()).nullable(),
  /** Battery power error after the fit, all trips together (duration-weighted RMS), W. */
  rmsErrorW: z.number().nullable(),
  /** Net battery energy, modelled against measured, after the fit, %. */
  energyErrorPercent: z.number().nullable(),
  /** Per trip: the replay steps after the fit, residual = measured − modelled battery power, W. */
  residuals: z.array(z.object({ loggedTripId: z.string(), name: z.string() }).extend(tripResidualsSchema.shape)).nullable(),
  result: calibrationResultSchema.nullable(),
  decision: z.enum(['accepted', 'rejected']).nullable(),
  decidedAt: z.iso.datetime({ offset: true }).nullable(),
  decidedBy: z.string().nullable(),
  acceptedVersion: z.number().int().nullable(),
  rerunBatchId: z.uuid().nullable(),
  createdBy: z.string(),
  createdAt: z.iso.datetime({ offset: true }),
  finishedAt: z.iso.datetime({ offset: true }).nullable(),
});
export type Calibration = z.infer<typeof calibrationSchema>;
/** List entries leave out the per-step residuals. */
export const calibrationListSchema = z.object({ items: z.array(calibrationSchema.omit({ residuals: true, result: true })) });
