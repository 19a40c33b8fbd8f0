/**
 * Turns a stored result's per-point profile into chart lines in the displayed units. Pure, so the
 * results and compare screens draw the same quantities the same way.
 */
import type { Profile } from '@shared/domain/analysis';
import type { ChartSeries } from '../charts/distance-chart';
import { toDisplay, type UnitSystem } from '../units/unit-format';

/** Grade classes for the elevation shading, % (positive uphill). */
const GRADE_SHADES: readonly { below: number; color: string }[] = [
  { below: -8, color: 'rgba(142, 27, 44, 0.55)' },
  { below: -5, color: 'rgba(208, 96, 26, 0.45)' },
  { below: -2, color: 'rgba(181, 137, 0, 0.35)' },
  { below: 2, color: 'rgba(92, 107, 112, 0.18)' },
  { below: 5, color: 'rgba(11, 85, 103, 0.30)' },
  { below: Infinity, color: 'rgba(11, 85, 103, 0.50)' },
];

export const GRADE_LEGEND: readonly { label: string; color: string }[] = [
  { label: 'steeper than −8 %', color: GRADE_SHADES[0]!.color },
  { label: '−8 to −5 %', color: GRADE_SHADES[1]!.color },
  { label: '−5 to −2 %', color: GRADE_SHADES[2]!.color },
  { label: 'about level', color: GRADE_SHADES[3]!.color },
  { label: '2 to 5 % up', color: GRADE_SHADES[4]!.color },
  { label: 'steeper than 5 % up', color: GRADE_SHADES[5]!.color },
];

export function gradeShade(gradePercent: number): string {
  return GRADE_SHADES.find((shade) => gradePercent < shade.below)!.color;
}

/** Distance along the route in the displayed unit, for every point. */
export function distanceAxis(profile: Pick<Profile, 'distanceM'>, system: UnitSystem): number[] {
  return profile.distanceM.map((m) => toDisplay('distance', m, system));
}

export function elevationSeries(
  profile: Pick<Profile, 'distanceM' | 'elevationM' | 'gradePercent'>,
  system: UnitSystem,
  label = 'Elevation',
  color = '#0b5567',
): ChartSeries {
  return {
    label,
    x: distanceAxis(profile, system),
    y: profile.elevationM.map((m) => toDisplay('elevation', m, system)),
    color,
    fill: true,
    segmentFill: profile.gradePercent.map(gradeShade),
  };
}

export function forceSeries(
  profile: Pick<Profile, 'distanceM' | 'rollingN' | 'aeroN' | 'gradeN' | 'inertiaN'>,
  system: UnitSystem,
): ChartSeries[] {
  const x = distanceAxis(profile, system);
  const force = (values: readonly number[]) => values.map((n) => toDisplay('force', n, system));
  return [
    { label: 'Rolling', x, y: force(profile.rollingN), color: '#5c6b70' },
    { label: 'Aerodynamic', x, y: force(profile.aeroN), color: '#3b7ea1' },
    { label: 'Grade', x, y: force(profile.gradeN), color: '#c2570c' },
    { label: 'Inertia', x, y: force(profile.inertiaN), color: '#6a2c91' },
  ];
}

export function speedSeries(
  profile: Pick<Profile, 'distanceM' | 'speedMps'>,
  system: UnitSystem,
  label = 'Speed',
  color = '#0b5567',
): ChartSeries {
  return { label, x: distanceAxis(profile, system), y: profile.speedMps.map((v) => toDisplay('speed', v, system)), color };
}

export function batterySeries(profile: Pick<Profile, 'distanceM' | 'batteryPowerW' | 'soc'>, system: UnitSystem): ChartSeries[] {
  const x = distanceAxis(profile, system);
  return [
    { label: 'Battery power (+ draw, − charge)', x, y: profile.batteryPowerW.map((w) => toDisplay('power', w, system)), color: '#0b5567' },
    { label: 'SOC', x, y: profile.soc.map((soc) => soc * 100), color: '#3f7f4f', rightAxis: true, dashed: true },
  ];
}

export function socSeries(profile: Pick<Profile, 'distanceM' | 'soc'>, system: UnitSystem, label: string, color: string): ChartSeries {
  return { label, x: distanceAxis(profile, system), y: profile.soc.map((soc) => soc * 100), color };
}

export function brakeTemperatureSeries(
  profile: Pick<Profile, 'distanceM' | 'brakeTempC'>,
  system: UnitSystem,
  label = 'Brake temperature',
  color = '#8e1b2c',
): ChartSeries {
  return { label, x: distanceAxis(profile, system), y: profile.brakeTempC.map((c) => toDisplay('temperature', c, system)), color };
}

/** Index of the profile point nearest `distanceM` (binary search; distances increase). */
export function nearestIndex(distanceM: readonly number[], target: number): number {
  let low = 0;
  let high = distanceM.length - 1;
  if (high < 0) return -1;
  while (high - low > 1) {
    const mid = (low + high) >> 1;
    if (distanceM[mid]! < target) low = mid;
    else high = mid;
  }
  return Math.abs(distanceM[low]! - target) <= Math.abs(distanceM[high]! - target) ? low : high;
}

/** One colour per compared scenario, distinct for colour-blind readers too (paired with dashes). */
export const COMPARE_COLORS: readonly string[] = ['#0b5567', '#c2570c', '#6a2c91', '#3f7f4f'];
