/**
 * The endurance brakes besides regeneration and how much force each can give at a speed.
 *
 * - Braking resistor: fed by the traction motor, so regeneration and the resistor together stay
 *   inside the motor's braking envelope min(F_motor, P_motor/v) (the machine cannot brake harder
 *   because its energy goes to a resistor instead of the battery), with the same low-speed fade.
 *   When the motor or its inverter trips, the resistor is lost with regeneration.
 * - Hydrodynamic retarder: a fluid machine on the driveline whose torque rises with the square of
 *   its rotor speed (the similarity law of fluid couplings and pumps, torque ∝ ρ·n²·D⁵, common
 *   practice); it reaches its rated power at `RETARDER_FULL_POWER_SPEED_MPS.hydrodynamic` and is
 *   power-limited above. Below that speed F(v) = F_r·(v/v_r)² with F_r = P_r/v_r, so at half the
 *   speed it gives a quarter of the force and an eighth of the power.
 * - Eddy-current retarder: below its critical speed the braking torque of an eddy-current brake
 *   rises about linearly with speed (J. H. Wouterse, "Critical torque and speed of eddy current
 *   brake with widely separated soft iron poles", IEE Proceedings B 138 (1991) 153–158); the
 *   engine takes F(v) = F_r·(v/v_r) below `RETARDER_FULL_POWER_SPEED_MPS['eddy-current']` and the
 *   rated power above. Neither retarder needs the motor, so both outlast a traction fault.
 *
 * The full-power speeds are engineering defaults (from memory), cautious in that they give the
 * retarder less force at low speed than most makers' curves; the maker's curve decides.
 */
import type { RetarderType, Vehicle } from '../domain/analysis';

/** Speed at which a retarder reaches its rated power, m/s (from memory; the maker's curve decides). */
export const RETARDER_FULL_POWER_SPEED_MPS: Record<'hydrodynamic' | 'eddy-current', number> = {
  hydrodynamic: 50 / 3.6,
  'eddy-current': 30 / 3.6,
};

/** The vehicle's endurance brake kind: as stated, else a braking resistor when it has one. */
export function resolvedRetarderType(vehicle: Pick<Vehicle, 'retarderType' | 'retarderPowerW'>): RetarderType {
  if (vehicle.retarderType) return vehicle.retarderPowerW > 0 ? vehicle.retarderType : 'none';
  return vehicle.retarderPowerW > 0 ? 'braking-resistor' : 'none';
}

/**
 * Braking power an independent retarder (hydrodynamic or eddy-current) can give at `speedMps`, W.
 * 0 for 'none' and for a braking resistor (whose limit is the motor envelope, see powertrain.ts).
 */
export function independentRetarderPowerW(type: RetarderType, ratedPowerW: number, speedMps: number): number {
  if (type !== 'hydrodynamic' && type !== 'eddy-current') return 0;
  if (!(speedMps > 0) || ratedPowerW <= 0) return 0;
  const fullSpeed = RETARDER_FULL_POWER_SPEED_MPS[type];
  if (speedMps >= fullSpeed) return ratedPowerW;
  const ratio = speedMps / fullSpeed;
  // Power = F·v with F = F_r·ratio^k: ratio^(k+1) of the rated power.
  return type === 'hydrodynamic' ? ratedPowerW * ratio * ratio * ratio : ratedPowerW * ratio * ratio;
}
