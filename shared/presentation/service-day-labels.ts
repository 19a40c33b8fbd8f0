/**
 * Words and times for service days: day types, battery ages, charger kinds and the clock times
 * of a service day (seconds after midnight, past 24 h for trips after midnight, as timetables
 * write them). The screens, the PDF and the CSV read them from here.
 */
import type { BatteryAge, ChargerKind, DayType } from '../domain/service-days';

export const DAY_TYPE_LABELS: Readonly<Record<DayType, string>> = {
  weekday: 'Weekday',
  saturday: 'Saturday',
  'sunday-holiday': 'Sunday or holiday',
};

export const BATTERY_AGE_LABELS: Readonly<Record<BatteryAge, string>> = {
  'beginning-of-life': 'New battery',
  'end-of-life': 'End of battery life',
};

export const CHARGER_KIND_LABELS: Readonly<Record<ChargerKind, string>> = {
  depot: 'Depot charger',
  terminus: 'Terminus charger',
};

/** "06:05", "24:40" (a time after midnight stays on the same service day, as in timetables). */
export function formatServiceTime(timeS: number): string {
  const minutes = Math.floor(Math.max(0, timeS) / 60);
  return `${String(Math.floor(minutes / 60)).padStart(2, '0')}:${String(minutes % 60).padStart(2, '0')}`;
}

/**
 * Reads "6:05", "06:05" or "25:10" (hours up to 36, minutes 00–59) as seconds after midnight;
 * null when the text is not such a time.
 */
export function parseServiceTime(text: string): number | null {
  const match = /^\s*(\d{1,2}):([0-5]\d)\s*$/.exec(text);
  if (!match) return null;
  const hours = Number(match[1]);
  const minutes = Number(match[2]);
  const seconds = hours * 3600 + minutes * 60;
  return seconds > 36 * 3600 ? null : seconds;
}

/** "1 h 25 min", "40 min": a span of the day in words. */
export function formatDuration(durationS: number): string {
  const minutes = Math.round(Math.max(0, durationS) / 60);
  if (minutes < 60) return `${minutes} min`;
  const rest = minutes % 60;
  return rest === 0 ? `${Math.floor(minutes / 60)} h` : `${Math.floor(minutes / 60)} h ${rest} min`;
}
