import { describe, expect, it } from 'vitest';
import { formatChange, formatParameter, residualSeries, signedPercent } from '../../../web/app/calibration/calibration-format';

describe('calibration-format', () => {
  it('shows each fitted parameter in the unit analysts use for it', () => {
    expect(formatParameter('rollingResistanceCoefficient', 0.00846, 'metric')).toBe('0.0085');
    expect(formatParameter('dragAreaM2', 5.2, 'metric')).toBe('5.20 m²');
    expect(formatParameter('auxPowerW', 9_250, 'metric')).toBe('9.3 kW');
    expect(formatParameter('drivetrainEfficiency', 0.8451, 'metric')).toBe('84.5 %');
    expect(formatParameter('payloadKg', 2_240, 'metric')).toBe('2.24 t');
    expect(formatParameter('brakeThermalMassJPerK', 84_000, 'metric')).toBe('84 kJ/K');
    expect(formatParameter('dragAreaM2', null, 'metric')).toBe('—');
  });

  it('signs changes and percentages with a true minus sign', () => {
    expect(signedPercent(-34.27)).toBe('−34.3 %');
    expect(signedPercent(1.1)).toBe('+1.1 %');
    expect(signedPercent(-0.01)).toBe('0.0 %');
    expect(formatChange(0.0097, 0.0084)).toBe('−13.4 %');
    expect(formatChange(0, 1)).toBe('—');
  });

  it('draws the residuals of each trip against minutes into the trip, in kW', () => {
    const [series] = residualSeries([{ name: 'Pass line', timeS: [0, 60, 120], residualW: [1_000, -2_000, 500] }], 'metric');

    expect(series!.x).toEqual([0, 1, 2]);
    expect(series!.y).toEqual([1, -2, 0.5]);
    expect(series!.label).toBe('Pass line');
  });
});
