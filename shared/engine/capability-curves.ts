/**
 * Vehicle capability chart data: the tractive force needed against speed on a set of grades and
 * accelerations (road-load equation, engine README §1.1), drawn over the motor envelope:
 *   traction F_max(v) = min(maxTractionForceN, tractionPowerW/v)
 *   regen    F_regen(v) = −min(maxTractionForceN, regenPowerW/v) · fade(v)   (fade: v/regenMinSpeedMps below it, powertrain.ts)
 * Regen force shares the motor's torque limit (from memory: a motor brakes with about the torque
 * it drives with).
 */
import { vehicleSchema, type VehicleInput } from '../domain/analysis';
import { airDensityKgM3 } from './atmosphere';
import { roadLoadForces } from './road-load';
import { regenSpeedFactor } from './powertrain';
import { parseOrThrow } from './validation';

export interface CapabilityCurveOptions {
  /** Default −10…+12 % in 2 % steps. */
  gradesPercent?: number[];
  /** Default 0, 0.5 and 1.0 m/s². */
  accelerationsMps2?: number[];
  /** Default 0…25 m/s in 0.5 m/s steps. */
  speedsMps?: number[];
  altitudeM?: number;
  ambientC?: number;
}

export interface CapabilityCurves {
  speedsMps: number[];
  tractionEnvelopeN: number[];
  regenEnvelopeN: number[];
  curves: { gradePercent: number; accelerationMps2: number; requiredForceN: number[] }[];
}

export function capabilityCurves(vehicleInput: VehicleInput, options: CapabilityCurveOptions = {}): CapabilityCurves {
  const vehicle = parseOrThrow(vehicleSchema, vehicleInput, 'vehicle');
  const grades = options.gradesPercent ?? [-10, -8, -6, -4, -2, 0, 2, 4, 6, 8, 10, 12];
  const accelerations = options.accelerationsMps2 ?? [0, 0.5, 1];
  const speeds = options.speedsMps ?? Array.from({ length: 51 }, (_, i) => i * 0.5);
  const airDensity = airDensityKgM3(options.altitudeM ?? 0, options.ambientC);
  const massKg = vehicle.curbMassKg + vehicle.payloadKg;
  const tractionEnvelopeN = speeds.map((v) =>
    v > 0 ? Math.min(vehicle.maxTractionForceN, vehicle.tractionPowerW / v) : vehicle.maxTractionForceN,
  );
  const regenEnvelopeN = speeds.map((v) =>
    v > 0 && vehicle.regenPowerW > 0
      ? -Math.min(vehicle.maxTractionForceN, vehicle.regenPowerW / v) * regenSpeedFactor(v, vehicle.regenMinSpeedMps)
      : 0,
  );
  const curves = grades.flatMap((gradePercent) =>
    accelerations.map((accelerationMps2) => ({
      gradePercent,
      accelerationMps2,
      requiredForceN: speeds.map(
        (speedMps) =>
          roadLoadForces({
            massKg,
            speedMps,
            gradePercent,
            accelerationMps2,
            rotatingMassFactor: vehicle.rotatingMassFactor,
            rollingResistanceCoefficient: vehicle.rollingResistanceCoefficient,
            dragCoefficient: vehicle.dragCoefficient,
            frontalAreaM2: vehicle.frontalAreaM2,
            airDensityKgM3: airDensity,
          }).tractionN,
      ),
    })),
  );
  return { speedsMps: speeds, tractionEnvelopeN, regenEnvelopeN, curves };
}
