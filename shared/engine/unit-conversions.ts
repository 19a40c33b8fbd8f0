/**
 * Unit conversions used at the edges of the engine (user input, display, the FHWA Grade Severity
 * Rating System's customary units). Exact factors from SI definitions.
 */
import { CELSIUS_TO_KELVIN_K, JOULES_PER_WH, METRES_PER_MILE, WATTS_PER_HORSEPOWER } from './constants';

/** km/h → m/s. */
export function kphToMps(speedKph: number): number {
  return speedKph / 3.6;
}

/** m/s → km/h. */
export function mpsToKph(speedMps: number): number {
  return speedMps * 3.6;
}

/** Grade in percent (100·tan θ, positive uphill) → inclination angle θ in radians. */
export function gradePercentToRad(gradePercent: number): number {
  return Math.atan(gradePercent / 100);
}

/** Inclination angle θ in radians → grade in percent (100·tan θ). */
export function radToGradePercent(gradeRad: number): number {
  return 100 * Math.tan(gradeRad);
}

/** °C → K. */
export function celsiusToKelvin(temperatureC: number): number {
  return temperatureC + CELSIUS_TO_KELVIN_K;
}

/** K → °C. */
export function kelvinToCelsius(temperatureK: number): number {
  return temperatureK - CELSIUS_TO_KELVIN_K;
}

/** °F → °C. */
export function fahrenheitToCelsius(temperatureF: number): number {
  return ((temperatureF - 32) * 5) / 9;
}

/** °C → °F. */
export function celsiusToFahrenheit(temperatureC: number): number {
  return (temperatureC * 9) / 5 + 32;
}

/** J → Wh. */
export function joulesToWh(energyJ: number): number {
  return energyJ / JOULES_PER_WH;
}

/** Wh → J. */
export function whToJoules(energyWh: number): number {
  return energyWh * JOULES_PER_WH;
}

/** m/s → mph. */
export function mpsToMph(speedMps: number): number {
  return (speedMps * 3_600) / METRES_PER_MILE;
}

/** mph → m/s. */
export function mphToMps(speedMph: number): number {
  return (speedMph * METRES_PER_MILE) / 3_600;
}

/** W → mechanical horsepower. */
export function wattsToHorsepower(powerW: number): number {
  return powerW / WATTS_PER_HORSEPOWER;
}

/** m → miles. */
export function metresToMiles(lengthM: number): number {
  return lengthM / METRES_PER_MILE;
}
