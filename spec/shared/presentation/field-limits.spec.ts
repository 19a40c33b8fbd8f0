import { describe, expect, it } from 'vitest';
import { SPEED_LIMIT_KPH, speedLimitKphSchema } from '@shared/domain/limits';
import { displayToKph, isSpeedLimitKphAllowed, kphToDisplay, speedLimitRange } from '@shared/presentation/index';

describe('the speed-limit range', () => {
  it('states the contract range in km/h', () => {
    expect(speedLimitRange('metric')).toEqual({ min: 5, max: 130, span: '5 to 130 km/h', message: 'Between 5 and 130 km/h.' });
  });

  it('rounds inward in mph (130 km/h = 80.78 mph), so every value the form takes the API takes', () => {
    const range = speedLimitRange('imperial');
    expect(range).toMatchObject({ min: 4, max: 80, message: 'Between 4 and 80 mph.' });
    expect(speedLimitKphSchema.safeParse(displayToKph(range.min, 'imperial')).success).toBe(true);
    expect(speedLimitKphSchema.safeParse(displayToKph(range.max, 'imperial')).success).toBe(true);
    expect(speedLimitKphSchema.safeParse(displayToKph(range.max + 1, 'imperial')).success).toBe(false);
  });

  it('agrees with the schema at and beyond both ends', () => {
    for (const kph of [SPEED_LIMIT_KPH.min - 0.1, SPEED_LIMIT_KPH.min, SPEED_LIMIT_KPH.max, SPEED_LIMIT_KPH.max + 0.1]) {
      expect(isSpeedLimitKphAllowed(kph)).toBe(speedLimitKphSchema.safeParse(kph).success);
    }
  });
});

describe('km/h fields in displayed units', () => {
  it('converts 100 km/h to 62.137 mph (1 mi = 1.609344 km exactly) and back', () => {
    expect(kphToDisplay(100, 'imperial')).toBeCloseTo(62.1371, 4);
    expect(displayToKph(kphToDisplay(100, 'imperial'), 'imperial')).toBeCloseTo(100, 10);
    expect(kphToDisplay(42, 'metric')).toBeCloseTo(42, 10);
  });
});
