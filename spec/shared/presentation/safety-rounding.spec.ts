import { describe, expect, it } from 'vitest';
import {
  formatSafeSpeed,
  formatSocLimit,
  formatTemperatureLimit,
  formatTemperatureReached,
} from '../../../shared/presentation/safety-rounding';

describe('safety rounding', () => {
  it('rounds an advised speed down to the whole km/h (21.6 km/h is advised as 21, not 22)', () => {
    expect(formatSafeSpeed(21.6, 'metric')).toBe('21 km/h');
    expect(formatSafeSpeed(21.99, 'metric')).toBe('21 km/h');
  });

  it('rounds an advised speed down to the whole mph in imperial', () => {
    // 40 km/h = 24.85 mph.
    expect(formatSafeSpeed(40, 'imperial')).toBe('24 mph');
  });

  it('keeps a whole speed whole despite floating-point noise', () => {
    expect(formatSafeSpeed(35.99999999999, 'metric')).toBe('36 km/h');
  });

  it('rounds an SOC limit down to the whole percent', () => {
    expect(formatSocLimit(0.879)).toBe('87 %');
    expect(formatSocLimit(0.9)).toBe('90 %');
  });

  it('rounds a brake temperature reached up to the whole degree', () => {
    expect(formatTemperatureReached(411.2, 'metric')).toBe('412 °C');
    // 411.2 °C = 772.16 °F.
    expect(formatTemperatureReached(411.2, 'imperial')).toBe('773 °F');
  });

  it('rounds a temperature limit down to the whole degree', () => {
    expect(formatTemperatureLimit(349.7, 'metric')).toBe('349 °C');
  });
});
