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
});
