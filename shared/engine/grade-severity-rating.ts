/**
 * FHWA Grade Severity Rating System (GSRS) brake-temperature model, in the updated form of
 * Wyoming DOT report WY-1901F (2018), engine README §4.2. US customary units:
 *
 *   T_f   = T_0 + (T_∞ − T_0 + K2·HP_B)·(1 − exp(−K1·L/V))
 *   HP_B  = (W·θ − F_drag)·V/375 − HP_eng
 *   K1    = 1.5·(1.1852 + 0.0331·V)     h⁻¹
 *   K2    = 1/(0.1602 + 0.0078·V)       °F/hp
 *   F_drag = 459.35 + 0.132·V²           lb
 *   HP_eng = 63.3 hp
 *   T_lim = T_f + 3.11·10⁻⁷·W·V²        (emergency stop at the end of the grade)
 *
 * T in °F, W in lb, θ decimal grade, L in miles, V in mph. The model is calibrated for 5-axle
 * heavy trucks; along a route the engine uses only its thermal response (K1, K2) driven by the
 * engine's own friction-brake power, as an independent second estimate beside the lumped model.
 */
import { WATTS_PER_HORSEPOWER } from './constants';

/** Engine retardation subtracted in the updated GSRS, hp (WY-1901F). */
export const GSRS_ENGINE_RETARDATION_HP = 63.3;

/** GSRS brake-temperature limit, °F (500 °F; WY-1901F also offers 530 °F). */
export const GSRS_LIMIT_F = 500;

/** Updated cooling rate K1(V), 1/h. */
export function gsrsK1PerHour(speedMph: number): number {
  return 1.5 * (1.1852 + 0.0331 * speedMph);
}

/** Steady-state rise per brake horsepower K2(V), °F/hp. */
export function gsrsK2FPerHp(speedMph: number): number {
  return 1 / (0.1602 + 0.0078 * speedMph);
}

/** Updated engine + aero + rolling retardation F_drag(V), lb. */
export function gsrsDragLb(speedMph: number): number {
  return 459.35 + 0.132 * speedMph * speedMph;
}

/** Brake horsepower HP_B into the foundation brakes on a grade. */
export function gsrsBrakeHorsepower(weightLb: number, gradeDecimal: number, speedMph: number): number {
  return ((weightLb * gradeDecimal - gsrsDragLb(speedMph)) * speedMph) / 375 - GSRS_ENGINE_RETARDATION_HP;
}

export interface GsrsSegmentInput {
  initialF: number;
  ambientF: number;
  brakeHorsepower: number;
  lengthMi: number;
  speedMph: number;
}

/** Brake temperature at the end of a constant segment, °F. */
export function gsrsFinalTemperatureF(input: GsrsSegmentInput): number {
  const { initialF, ambientF, brakeHorsepower, lengthMi, speedMph } = input;
  const hours = lengthMi / speedMph;
  return initialF + (ambientF - initialF + gsrsK2FPerHp(speedMph) * brakeHorsepower) * (1 - Math.exp(-gsrsK1PerHour(speedMph) * hours));
}

/** Temperature rise of an emergency stop at the end of the grade T_e, °F. */
export function gsrsEmergencyStopRiseF(weightLb: number, speedMph: number): number {
  return 3.11e-7 * weightLb * speedMph * speedMph;
}

const KELVIN_PER_FAHRENHEIT = 5 / 9;
const MPH_PER_MPS = 3_600 / 1_609.344;

/**
 * One GSRS step in SI: brake temperature (°C) after `durationS` at mean speed `speedMps` with
 * friction-brake power `frictionPowerW` at the wheel. Same algebra as `gsrsFinalTemperatureF`
 * with L/V replaced by the duration and K2 converted to K/W.
 */
export function gsrsAdvanceTemperatureC(
  temperatureC: number,
  ambientC: number,
  frictionPowerW: number,
  speedMps: number,
  durationS: number,
): number {
  if (durationS <= 0) return temperatureC;
  const mph = speedMps * MPH_PER_MPS;
  const k2KPerW = (gsrsK2FPerHp(mph) * KELVIN_PER_FAHRENHEIT) / WATTS_PER_HORSEPOWER;
  const decay = 1 - Math.exp((-gsrsK1PerHour(mph) * durationS) / 3_600);
  return temperatureC + (ambientC - temperatureC + k2KPerW * frictionPowerW) * decay;
}
