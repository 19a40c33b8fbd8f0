import { describe, expect, it } from 'vitest';
import { descentSchema, optionsSchema, previewRequestSchema, vehicleSchema } from '../../../shared/domain/analysis';
import { aWorkedExampleBus } from '../support/engine-builders';

describe('vehicleSchema', () => {
  it('fills every optional field with the 12 m battery bus default', () => {
    const vehicle = vehicleSchema.parse(aWorkedExampleBus({ maxTractionForceN: undefined }));

    expect(vehicle).toMatchObject({
      maxTractionForceN: 35_000,
      brakeType: 'disc',
      brakeThermalMassJPerK: 92_000,
      brakeCoolingAreaM2: 1.6,
      brakeHeatShare: 0.95,
      retarderPowerW: 0,
      powerSource: 'battery',
      socTaperStart: 0.85,
      socCeiling: 0.95,
    });
  });

  it('rejects an efficiency above 1 at its own path', () => {
    const result = vehicleSchema.safeParse(aWorkedExampleBus({ drivetrainEfficiency: 1.01 }));

    expect(result.success).toBe(false);
    expect(result.error?.issues[0]?.path).toEqual(['drivetrainEfficiency']);
  });
});

describe('optionsSchema', () => {
  it('defaults to 10 m spacing and a 150 m smoothing window', () => {
    expect(optionsSchema.parse({})).toMatchObject({ spacingM: 10, smoothingWindowM: 150, stops: [] });
  });

  it('accepts speed-limit stretches and rejects one that ends before it starts', () => {
    expect(optionsSchema.safeParse({ speedLimitKph: [{ fromM: 0, toM: 500, speedKph: 30 }] }).success).toBe(true);
    expect(optionsSchema.safeParse({ speedLimitKph: [{ fromM: 500, toM: 100, speedKph: 30 }] }).success).toBe(false);
  });
});

describe('previewRequestSchema', () => {
  it('accepts positions with and without elevation', () => {
    const result = previewRequestSchema.safeParse({
      route: {
        type: 'LineString',
        coordinates: [
          [8, 46],
          [8.01, 46.01, 500],
        ],
      },
      vehicle: aWorkedExampleBus(),
    });

    expect(result.success).toBe(true);
  });

  it('rejects a latitude beyond 90°', () => {
    const result = previewRequestSchema.safeParse({
      route: {
        type: 'LineString',
        coordinates: [
          [8, 91],
          [8, 46],
        ],
      },
      vehicle: aWorkedExampleBus(),
    });

    expect(result.success).toBe(false);
  });
});

describe('descentSchema on results stored before the safety-grade assessment', () => {
  // A descent as engine 1.1.0 stored it: no worst case, sensitivity, axle groups, adhesion,
  // drivability or SOC reason.
  const stored = {
    startM: 9_417,
    endM: 25_289,
    lengthM: 15_872,
    dropM: 1_147,
    meanGradePercent: -7.2,
    maxGradePercent: -8.1,
    gravityEnergyWh: 61_000,
    brakingEnergyWh: 50_000,
    regenEnergyWh: 38_000,
    frictionBrakeEnergyWh: 6_000,
    retarderEnergyWh: 0,
    peakBrakeTempC: 116,
    gsrsPeakBrakeTempC: 34,
    risk: 'low',
    fadeThresholdC: 450,
    maxSafeSpeedKph: null,
    speedAdvice: 'no-limit-needed',
    maxTopSoc: null,
    socAtTop: 0.88,
    beyondTypeApprovalReference: true,
  };

  it('still loads, with the new fields absent', () => {
    const descent = descentSchema.parse(stored);

    expect(descent.worstCase).toBeUndefined();
    expect(descent.nominalRisk).toBeUndefined();
    expect(descent.risk).toBe('low');
  });

  it('refuses a worst case that claims regeneration was available', () => {
    const worstCase = {
      peakBrakeTempC: 600,
      risk: 'critical',
      maxSafeSpeedKph: 6,
      speedAdvice: 'limit',
      conditions: {
        regenerationAvailable: true,
        brakingResistorAvailable: false,
        retarderAvailable: false,
        socAtTop: 0.95,
        massKg: 19_500,
        massBasis: 'permissible-gross-mass',
        ambientC: 35,
        brakeTempAtTopC: 35,
        surface: 'dry',
      },
    };

    expect(() => descentSchema.parse({ ...stored, worstCase })).toThrow(/regenerationAvailable/);
  });
});

describe('vehicleSchema permissible gross mass', () => {
  it('refuses a payload above the permissible gross mass, naming payloadKg', () => {
    // 13 500 + 6 100 = 19 600 kg > 19 500 kg.
    expect(() => vehicleSchema.parse(aWorkedExampleBus({ curbMassKg: 13_500, payloadKg: 6_100, permissibleGrossMassKg: 19_500 }))).toThrow(
      /payloadKg[\s\S]*19600 kg \(curb \+ payload\) exceeds the permissible gross mass of 19500 kg/,
    );
    expect(() =>
      vehicleSchema.parse(aWorkedExampleBus({ curbMassKg: 13_500, payloadKg: 6_000, permissibleGrossMassKg: 19_500 })),
    ).not.toThrow();
  });

  it('refuses a continuous regeneration rating above the peak', () => {
    expect(() => vehicleSchema.parse(aWorkedExampleBus({ regenPowerW: 100_000, regenContinuousPowerW: 120_000 }))).toThrow(
      /regenContinuousPowerW/,
    );
  });
});
