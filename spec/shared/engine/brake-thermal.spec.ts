import { describe, expect, it } from 'vitest';
import { advanceBrakeTemperatureC, brakeConvectionWPerM2K } from '../../../shared/engine/brake-thermal';

// engine README §4.3 worked example / §8 case 13: C 92 kJ/K, G 64 W/K (40 W/m²K × 1.6 m²),
// 76.153 kW into the rotors for 720 s from 20 °C.
const CASE_13 = {
  temperatureC: 20,
  ambientC: 20,
  heatInW: 76_153,
  convectionWPerM2K: 40,
  coolingAreaM2: 1.6,
  thermalMassJPerK: 92_000,
  durationS: 720,
};

describe('advanceBrakeTemperatureC', () => {
  it('reaches 488.8 °C without radiation (engine README §8 case 13, ±0.1 %)', () => {
    const temperatureC = advanceBrakeTemperatureC({ ...CASE_13, emissivity: 0 });

    expect(Math.abs(temperatureC / 488.8 - 1)).toBeLessThan(1e-3);
  });

  it('reaches 451 ± 2 °C with radiation, ε 0.6 (engine README §8 case 13)', () => {
    const temperatureC = advanceBrakeTemperatureC({ ...CASE_13, emissivity: 0.6 });

    expect(Math.abs(temperatureC - 451)).toBeLessThan(2);
  });

  it('gives the same result in one step or in 720 one-second steps without radiation (exact update)', () => {
    let temperatureC = 20;
    for (let i = 0; i < 720; i++) temperatureC = advanceBrakeTemperatureC({ ...CASE_13, temperatureC, durationS: 1, emissivity: 0 });

    expect(temperatureC).toBeCloseTo(advanceBrakeTemperatureC({ ...CASE_13, emissivity: 0 }), 6);
  });

  it('cools towards ambient and never below it without heat input', () => {
    const temperatureC = advanceBrakeTemperatureC({ ...CASE_13, temperatureC: 400, heatInW: 0, emissivity: 0.6, durationS: 100_000 });

    expect(temperatureC).toBeGreaterThanOrEqual(20);
    expect(temperatureC).toBeLessThan(20.01);
  });
});

describe('brakeConvectionWPerM2K', () => {
  it('is 12 + 4.5·v: 49.5 W/m²K at 30 km/h, inside the 40–50 W/m²K of engine README §4.3', () => {
    expect(brakeConvectionWPerM2K(30 / 3.6)).toBeCloseTo(49.5, 9);
  });
});
