import { describe, expect, it } from 'vitest';
import { airDensityKgM3, isaPressurePa, isaTemperatureK } from '../../../shared/engine/atmosphere';

describe('airDensityKgM3', () => {
  // ISA table, engine README §2.2 (U.S. Standard Atmosphere 1976), 4 significant figures.
  const isaTable: [altitudeM: number, temperatureK: number, pressurePa: number, densityKgM3: number][] = [
    [0, 288.15, 101_325, 1.225],
    [500, 284.9, 95_461, 1.167],
    [1000, 281.65, 89_875, 1.112],
    [1500, 278.4, 84_556, 1.058],
    [2000, 275.15, 79_495, 1.007],
    [2500, 271.9, 74_683, 0.9569],
    [3000, 268.65, 70_109, 0.9091],
  ];

  it.each(isaTable)('matches the ISA table at %i m (U.S. Standard Atmosphere 1976)', (h, tK, pPa, rho) => {
    expect(isaTemperatureK(h)).toBeCloseTo(tK, 6);
    expect(Math.abs(isaPressurePa(h) / pPa - 1)).toBeLessThan(5e-5);
    expect(Math.abs(airDensityKgM3(h) / rho - 1)).toBeLessThan(6e-4);
  });

  it('gives 1.1116 kg/m³ at 1000 m and 1.0065 kg/m³ at 2000 m (engine README §8 case 4, ±0.1 %)', () => {
    expect(Math.abs(airDensityKgM3(1000) / 1.1116 - 1)).toBeLessThan(1e-3);
    expect(Math.abs(airDensityKgM3(2000) / 1.0065 - 1)).toBeLessThan(1e-3);
    expect(Math.abs(isaPressurePa(2000) / 79_495 - 1)).toBeLessThan(1e-3);
  });

  it('uses the given ambient temperature with the ISA pressure (engine README §2.2 temperature effect)', () => {
    // At 2000 m: −20 °C → 1.094, 0 °C → 1.014, 30 °C → 0.9135 kg/m³; sea level −20 °C → 1.394.
    expect(airDensityKgM3(2000, -20)).toBeCloseTo(1.094, 3);
    expect(airDensityKgM3(2000, 0)).toBeCloseTo(1.014, 3);
    expect(airDensityKgM3(2000, 30)).toBeCloseTo(0.9135, 4);
    expect(airDensityKgM3(0, -20)).toBeCloseTo(1.394, 3);
  });

  it('throws a RangeError naming altitudeM above the troposphere', () => {
    expect(() => airDensityKgM3(12_000)).toThrow(RangeError);
    expect(() => airDensityKgM3(12_000)).toThrow(/altitudeM/);
  });

  it('throws naming ambientC when it is NaN', () => {
    expect(() => airDensityKgM3(0, Number.NaN)).toThrow(/ambientC/);
  });
});
