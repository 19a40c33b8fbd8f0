import type { VehicleInput } from '@shared/domain/analysis';

/**
 * The 12 m battery bus of the engine README §1.4 (a), laden: 19 t (13.5 t empty + 5.5 t), Cr 0.007,
 * Cd 0.7, A 8 m². One definition for the API tests and the load benchmarks' preview body.
 */
export const LADEN_12M_BUS = {
  curbMassKg: 13_500,
  payloadKg: 5_500,
  frontalAreaM2: 8,
  dragCoefficient: 0.7,
  rollingResistanceCoefficient: 0.007,
  rotatingMassFactor: 0.05,
  tractionPowerW: 250_000,
  regenPowerW: 200_000,
  drivetrainEfficiency: 0.889,
  regenEfficiency: 0.862,
  batteryCapacityWh: 350_000,
  maxChargePowerW: 200_000,
  auxPowerW: 15_000,
} as const satisfies VehicleInput;
