import { describe, expect, it } from 'vitest';
import { optionsSchema, previewRequestSchema, vehicleSchema } from '../../../shared/domain/analysis';
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
      route: { type: 'LineString', coordinates: [[8, 46], [8.01, 46.01, 500]] },
      vehicle: aWorkedExampleBus(),
    });

    expect(result.success).toBe(true);
  });

  it('rejects a latitude beyond 90°', () => {
    const result = previewRequestSchema.safeParse({ route: { type: 'LineString', coordinates: [[8, 91], [8, 46]] }, vehicle: aWorkedExampleBus() });

    expect(result.success).toBe(false);
  });
});
