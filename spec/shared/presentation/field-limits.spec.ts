import { describe, expect, it } from 'vitest';
import { conditionsSchema } from '@shared/domain/analysis';
import {
  DEFAULT_START_SOC,
  NAME_MAX_LENGTH,
  SERVICE_DAYS_PER_YEAR,
  SPEED_LIMIT_KPH,
  STOP_DWELL_S,
  TRIPS_PER_DAY,
  speedLimitKphSchema,
} from '@shared/domain/limits';
import { roadRouteDraftSchema, routeStopSchema } from '@shared/domain/road-routes';
import {
  DWELL_RANGE,
  SERVICE_DAYS_RANGE,
  SOC_PERCENT_RANGE,
  TRIPS_PER_DAY_RANGE,
  coordinateRange,
  displayToKph,
  isSpeedLimitKphAllowed,
  kphToDisplay,
  speedLimitKphOf,
  speedLimitRange,
} from '@shared/presentation/index';

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

describe('a speed limit typed in the displayed unit', () => {
  it('is stored in km/h to 0.1: 30 mph is 48.3 km/h (48.28032), 50 km/h stays 50', () => {
    expect(speedLimitKphOf(30, 'imperial')).toBe(48.3);
    expect(speedLimitKphOf(50, 'metric')).toBe(50);
  });
});

describe('km/h fields in displayed units', () => {
  it('converts 100 km/h to 62.137 mph (1 mi = 1.609344 km exactly) and back', () => {
    expect(kphToDisplay(100, 'imperial')).toBeCloseTo(62.1371, 4);
    expect(displayToKph(kphToDisplay(100, 'imperial'), 'imperial')).toBeCloseTo(100, 10);
    expect(kphToDisplay(42, 'metric')).toBeCloseTo(42, 10);
  });
});

describe('route and run limits shared by the schemas and the forms', () => {
  it('states trips per day, service days and start SOC as the forms show them', () => {
    expect(TRIPS_PER_DAY_RANGE.span).toBe('0 to 500');
    expect(SERVICE_DAYS_RANGE.span).toBe('0 to 366');
    expect(SOC_PERCENT_RANGE).toMatchObject({ min: 0, max: 100, span: '0 to 100 %' });
  });

  it('is what the route schema takes and refuses at both ends, with the defaults a new route gets', () => {
    const route = (change: object) =>
      roadRouteDraftSchema.safeParse({
        name: 'Upper loop',
        geometry: {
          type: 'LineString',
          coordinates: [
            [10, 46],
            [10, 46.01],
          ],
        },
        ...change,
      });

    expect(route({ tripsPerDay: TRIPS_PER_DAY_RANGE.max, serviceDaysPerYear: SERVICE_DAYS_RANGE.max }).success).toBe(true);
    expect(route({ tripsPerDay: TRIPS_PER_DAY_RANGE.max + 1 }).success).toBe(false);
    expect(route({ serviceDaysPerYear: SERVICE_DAYS_RANGE.max + 1 }).success).toBe(false);
    expect(route({ serviceDaysPerYear: SERVICE_DAYS_RANGE.min - 1 }).success).toBe(false);
    const defaults = route({});
    expect(defaults.success && [defaults.data.tripsPerDay, defaults.data.serviceDaysPerYear]).toEqual([
      TRIPS_PER_DAY.default,
      SERVICE_DAYS_PER_YEAR.default,
    ]);
  });

  it('takes a start SOC of 0 to 1 and starts a run at the default when none is given', () => {
    expect(conditionsSchema.safeParse({ startSoc: SOC_PERCENT_RANGE.max / 100 }).success).toBe(true);
    expect(conditionsSchema.safeParse({ startSoc: 1.01 }).success).toBe(false);
    expect(conditionsSchema.parse({}).startSoc).toBe(DEFAULT_START_SOC);
  });
});

describe('stop and coordinate limits shared by the route schema and the editor tables', () => {
  const stop = (change: object) => routeStopSchema.safeParse({ name: 'Upper square', lon: 10.85, lat: 46.55, ...change });

  it('states the WGS 84 ranges and the dwell range as the tables show them', () => {
    expect(coordinateRange('lon')).toMatchObject({ min: -180, max: 180, message: 'A longitude is between \u2212180 and 180 degrees.' });
    expect(coordinateRange('lat')).toMatchObject({ min: -90, max: 90, span: '\u221290 to 90°' });
    expect(DWELL_RANGE).toMatchObject({ min: 0, max: 3600, message: 'Between 0 and 3600 s.' });
  });

  it('is what the stop schema takes and refuses at both ends, with the default dwell', () => {
    const lat = coordinateRange('lat');
    const lon = coordinateRange('lon');
    expect(stop({ lat: lat.max, lon: lon.min, dwellS: DWELL_RANGE.max }).success).toBe(true);
    expect(stop({ lat: lat.max + 0.000001 }).success).toBe(false);
    expect(stop({ lon: lon.min - 0.000001 }).success).toBe(false);
    expect(stop({ dwellS: DWELL_RANGE.max + 1 }).success).toBe(false);
    expect(stop({ dwellS: DWELL_RANGE.min - 1 }).success).toBe(false);
    expect(stop({ name: 'x'.repeat(NAME_MAX_LENGTH) }).success).toBe(true);
    expect(stop({ name: 'x'.repeat(NAME_MAX_LENGTH + 1) }).success).toBe(false);
    const defaults = stop({});
    expect(defaults.success && defaults.data.dwellS).toBe(STOP_DWELL_S.default);
  });
});
