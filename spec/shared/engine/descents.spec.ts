import { describe, expect, it } from 'vitest';
import { vehicleSchema } from '../../../shared/domain/analysis';
import { brakeRiskLevel, fadeThresholdC, typeIiReferenceBrakingJ } from '../../../shared/engine/descents';
import { roadLoadForces } from '../../../shared/engine/road-load';
import { STANDARD_GRAVITY_MPS2 } from '../../../shared/engine/constants';
import { aWorkedExampleBus, relativeError } from '../support/engine-builders';

const BUS = {
  massKg: 19_000,
  rollingResistanceCoefficient: 0.007,
  dragCoefficient: 0.7,
  frontalAreaM2: 8,
  airDensityKgM3: 1.225,
  rotatingMassFactor: 0,
  accelerationMps2: 0,
};
const SPEED_MPS = 30 / 3.6;

describe('UN R13 reference descents for a 19 t bus (engine README §5.1 table)', () => {
  it('releases 66.96 MJ over 6 km of 6 % road, a 359.35 m drop (engine README §8 case 3)', () => {
    const sinTheta = Math.sin(Math.atan(0.06));

    expect(6_000 * sinTheta).toBeCloseTo(359.35, 2);
    expect(relativeError(19_000 * STANDARD_GRAVITY_MPS2 * 6_000 * sinTheta, 66.96e6)).toBeLessThan(1e-3);
  });

  it('leaves 57.72 MJ of net braking on Type-II (engine README §5.1)', () => {
    expect(relativeError(typeIiReferenceBrakingJ(vehicleSchema.parse(aWorkedExampleBus())), 57.72e6)).toBeLessThan(1e-3);
  });

  it('gives 78.07 MJ gravity, 108.4 kW mean, 68.83 MJ and 95.60 kW net braking on Type-IIA (engine README §8 case 8)', () => {
    const forces = roadLoadForces({ ...BUS, speedMps: SPEED_MPS, gradePercent: -7 });
    const durationS = 6_000 / SPEED_MPS;

    const gravityJ = -forces.gradeN * 6_000;
    const netBrakingJ = -forces.tractionN * 6_000;

    expect(relativeError(gravityJ, 78.07e6)).toBeLessThan(1e-3);
    expect(relativeError(gravityJ / durationS, 108.4e3)).toBeLessThan(1e-3);
    expect(relativeError(netBrakingJ, 68.83e6)).toBeLessThan(1e-3);
    expect(relativeError(netBrakingJ / durationS, 95.6e3)).toBeLessThan(1e-3);
  });

  it('brakes 111.00 kW at the wheel descending 8 % at 30 km/h (engine README §3.3, §8 case 7)', () => {
    const forces = roadLoadForces({ ...BUS, speedMps: SPEED_MPS, gradePercent: -8 });

    expect(relativeError(-forces.tractionPowerW, 111_000)).toBeLessThan(1e-3);
  });
});

describe('brakeRiskLevel', () => {
  it('uses the drum bands 200 / 260 / 340 °C', () => {
    expect(brakeRiskLevel(199, 'drum')).toBe('low');
    expect(brakeRiskLevel(200, 'drum')).toBe('elevated');
    expect(brakeRiskLevel(260, 'drum')).toBe('high');
    expect(brakeRiskLevel(340, 'drum')).toBe('critical');
  });

  it('uses the disc bands 300 / 450 / 550 °C', () => {
    expect(brakeRiskLevel(299, 'disc')).toBe('low');
    expect(brakeRiskLevel(300, 'disc')).toBe('elevated');
    expect(brakeRiskLevel(449, 'disc')).toBe('elevated');
    expect(brakeRiskLevel(450, 'disc')).toBe('high');
    expect(brakeRiskLevel(550, 'disc')).toBe('critical');
  });

  it('puts the drum fade threshold at the GSRS 500 °F limit (260 °C)', () => {
    expect(fadeThresholdC('drum')).toBe(260);
  });
});
