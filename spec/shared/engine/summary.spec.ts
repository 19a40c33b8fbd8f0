import { describe, expect, it } from 'vitest';
import type { Summary } from '../../../shared/domain/analysis';
import { annualise, combineDirections } from '../../../shared/engine/summary';

describe('combineDirections', () => {
  it('adds lengths and energies, keeps the larger peaks and recomputes kWh/km', () => {
    const trip = combineDirections(
      aSummary({ batteryNetEnergyWh: 9_000, peakBrakeTempC: 300 }),
      aSummary({ batteryNetEnergyWh: 3_000, startSoc: 0.7, endSoc: 0.72 }),
    );

    expect(trip.lengthM).toBe(20_000);
    expect(trip.batteryNetEnergyWh).toBe(12_000);
    expect(trip.kWhPerKm).toBeCloseTo(0.6, 12);
    expect(trip.peakBrakeTempC).toBe(300);
    expect(trip.startSoc).toBe(0.8);
    expect(trip.endSoc).toBe(0.72);
  });
});

describe('annualise', () => {
  it('scales a trip by trips per day × service days', () => {
    const year = annualise(aSummary({ regenEnergyWh: 4_000 }), { tripsPerDay: 20, serviceDaysPerYear: 300 });

    expect(year.tripsPerYear).toBe(6_000);
    expect(year.regenEnergyKWh).toBe(24_000);
    expect(year.lengthKm).toBe(60_000);
  });

  it('throws naming tripsPerDay when it is negative', () => {
    expect(() => annualise(aSummary(), { tripsPerDay: -1, serviceDaysPerYear: 300 })).toThrow(/tripsPerDay/);
  });
});

// Helpers

function aSummary(overrides: Partial<Summary> = {}): Summary {
  return {
    lengthM: 10_000,
    slopeLengthM: 10_010,
    ascentM: 300,
    descentM: 300,
    durationS: 1_800,
    tractionEnergyWh: 8_000,
    brakingEnergyWh: 5_000,
    regenEnergyWh: 3_000,
    frictionBrakeEnergyWh: 1_000,
    retarderEnergyWh: 0,
    auxEnergyWh: 3_000,
    batteryNetEnergyWh: 9_000,
    kWhPerKm: 0.9,
    peakBrakeTempC: 150,
    gsrsPeakBrakeTempC: 80,
    startSoc: 0.8,
    endSoc: 0.78,
    energyShortfallWh: 0,
    tractionLimitedM: 0,
    ...overrides,
  };
}
