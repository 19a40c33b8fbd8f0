import type { Profile, ProfileSeries, ProfileSubset, ProfileView } from '../domain/analysis';
import { PROFILE_SERIES } from './profile-series';

/**
 * The per-point profile as a client asked for it: a chart a few hundred pixels wide needs
 * neither 20 000 points nor all twenty series. Thinning keeps, for every `profileStepM` of
 * distance, the step's first point and its hottest (brake temperature, both models) and fastest
 * points, plus the route's last point, so no peak a chart or a reader looks for disappears from
 * the thinned line (a plain "every n-th point" would cut the tops off short temperature peaks).
 * A thinned profile is for drawing, so its values are also rounded to the precision the CSV
 * export gives each series (in SI units: 0.01 m of elevation, 1 W, 0.001 m/s, 1e-7° of longitude;
 * forces the CSV leaves out to 4 significant digits), far below a pixel of any chart, which makes
 * the answer about half as long. The summary and the descents are computed on the full profile
 * and are never affected. Without options the profile is returned as it is; with only `series`,
 * the values are not rounded.
 */
export function viewProfile(profile: Profile, view: ProfileView): ProfileSubset {
  if (view.profileStepM === undefined && view.series === undefined) return profile;
  const kept = view.profileStepM === undefined ? null : pointsToKeep(profile, view.profileStepM);
  const names = new Set<ProfileSeries>(view.series ?? (Object.keys(profile) as ProfileSeries[]));
  names.add('distanceM');
  const subset: Partial<Profile> = {};
  for (const name of names) {
    const values = profile[name];
    const round = ROUNDING.get(name)!;
    subset[name] = kept ? kept.map((index) => round(values[index]!)) : values;
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

/** How a thinned profile rounds each series: to the CSV export's decimals, converted to SI. */
const ROUNDING = new Map<string, (value: number) => number>(
  PROFILE_SERIES.map((series) => {
    if (!series.csv) return [series.name, (value: number) => Number(value.toPrecision(4))];
    // CSV decimals in the CSV's unit, as decimals of the SI value (km/h → m/s, kW → W, % → 1).
    const decimals = Math.max(0, series.csv.decimals + Math.ceil(Math.log10(series.csv.toCsv(1))));
    const scale = 10 ** decimals;
    return [series.name, (value: number) => Math.round(value * scale) / scale];
  }),
);
