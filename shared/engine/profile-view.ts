import type { Profile, ProfileSeries, ProfileSubset, ProfileView } from '../domain/analysis';

/**
 * The per-point profile as a client asked for it: a chart a few hundred pixels wide needs
 * neither 20 000 points nor all twenty series. Thinning keeps, for every `profileStepM` of
 * distance, the step's first point and its hottest (brake temperature, both models) and fastest
 * points, plus the route's last point, so no peak a chart or a reader looks for disappears from
 * the thinned line (a plain "every n-th point" would cut the tops off short temperature peaks).
 * The summary and the descents are computed on the full profile and are never affected.
 * Without options the profile is returned as it is.
 */
export function viewProfile(profile: Profile, view: ProfileView): ProfileSubset {
  if (view.profileStepM === undefined && view.series === undefined) return profile;
  const kept = view.profileStepM === undefined ? null : pointsToKeep(profile, view.profileStepM);
  const names = new Set<ProfileSeries>(view.series ?? (Object.keys(profile) as ProfileSeries[]));
  names.add('distanceM');
  const subset: Partial<Profile> = {};
  for (const name of names) {
    const values = profile[name];
    subset[name] = kept ? kept.map((index) => values[index]!) : values;
  }
  return subset as ProfileSubset;
}

/** Indices of the points kept at one point per `stepM` (ascending, no duplicates). */
function pointsToKeep(profile: Profile, stepM: number): number[] {
  const { distanceM, brakeTempC, gsrsBrakeTempC, speedMps } = profile;
  const count = distanceM.length;
  if (count === 0) return [];
  const kept = new Set<number>();
  let binStart = 0;
  while (binStart < count) {
    const bin = Math.floor(distanceM[binStart]! / stepM);
    let binEnd = binStart + 1;
    while (binEnd < count && Math.floor(distanceM[binEnd]! / stepM) === bin) binEnd++;
    kept.add(binStart);
    kept.add(argMax(brakeTempC, binStart, binEnd));
    kept.add(argMax(gsrsBrakeTempC, binStart, binEnd));
    kept.add(argMax(speedMps, binStart, binEnd));
    binStart = binEnd;
  }
  kept.add(count - 1);
  return [...kept].sort((a, b) => a - b);
}

function argMax(values: number[], from: number, to: number): number {
  let best = from;
  for (let i = from + 1; i < to; i++) if (values[i]! > values[best]!) best = i;
  return best;
}
