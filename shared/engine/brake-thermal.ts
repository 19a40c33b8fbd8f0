/**
 * Lumped-capacitance brake temperature model (engine README §4.3):
 *
 *   C·dT/dt = φ·P_friction − h(v)·A·(T − T_amb) − ε·σ·A·(T⁴ − T_amb⁴)
 *
 * Each step uses the exact exponential solution for constant inputs,
 *   G = (h + h_rad)·A, T_ss = T_amb + φ·P/G, T ← T_ss + (T − T_ss)·exp(−Δt·G/C),
 * with radiation linearised about the current temperature, h_rad = ε·σ·(T² + T_a²)(T + T_a), and
 * steps longer than `BRAKE_MAX_SUBSTEP_S` sub-stepped so the linearisation follows T. The update is
 * unconditionally stable. The whole vehicle's brakes are one lump (thermal mass and cooled area
 * summed over all wheels); the hotter axle is not tracked separately.
 */
import {
  BRAKE_CONVECTION_SPEED_W_PER_M2_K_PER_MPS,
  BRAKE_CONVECTION_STILL_W_PER_M2_K,
  BRAKE_MAX_SUBSTEP_S,
  CELSIUS_TO_KELVIN_K,
  STEFAN_BOLTZMANN_W_PER_M2_K4,
} from './constants';

/** Brake-to-air heat-transfer coefficient h(v) = 12 + 4.5·v, W/(m²·K) (engine README §4.3: linear in speed as McPhee & Johnson 2008 measured; coefficients from memory). */
export function brakeConvectionWPerM2K(speedMps: number): number {
  return BRAKE_CONVECTION_STILL_W_PER_M2_K + BRAKE_CONVECTION_SPEED_W_PER_M2_K_PER_MPS * speedMps;
}

export interface BrakeStepInput {
  temperatureC: number;
  ambientC: number;
  /** Heat into the discs/drums (φ·P_friction), W. */
  heatInW: number;
  convectionWPerM2K: number;
  coolingAreaM2: number;
  thermalMassJPerK: number;
  emissivity: number;
  durationS: number;
}

/** Brake temperature after one step, °C. */
export function advanceBrakeTemperatureC(step: BrakeStepInput): number {
  return brakeTemperatureStepC(
    step.temperatureC,
    step.ambientC,
    step.heatInW,
    step.convectionWPerM2K,
    step.coolingAreaM2,
    step.thermalMassJPerK,
    step.emissivity,
    step.durationS,
  );
}

/** Positional form of `advanceBrakeTemperatureC` for hot loops (no argument object). */
export function brakeTemperatureStepC(
  startC: number,
  ambientC: number,
  heatInW: number,
  convectionWPerM2K: number,
  coolingAreaM2: number,
  thermalMassJPerK: number,
  emissivity: number,
  durationS: number,
): number {
  if (durationS <= 0) return startC;
  const substeps = Math.max(1, Math.ceil(durationS / BRAKE_MAX_SUBSTEP_S));
  const dt = durationS / substeps;
  const ambientK = ambientC + CELSIUS_TO_KELVIN_K;
  let temperatureC = startC;
  for (let i = 0; i < substeps; i++) {
    const temperatureK = temperatureC + CELSIUS_TO_KELVIN_K;
    const radiationWPerM2K =
      emissivity * STEFAN_BOLTZMANN_W_PER_M2_K4 * (temperatureK * temperatureK + ambientK * ambientK) * (temperatureK + ambientK);
    const conductanceWPerK = (convectionWPerM2K + radiationWPerM2K) * coolingAreaM2;
    if (conductanceWPerK <= 0) {
      temperatureC += (heatInW * dt) / thermalMassJPerK;
      continue;
    }
    const steadyC = ambientC + heatInW / conductanceWPerK;
    temperatureC = steadyC + (temperatureC - steadyC) * Math.exp((-dt * conductanceWPerK) / thermalMassJPerK);
  }
  return temperatureC;
}
