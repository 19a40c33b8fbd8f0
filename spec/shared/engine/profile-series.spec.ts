import { describe, expect, it } from 'vitest';
import { profileSchema, profileSubsetSchema } from '../../../shared/domain/analysis';
import { analyseRouteDetailed } from '../../../shared/engine/index';
import { CSV_SERIES, PROFILE_SERIES, PROFILE_SERIES_NAMES, RUN_SERIES } from '../../../shared/engine/profile-series';
import { profileCsvHeader } from '../../../shared/presentation/profile-columns';
import { aStraightRoute, aWorkedExampleBus } from '../support/engine-builders';

// The public API's per-point field names: clients read them, so they never change silently.
const PUBLIC_PROFILE_FIELDS = [
  'distanceM',
  'lon',
  'lat',
  'elevationM',
  'gradePercent',
  'speedMps',
  'timeS',
  'rollingN',
  'aeroN',
  'gradeN',
  'inertiaN',
  'tractionN',
  'tractionPowerW',
  'batteryPowerW',
  'regenPowerW',
  'frictionBrakePowerW',
  'soc',
  'brakeTempC',
  'gsrsBrakeTempC',
  'airDensityKgM3',
];

describe('the per-point series table', () => {
  it('gives the contract exactly the public field names, in order', () => {
    expect(PROFILE_SERIES_NAMES).toEqual(PUBLIC_PROFILE_FIELDS);
    expect(Object.keys(profileSchema.shape)).toEqual(PUBLIC_PROFILE_FIELDS);
    expect(Object.keys(profileSubsetSchema.shape)).toEqual(PUBLIC_PROFILE_FIELDS);
  });

  it('makes every series required in the full profile and only the distance in a subset', () => {
    const distanceOnly = { distanceM: [0, 10] };

    expect(profileSchema.safeParse(distanceOnly).success).toBe(false);
    expect(profileSubsetSchema.safeParse(distanceOnly).success).toBe(true);
    expect(profileSubsetSchema.safeParse({ soc: [0.5] }).success).toBe(false);
  });

  it('names the CSV columns as exports always have', () => {
    expect(profileCsvHeader()).toBe(
      'Direction,Distance (m),Longitude (°),Latitude (°),Elevation (m),Grade (%),Speed (km/h),Time (s),Traction force (N),' +
        'Traction power (kW),Battery or line power (kW),Regeneration power (kW),Friction brake power (kW),SOC (%),' +
        'Brake temperature (°C),"Brake temperature, grade-severity estimate (°C)",Air density (kg/m³)',
    );
    expect(CSV_SERIES.map((series) => series.name)).not.toContain('rollingN');
  });

  it('converts to the CSV units: km/h, kW and percent', () => {
    const csvOf = (name: string) => PROFILE_SERIES.find((series) => series.name === name)!.csv!;

    expect(csvOf('speedMps').toCsv(10)).toBeCloseTo(36, 12);
    expect(csvOf('batteryPowerW').toCsv(12_345)).toBe(12.345);
    expect(csvOf('soc').toCsv(0.42)).toBeCloseTo(42, 12);
  });

  describe('drives the run state and the answer', () => {
    const detailed = analyseRouteDetailed({
      route: { type: 'LineString', coordinates: aStraightRoute(3_000, (s) => 1_200 - 0.06 * s) },
      vehicle: aWorkedExampleBus(),
      conditions: { startSoc: 0.6, ambientC: 10 },
    });

    it('holds one array per run series, one value per point', async () => {
      const { run, model } = await detailed;

      for (const { name } of RUN_SERIES) {
        expect(run[name], name).toBeInstanceOf(Float64Array);
        expect(run[name].length, name).toBe(model.pointCount);
      }
    });

    it('answers every series at every point, a segment series repeating its last segment at the end', async () => {
      const { response, model } = await detailed;
      const n = model.pointCount;

      expect(Object.keys(response.profile)).toEqual(PUBLIC_PROFILE_FIELDS);
      for (const { name, kind } of PROFILE_SERIES) {
        const values = response.profile[name];
        expect(values, name).toHaveLength(n);
        if (kind === 'segment') expect(values[n - 1], name).toBe(values[n - 2]);
      }
      expect(response.profile.frictionBrakePowerW.some((watts) => watts > 0)).toBe(true);
      expect(response.profile.gradePercent[0]).toBeCloseTo(-6, 1);
    });
  });
});
