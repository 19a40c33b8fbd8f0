/**
 * ISA standard atmosphere, troposphere only (U.S. Standard Atmosphere 1976):
 *
 *   T(h) = T0 − L·h,  p(h) = p0·(T(h)/T0)^5.255876,  ρ = p/(R·T)
 *
 * h is geopotential altitude; terrain heights are used directly (the difference is 0.015 % in
 * density at 3000 m, engine README §2.2). When an ambient temperature is given, ρ uses the ISA
 * pressure at that altitude with the given temperature (ideal gas), as the product design fixes.
 */
import {
  ISA_LAPSE_RATE_K_PER_M,
  ISA_PRESSURE_EXPONENT,
  ISA_SEA_LEVEL_PRESSURE_PA,
  ISA_SEA_LEVEL_TEMPERATURE_K,
  ISA_TROPOPAUSE_ALTITUDE_M,
  MIN_ALTITUDE_M,
  SPECIFIC_GAS_CONSTANT_AIR_J_PER_KG_K,
} from './constants';
import { celsiusToKelvin } from './unit-conversions';
import { assertFinite, assertInRange, EngineInputError } from './validation';

/** ISA temperature at `altitudeM`, K. */
export function isaTemperatureK(altitudeM: number): number {
  assertInRange('altitudeM', altitudeM, MIN_ALTITUDE_M, ISA_TROPOPAUSE_ALTITUDE_M);
  return ISA_SEA_LEVEL_TEMPERATURE_K - ISA_LAPSE_RATE_K_PER_M * altitudeM;
}

/** ISA static pressure at `altitudeM`, Pa. */
export function isaPressurePa(altitudeM: number): number {
  const temperatureK = isaTemperatureK(altitudeM);
  return ISA_SEA_LEVEL_PRESSURE_PA * (temperatureK / ISA_SEA_LEVEL_TEMPERATURE_K) ** ISA_PRESSURE_EXPONENT;
}

/**
 * Air density ρ = p_ISA(h)/(287.05·T), kg/m³, where T is `ambientC` when given and the ISA
 * temperature at `altitudeM` otherwise.
 */
export function airDensityKgM3(altitudeM: number, ambientC?: number): number {
  const pressurePa = isaPressurePa(altitudeM);
  let temperatureK: number;
  if (ambientC === undefined) {
    temperatureK = isaTemperatureK(altitudeM);
  } else {
    assertFinite('ambientC', ambientC);
    temperatureK = celsiusToKelvin(ambientC);
    if (temperatureK <= 150) throw new EngineInputError('ambientC', `must be above −123 °C, got ${ambientC}`);
  }
  return pressurePa / (SPECIFIC_GAS_CONSTANT_AIR_J_PER_KG_K * temperatureK);
}

/** Unchecked fast path for hot loops (altitude already validated), kg/m³. */
export function airDensityUnchecked(altitudeM: number, ambientK: number | undefined): number {
  const isaK = ISA_SEA_LEVEL_TEMPERATURE_K - ISA_LAPSE_RATE_K_PER_M * altitudeM;
  const pressurePa = ISA_SEA_LEVEL_PRESSURE_PA * (isaK / ISA_SEA_LEVEL_TEMPERATURE_K) ** ISA_PRESSURE_EXPONENT;
  return pressurePa / (SPECIFIC_GAS_CONSTANT_AIR_J_PER_KG_K * (ambientK ?? isaK));
}
