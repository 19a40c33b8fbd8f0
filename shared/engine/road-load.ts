/**
 * Road-load (longitudinal force) equation, engine README §1.1:
 *
 *   F_t = F_roll + F_aero + F_grade + F_inertia
 *   F_roll    = Cr·m·g·cos θ          (0 at standstill: it only opposes motion)
 *   F_aero    = ½·ρ·Cd·A·v²           (still air)
 *   F_grade   = m·g·sin θ             (θ = atan(gradePercent/100), positive uphill)
 *   F_inertia = (1 + rotatingMassFactor)·m·a
 *   P         = F_t·v                 (> 0 traction demand, < 0 braking demand)
 *
 * sin θ and cos θ are exact (via atan), not the small-angle tan θ.
 */
import { roadLoadRequestSchema, type RoadLoadRequestInput, type RoadLoadResponse } from '../domain/analysis';
import { STANDARD_GRAVITY_MPS2 } from './constants';
import { airDensityKgM3 } from './atmosphere';
import { assertFinite, assertNonNegative, parseOrThrow } from './validation';

export interface RoadLoadForcesInput {
  massKg: number;
  /** Forward speed relative to still air, m/s (≥ 0). */
  speedMps: number;
  /** 100·tan θ, positive uphill. */
  gradePercent: number;
  accelerationMps2: number;
  /** Extra equivalent mass of rotating parts as a share of m. */
  rotatingMassFactor: number;
  rollingResistanceCoefficient: number;
  dragCoefficient: number;
  frontalAreaM2: number;
  airDensityKgM3: number;
}

export interface RoadLoadForces {
  rollingN: number;
  aeroN: number;
  gradeN: number;
  inertiaN: number;
  tractionN: number;
  tractionPowerW: number;
}

/** Tractive-force components at one operating point. See the module comment for the model. */
export function roadLoadForces(input: RoadLoadForcesInput): RoadLoadForces {
  assertNonNegative('massKg', input.massKg);
  assertNonNegative('speedMps', input.speedMps);
  assertFinite('gradePercent', input.gradePercent);
  assertFinite('accelerationMps2', input.accelerationMps2);
  assertNonNegative('rotatingMassFactor', input.rotatingMassFactor);
  assertNonNegative('rollingResistanceCoefficient', input.rollingResistanceCoefficient);
  assertNonNegative('dragCoefficient', input.dragCoefficient);
  assertNonNegative('frontalAreaM2', input.frontalAreaM2);
  assertNonNegative('airDensityKgM3', input.airDensityKgM3);

  const { massKg, speedMps } = input;
  const gradeFraction = input.gradePercent / 100;
  // cos θ = 1/√(1+G²), sin θ = G/√(1+G²) with G = tan θ (engine README §1.1).
  const secant = Math.sqrt(1 + gradeFraction * gradeFraction);
  const weightN = massKg * STANDARD_GRAVITY_MPS2;
  const rollingN = speedMps > 0 ? (input.rollingResistanceCoefficient * weightN) / secant : 0;
  const aeroN = 0.5 * input.airDensityKgM3 * input.dragCoefficient * input.frontalAreaM2 * speedMps * speedMps;
  const gradeN = (weightN * gradeFraction) / secant;
  const inertiaN = (1 + input.rotatingMassFactor) * massKg * input.accelerationMps2;
  const tractionN = rollingN + aeroN + gradeN + inertiaN;
  return { rollingN, aeroN, gradeN, inertiaN, tractionN, tractionPowerW: tractionN * speedMps };
}

/**
 * Entry point behind `POST /api/analysis/road-load`: parses the request (defaults applied,
 * invalid fields raise `EngineInputError`), takes ρ from the ISA atmosphere at `altitudeM`
 * (with `ambientC` when given) and returns the force components.
 */
export function computeRoadLoad(request: RoadLoadRequestInput): RoadLoadResponse {
  const parsed = parseOrThrow(roadLoadRequestSchema, request);
  const { vehicle } = parsed;
  const airDensity = airDensityKgM3(parsed.altitudeM, parsed.ambientC);
  const forces = roadLoadForces({
    massKg: vehicle.curbMassKg + vehicle.payloadKg,
    speedMps: parsed.speedMps,
    gradePercent: parsed.gradePercent,
    accelerationMps2: parsed.accelerationMps2,
    rotatingMassFactor: vehicle.rotatingMassFactor,
    rollingResistanceCoefficient: vehicle.rollingResistanceCoefficient,
    dragCoefficient: vehicle.dragCoefficient,
    frontalAreaM2: vehicle.frontalAreaM2,
    airDensityKgM3: airDensity,
  });
  return { ...forces, airDensityKgM3: airDensity };
}
