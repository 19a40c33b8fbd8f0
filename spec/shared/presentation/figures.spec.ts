import { describe, expect, it } from 'vitest';
import type { Summary } from '../../../shared/domain/analysis';
import {
  ENERGY_FIGURES,
  SUMMARY_FIGURES,
  differenceTone,
  formatFigure,
  formatFigureDifference,
  formatStretch,
} from '../../../shared/presentation/figures';

describe('summary figures', () => {
  it('gives every figure one label, used once', () => {
    const labels = SUMMARY_FIGURES.map((figure) => figure.label);

    expect(new Set(labels).size).toBe(labels.length);
  });

  it('lists the retarder / braking resistor energy among the energy figures', () => {
    expect(ENERGY_FIGURES.map((figure) => figure.key)).toContain('retarderEnergyWh');
  });

  it('shows the traction energy at the wheels, not battery energy under another name', () => {
    const traction = byKey('tractionEnergyWh');

    expect(traction.label).toBe('Traction energy');
    expect(formatFigure(traction, aSummary({ tractionEnergyWh: 38_750 }), 'metric')).toBe('38.8 kWh');
  });

  it('rounds the peak brake temperature up', () => {
    expect(formatFigure(byKey('peakBrakeTempC'), aSummary({ peakBrakeTempC: 301.1 }), 'metric')).toBe('302 °C');
  });

  it('shows ±0 when two figures show the same, not "−0 %" (issue 10)', () => {
    const soc = byKey('endSoc');

    expect(formatFigureDifference(soc, aSummary({ endSoc: 0.9702 }), aSummary({ endSoc: 0.9711 }), 'metric')).toBe('±0');
  });

  it('takes the difference between the values as shown', () => {
    const regen = byKey('regenEnergyWh');

    // 12.3 kWh and 10.3 kWh as shown: the table reads +2.0, not the +2.1 of the raw values.
    expect(formatFigureDifference(regen, aSummary({ regenEnergyWh: 12_340 }), aSummary({ regenEnergyWh: 10_260 }), 'metric')).toBe(
      '+2.0 kWh',
    );
    expect(formatFigureDifference(regen, aSummary({ regenEnergyWh: 10_260 }), aSummary({ regenEnergyWh: 12_340 }), 'metric')).toBe(
      '−2.0 kWh',
    );
  });

  it('calls more regeneration better and more friction-brake energy worse', () => {
    const more = aSummary({ regenEnergyWh: 2_000, frictionBrakeEnergyWh: 2_000 });
    const less = aSummary({ regenEnergyWh: 1_000, frictionBrakeEnergyWh: 1_000 });

    expect(differenceTone(byKey('regenEnergyWh'), more, less)).toBe('better');
    expect(differenceTone(byKey('frictionBrakeEnergyWh'), more, less)).toBe('worse');
  });

  it('names a stretch by its distance from the start', () => {
    expect(formatStretch(12_340, 15_780, 'metric')).toBe('km 12.3–15.8');
    expect(formatStretch(1_609.344, 3_218.688, 'imperial')).toBe('mi 1.0–2.0');
  });
});

function byKey(key: string) {
  const found = SUMMARY_FIGURES.find((figure) => figure.key === key);
  if (!found) throw new Error(`no figure ${key}`);
  return found;
}

function aSummary(overrides: Partial<Summary> = {}): Summary {
  return {
    lengthM: 10_000,
    slopeLengthM: 10_010,
    ascentM: 100,
    descentM: 300,
    durationS: 1_200,
    tractionEnergyWh: 20_000,
    brakingEnergyWh: 8_000,
    regenEnergyWh: 5_000,
    frictionBrakeEnergyWh: 2_000,
    retarderEnergyWh: 0,
    auxEnergyWh: 3_000,
    batteryNetEnergyWh: 22_000,
    kWhPerKm: 2.2,
    peakBrakeTempC: 250,
    gsrsPeakBrakeTempC: 240,
    startSoc: 0.9,
    endSoc: 0.8,
    energyShortfallWh: 0,
    tractionLimitedM: 0,
    ...overrides,
  };
}
