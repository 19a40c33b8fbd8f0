import { describe, expect, it } from 'vitest';
import { vehicleSchema } from '../../../shared/domain/analysis';
import {
  chargeTaperFactor,
  coldChargeFactor,
  emptyPowerSplit,
  powertrainParams,
  regenSpeedFactor,
  splitWheelPower,
} from '../../../shared/engine/powertrain';
import { aWorkedExampleBus } from '../support/engine-builders';

// engine README §3.3 / §8 case 7: 19 t bus descending 8 % at 30 km/h, ρ 1.225 → 111.00 kW at the wheel;
// charge limit 200 kW tapering linearly from SOC 0.80 to 0.95; aux 15 kW; η 0.889.
const BRAKING_W = 111_000;
const SPEED_MPS = 30 / 3.6;

describe('splitWheelPower', () => {
  it('regenerates 91.86 kW and leaves 19.14 kW to friction at SOC 0.90 (engine README §8 case 7)', () => {
    const split = step(0.9);

    expect(Math.abs(split.regenWheelPowerW - 91_860)).toBeLessThan(0.001 * 91_860);
    expect(Math.abs(split.frictionPowerW - 19_140)).toBeLessThan(0.002 * 19_140);
  });

  it('regenerates everything at SOC 0.50 and 0.85 (engine README §3.3 table)', () => {
    expect(step(0.5).frictionPowerW).toBe(0);
    expect(step(0.85).frictionPowerW).toBe(0);
  });

  it('regenerates only what the auxiliaries take at SOC 0.95: 16.9 kW, friction 94.1 kW (engine README §3.3 table)', () => {
    const split = step(0.95);

    expect(split.regenWheelPowerW).toBeCloseTo(15_000 / 0.889, 6);
    expect(Math.abs(split.frictionPowerW - 94_100)).toBeLessThan(0.001 * 94_100);
    expect(split.sourcePowerW).toBeCloseTo(0, 6);
  });

  it('draws 133.84 kW from the battery for 105.65 kW at the wheel (engine README §8 case 6)', () => {
    const split = emptyPowerSplit();

    splitWheelPower(params(), 105_650, SPEED_MPS, 0.5, 1, split);

    expect(Math.abs(split.sourcePowerW - 133_840)).toBeLessThan(0.001 * 133_840);
  });

  it('sends all braking to the friction brakes when regenPowerW is 0', () => {
    const split = emptyPowerSplit();

    splitWheelPower(params({ regenPowerW: 0 }), -BRAKING_W, SPEED_MPS, 0.5, 1, split);

    expect(split.regenWheelPowerW).toBe(0);
    expect(split.frictionPowerW).toBe(BRAKING_W);
    expect(split.sourcePowerW).toBe(15_000);
  });

  it('uses the retarder before the friction brakes, up to its power', () => {
    const split = emptyPowerSplit();

    splitWheelPower(params({ retarderPowerW: 50_000 }), -BRAKING_W, SPEED_MPS, 0.95, 1, split);

    expect(split.retarderPowerW).toBe(50_000);
    expect(split.frictionPowerW).toBeCloseTo(BRAKING_W - 15_000 / 0.889 - 50_000, 6);
  });

  it('lets an overhead line take its receptive share after the auxiliaries (engine README §3.5)', () => {
    const split = emptyPowerSplit();
    const line = params({ powerSource: 'overhead-line', lineReceptivity: 0.4, batteryCapacityWh: 0 });

    splitWheelPower(line, -BRAKING_W, SPEED_MPS, 0.5, 1, split);

    const electricW = BRAKING_W * 0.889;
    expect(split.regenElectricPowerW).toBeCloseTo(15_000 + 0.4 * (electricW - 15_000), 6);
    expect(split.soc).toBe(0.5);
  });

  it('never charges above the SOC ceiling within one long step', () => {
    const split = emptyPowerSplit();

    splitWheelPower(params(), -BRAKING_W, SPEED_MPS, 0.949, 3_600, split);

    expect(split.soc).toBeLessThanOrEqual(0.95 + 1e-12);
  });

  it('holds SOC at 0 and reports the energy an empty battery could not give', () => {
    const split = emptyPowerSplit();

    splitWheelPower(params({ batteryCapacityWh: 1_000 }), 100_000, SPEED_MPS, 0.01, 60, split);

    expect(split.soc).toBe(0);
    expect(split.shortfallJ).toBeCloseTo(split.sourcePowerW * 60 - 0.01 * 1_000 * 3_600, 6);
  });
});

describe('regeneration near standstill', () => {
  it('fades the machine limit linearly below the fade-out speed and leaves it whole above', () => {
    expect(regenSpeedFactor(0, 5 / 3.6)).toBe(0);
    expect(regenSpeedFactor(2.5 / 3.6, 5 / 3.6)).toBeCloseTo(0.5, 12);
    expect(regenSpeedFactor(5 / 3.6, 5 / 3.6)).toBe(1);
    expect(regenSpeedFactor(30 / 3.6, 5 / 3.6)).toBe(1);
    expect(regenSpeedFactor(1, 0)).toBe(1);
  });

  it('blends to the friction brakes as the bus slows to a stop', () => {
    // The worked-example bus's force limit at 2.5 km/h is far below the braking demand, so the
    // regenerated share is its force limit times v, halved by the fade.
    const fadeSpeedMps = 5 / 3.6;
    const slowMps = 2.5 / 3.6;
    const vehicle = params({ regenMinSpeedMps: fadeSpeedMps });
    const split = emptyPowerSplit();

    splitWheelPower(vehicle, -BRAKING_W, slowMps, 0.5, 1, split);

    expect(split.regenWheelPowerW).toBeCloseTo(Math.min(vehicle.regenPowerW, vehicle.maxRegenForceN * slowMps) * 0.5, 6);
    expect(split.frictionPowerW).toBeCloseTo(BRAKING_W - split.regenWheelPowerW, 6);
  });
});

describe('charging in the cold', () => {
  it('keeps the full charge power from the set temperature up and falls linearly to the share at −20 °C', () => {
    expect(coldChargeFactor(15, 10, 0.3)).toBe(1);
    expect(coldChargeFactor(10, 10, 0.3)).toBe(1);
    expect(coldChargeFactor(-5, 10, 0.3)).toBeCloseTo(0.65, 12);
    expect(coldChargeFactor(-20, 10, 0.3)).toBeCloseTo(0.3, 12);
    expect(coldChargeFactor(-35, 10, 0.3)).toBeCloseTo(0.3, 12);
    expect(coldChargeFactor(-35, 10, 1)).toBe(1);
  });

  it('sends what a cold battery cannot take to the friction brakes', () => {
    // Charge limit 200 kW × 0.3 at −20 °C = 60 kW, plus 15 kW of auxiliaries, at η 0.889.
    const cold = params({ coldChargeShareAtMinus20C: 0.3 });
    const split = emptyPowerSplit();

    splitWheelPower(cold, -BRAKING_W, SPEED_MPS, 0.5, 1, split, -20);

    expect(split.regenWheelPowerW).toBeCloseTo(75_000 / 0.889, 6);
    expect(split.frictionPowerW).toBeCloseTo(BRAKING_W - 75_000 / 0.889, 6);

    splitWheelPower(cold, -BRAKING_W, SPEED_MPS, 0.5, 1, split, 20);
    expect(split.frictionPowerW).toBe(0);
  });
});

describe('chargeTaperFactor', () => {
  it('is 1 below the taper, 0 at the ceiling and linear between', () => {
    expect(chargeTaperFactor(0.5, 0.8, 0.95)).toBe(1);
    expect(chargeTaperFactor(0.95, 0.8, 0.95)).toBe(0);
    expect(chargeTaperFactor(0.9, 0.8, 0.95)).toBeCloseTo(1 / 3, 12);
  });
});

// Helpers

function params(overrides: Parameters<typeof aWorkedExampleBus>[0] = {}) {
  return powertrainParams(vehicleSchema.parse(aWorkedExampleBus({ socTaperStart: 0.8, socCeiling: 0.95, ...overrides })));
}

function step(soc: number) {
  const split = emptyPowerSplit();
  splitWheelPower(params(), -BRAKING_W, SPEED_MPS, soc, 1, split);
  return split;
}
