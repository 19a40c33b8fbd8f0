/**
 * The vehicle parameters a calibration can fit, their search bounds and plain names. Kept apart
 * from the fit itself (calibration-fit.ts) so the web client can use them without the optimiser.
 */

/** Powertrain and road-load parameters fitted on battery power. */
export const POWER_FIT_PARAMETERS = [
  'rollingResistanceCoefficient',
  'dragAreaM2',
  'auxPowerW',
  'drivetrainEfficiency',
  'regenEfficiency',
  'payloadKg',
] as const;
/** Brake thermal parameters fitted on logged brake temperatures. */
export const BRAKE_FIT_PARAMETERS = ['brakeThermalMassJPerK', 'brakeCoolingAreaM2'] as const;
export const FIT_PARAMETERS = [...POWER_FIT_PARAMETERS, ...BRAKE_FIT_PARAMETERS] as const;
export type PowerFitParameter = (typeof POWER_FIT_PARAMETERS)[number];
export type BrakeFitParameter = (typeof BRAKE_FIT_PARAMETERS)[number];
export type FitParameter = (typeof FIT_PARAMETERS)[number];

/**
 * Search bounds of each parameter: wide enough for any bus, trolleybus or tram, tight enough to
 * keep the fit physical (rolling coefficients from 0.001, steel wheel on rail in Engineering ToolBox "Rolling
 * Resistance", to 0.03 on snow; from memory: the snow figure, drag areas 1–15 m², efficiencies
 * well above one half in any electric drive; engine README §9).
 */
export const FIT_BOUNDS: Readonly<Record<FitParameter, readonly [number, number]>> = {
  rollingResistanceCoefficient: [0.001, 0.04],
  dragAreaM2: [0.5, 20],
  auxPowerW: [0, 100_000],
  drivetrainEfficiency: [0.5, 0.99],
  regenEfficiency: [0.3, 0.99],
  payloadKg: [0, 40_000],
  brakeThermalMassJPerK: [5_000, 5_000_000],
  brakeCoolingAreaM2: [0.05, 30],
};

/** Plain names of the parameters, for messages. */
export const FIT_PARAMETER_LABELS: Readonly<Record<FitParameter, string>> = {
  rollingResistanceCoefficient: 'Rolling resistance coefficient',
  dragAreaM2: 'Drag area (Cd·A)',
  auxPowerW: 'Auxiliary power',
  drivetrainEfficiency: 'Drivetrain efficiency',
  regenEfficiency: 'Regeneration efficiency',
  payloadKg: 'Payload',
  brakeThermalMassJPerK: 'Brake thermal mass',
  brakeCoolingAreaM2: 'Brake cooled area',
};
