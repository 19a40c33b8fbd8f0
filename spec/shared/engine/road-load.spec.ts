import { describe, expect, it } from 'vitest';
import { computeRoadLoad, roadLoadForces } from '../../../shared/engine/road-load';
import type { VehicleInput } from '../../../shared/domain/analysis';

describe('roadLoadForces', () => {
  it('gives 1800 N of inertia and no rolling force at standstill (engine README §8 case 1)', () => {
    const forces = roadLoadForces({ ...car(), speedMps: 0, gradePercent: 0, accelerationMps2: 1, rotatingMassFactor: 0 });

    expect(forces.inertiaN).toBeCloseTo(1800, 9);
    expect(forces.rollingN).toBe(0);
    expect(forces.tractionN).toBeCloseTo(1800, 9);
  });

  it('has drag equal to rolling at 20.896 m/s for a car, both 176.52 N (engine README §8 case 2)', () => {
    const forces = roadLoadForces({ ...car(), speedMps: 20.896, gradePercent: 0, accelerationMps2: 0, rotatingMassFactor: 0 });

    expect(relativeError(forces.rollingN, 176.52)).toBeLessThan(1e-3);
    expect(relativeError(forces.aeroN, 176.52)).toBeLessThan(1e-3);
  });

  it('has drag overtaking rolling resistance between 70 and 80 km/h for a car (common practice)', () => {
    const at70 = roadLoadForces({ ...car(), speedMps: 70 / 3.6, gradePercent: 0, accelerationMps2: 0, rotatingMassFactor: 0 });
    const at80 = roadLoadForces({ ...car(), speedMps: 80 / 3.6, gradePercent: 0, accelerationMps2: 0, rotatingMassFactor: 0 });

    expect(at70.aeroN).toBeLessThan(at70.rollingN);
    expect(at80.aeroN).toBeGreaterThan(at80.rollingN);
  });

  it('keeps a 1500 kg car on tyres with Cr 0.01–0.02 within 147–295 N of rolling force (common practice)', () => {
    for (const rollingResistanceCoefficient of [0.01, 0.015, 0.02]) {
      const { rollingN } = roadLoadForces({
        ...car(),
        massKg: 1500,
        rollingResistanceCoefficient,
        speedMps: 10,
        gradePercent: 0,
        accelerationMps2: 0,
        rotatingMassFactor: 0,
      });
      expect(rollingN).toBeGreaterThanOrEqual(147);
      expect(rollingN).toBeLessThanOrEqual(295);
    }
  });

  it('keeps a car with Cd 0.25–0.35 within 110–160 N of drag at 20 m/s, A 2.2 m² (common practice)', () => {
    for (const dragCoefficient of [0.25, 0.3, 0.35]) {
      const { aeroN } = roadLoadForces({
        ...car(),
        dragCoefficient,
        speedMps: 20,
        gradePercent: 0,
        accelerationMps2: 0,
        rotatingMassFactor: 0,
      });
      // ½·1.225·Cd·2.2·400 = 539·Cd
      expect(aeroN).toBeCloseTo(539 * dragCoefficient, 9);
      expect(aeroN).toBeGreaterThanOrEqual(134);
      expect(aeroN).toBeLessThanOrEqual(189);
    }
  });

  it('gives 14 858.6 N of grade force on 8 % for 19 t (engine README §8 case 5)', () => {
    const { gradeN } = roadLoadForces({ ...bus(), speedMps: 0, gradePercent: 8, accelerationMps2: 0 });

    expect(relativeError(gradeN, 14_858.6)).toBeLessThan(1e-3);
  });

  it('is negative in grade force downhill', () => {
    const { gradeN } = roadLoadForces({ ...bus(), speedMps: 5, gradePercent: -8, accelerationMps2: 0 });

    expect(relativeError(gradeN, -14_858.6)).toBeLessThan(1e-3);
  });

  it('gives 17 826 N and 99.0 kW accelerating at 0.8 m/s² through 20 km/h (engine README §1.4 b)', () => {
    const forces = roadLoadForces({ ...bus(), speedMps: 20 / 3.6, gradePercent: 0, accelerationMps2: 0.8, rotatingMassFactor: 0.08 });

    expect(forces.inertiaN).toBeCloseTo(16_416, 6);
    expect(relativeError(forces.rollingN, 1304.3)).toBeLessThan(1e-3);
    expect(relativeError(forces.aeroN, 105.9)).toBeLessThan(1e-3);
    expect(relativeError(forces.tractionN, 17_826)).toBeLessThan(1e-3);
    expect(relativeError(forces.tractionPowerW, 99_000)).toBeLessThan(1e-3);
  });

  it('throws naming massKg when mass is negative', () => {
    expect(() => roadLoadForces({ ...bus(), massKg: -1, speedMps: 0, gradePercent: 0, accelerationMps2: 0 })).toThrow(/massKg/);
  });
});

describe('computeRoadLoad', () => {
  it('gives the 6 % climb at 30 km/h and 1000 m of engine README §1.4 a / §8 case 6', () => {
    const response = computeRoadLoad({ vehicle: busVehicle(), speedMps: 30 / 3.6, gradePercent: 6, altitudeM: 1000 });

    expect(relativeError(response.airDensityKgM3, 1.1116)).toBeLessThan(1e-3);
    expect(relativeError(response.rollingN, 1301.9)).toBeLessThan(1e-3);
    expect(relativeError(response.aeroN, 216.2)).toBeLessThan(1e-3);
    expect(relativeError(response.gradeN, 11_159.5)).toBeLessThan(1e-3);
    expect(relativeError(response.tractionN, 12_677.6)).toBeLessThan(1e-3);
    expect(relativeError(response.tractionPowerW, 105_650)).toBeLessThan(1e-3);
    expect(response.inertiaN).toBe(0);
  });

  it('throws a RangeError naming vehicle.curbMassKg when it is negative', () => {
    expect(() => computeRoadLoad({ vehicle: { ...busVehicle(), curbMassKg: -5 }, speedMps: 1, gradePercent: 0 })).toThrow(
      /vehicle\.curbMassKg/,
    );
  });

  it('throws naming vehicle.drivetrainEfficiency when it exceeds 1', () => {
    expect(() => computeRoadLoad({ vehicle: { ...busVehicle(), drivetrainEfficiency: 1.2 }, speedMps: 1, gradePercent: 0 })).toThrow(
      /vehicle\.drivetrainEfficiency/,
    );
  });

  it('throws naming speedMps when it is NaN', () => {
    expect(() => computeRoadLoad({ vehicle: busVehicle(), speedMps: Number.NaN, gradePercent: 0 })).toThrow(/speedMps/);
  });
});

// Helpers

function car() {
  return { massKg: 1800, rollingResistanceCoefficient: 0.01, dragCoefficient: 0.3, frontalAreaM2: 2.2, airDensityKgM3: 1.225 };
}

function bus() {
  return {
    massKg: 19_000,
    rollingResistanceCoefficient: 0.007,
    dragCoefficient: 0.7,
    frontalAreaM2: 8,
    airDensityKgM3: 1.225,
    rotatingMassFactor: 0,
  };
}

function busVehicle(): VehicleInput {
  return {
    curbMassKg: 13_500,
    payloadKg: 5_500,
    frontalAreaM2: 8,
    dragCoefficient: 0.7,
    rollingResistanceCoefficient: 0.007,
    rotatingMassFactor: 0,
    tractionPowerW: 250_000,
    regenPowerW: 200_000,
    drivetrainEfficiency: 0.889,
    regenEfficiency: 0.889,
    batteryCapacityWh: 400_000,
    maxChargePowerW: 200_000,
    auxPowerW: 15_000,
  };
}

function relativeError(actual: number, expected: number): number {
  return Math.abs(actual / expected - 1);
}
