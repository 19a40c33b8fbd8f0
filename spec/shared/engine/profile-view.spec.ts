import { describe, expect, it } from 'vitest';
import type { Profile } from '@shared/domain/analysis';
import { profileSchema } from '@shared/domain/analysis';
import { viewProfile } from '@shared/engine/profile-view';

/** A profile of `count` points 1 m apart; brake temperature with one narrow peak at `peakAt`. */
function aProfile(count: number, peakAt: number): Profile {
  const series = Object.fromEntries(
    Object.keys(profileSchema.shape).map((name) => [name, Array.from({ length: count }, (_, i) => i * 0.5)]),
  ) as Profile;
  series.distanceM = Array.from({ length: count }, (_, i) => i);
  series.brakeTempC = Array.from({ length: count }, (_, i) => (i === peakAt ? 480 : 60));
  return series;
}

describe('viewProfile', () => {
  it('returns the profile itself when no view is asked for', () => {
    const profile = aProfile(10, 3);

    expect(viewProfile(profile, {})).toBe(profile);
  });

  it('keeps a one-point temperature peak that every-n-th-point thinning would drop when thinning to 100 m steps', () => {
    const profile = aProfile(1_001, 537);

    const view = viewProfile(profile, { profileStepM: 100 });

    expect(Math.max(...view.brakeTempC!)).toBe(480);
    expect(view.distanceM).toContain(537);
    expect(view.distanceM[0]).toBe(0);
    expect(view.distanceM.at(-1)).toBe(1_000);
    // Ten full steps and the last point: the step's first, hottest and fastest points at most.
    expect(view.distanceM.length).toBeLessThanOrEqual(11 * 3 + 1);
    expect([...view.distanceM].sort((a, b) => a - b)).toEqual(view.distanceM);
    expect(new Set(view.distanceM).size).toBe(view.distanceM.length);
  });

  it('keeps every series aligned with distance when thinning', () => {
    const profile = aProfile(500, 10);

    const view = viewProfile(profile, { profileStepM: 50 });

    for (const [name, values] of Object.entries(view)) expect(values.length, name).toBe(view.distanceM.length);
    expect(view.speedMps).toEqual(view.distanceM.map((d) => d * 0.5));
  });

  it('answers only the named series and always distance when series are asked for', () => {
    const profile = aProfile(20, 3);

    const view = viewProfile(profile, { series: ['elevationM', 'soc'] });

    expect(Object.keys(view).sort()).toEqual(['distanceM', 'elevationM', 'soc']);
    expect(view.elevationM).toEqual(profile.elevationM);
  });

  it('answers an empty profile unchanged in shape when there are no points', () => {
    const view = viewProfile(aProfile(0, 0), { profileStepM: 10, series: ['speedMps'] });

    expect(view).toEqual({ distanceM: [], speedMps: [] });
  });

  it('rounds a thinned profile to the precision of the CSV export in SI units, and leaves an unthinned one exact', () => {
    const profile = aProfile(3, 1);
    profile.lat = [46.123456789, 46.12345678, 46.1234567];
    profile.elevationM = [1234.56789, 1000.004, 999.995];
    profile.speedMps = [13.88888, 0.0004, 2];
    profile.batteryPowerW = [-123456.7, 0.4, 99.5];
    profile.soc = [0.876543219, 0.5, 0.1];
    profile.rollingN = [1234.5678, 0.0012346, 98765];

    const thinned = viewProfile(profile, { profileStepM: 1 });
    const named = viewProfile(profile, { series: ['lat', 'elevationM'] });

    // lat/lon 7 decimals (about 1 cm), elevation 0.01 m, speed 0.01 km/h ≈ 0.003 m/s, power 0.001 kW = 1 W,
    // SOC 0.001 % = 1e-5; forces (not in the CSV) 4 significant digits.
    expect(thinned.lat).toEqual([46.1234568, 46.1234568, 46.1234567]);
    expect(thinned.elevationM).toEqual([1234.57, 1000, 1000]);
    expect(thinned.speedMps).toEqual([13.889, 0, 2]);
    expect(thinned.batteryPowerW).toEqual([-123457, 0, 100]);
    expect(thinned.soc).toEqual([0.87654, 0.5, 0.1]);
    expect(thinned.rollingN).toEqual([1235, 0.001235, 98770]);
    expect(named.lat).toBe(profile.lat);
    expect(named.elevationM).toBe(profile.elevationM);
  });
});
