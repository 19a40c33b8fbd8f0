/**
 * The per-point columns of the segment CSV export: the direction, then every series the engine's
 * table marks for the CSV (shared/engine/profile-series.ts), in its order, in its CSV unit and
 * decimals. Each header names the quantity as the charts and the result screen name it, with its
 * unit in brackets (SI or the trade's usual unit, fixed so a spreadsheet reads every export the
 * same way).
 */
import { CSV_SERIES, type CsvSeriesName } from '../engine/profile-series';

/** The words of each CSV series' header, keyed by the series name (its label key). */
export const PROFILE_SERIES_LABELS: Record<CsvSeriesName, string> = {
  distanceM: 'Distance',
  lon: 'Longitude',
  lat: 'Latitude',
  elevationM: 'Elevation',
  gradePercent: 'Grade',
  speedMps: 'Speed',
  timeS: 'Time',
  tractionN: 'Traction force',
  tractionPowerW: 'Traction power',
  batteryPowerW: 'Battery or line power',
  regenPowerW: 'Regeneration power',
  frictionBrakePowerW: 'Friction brake power',
  soc: 'SOC',
  brakeTempC: 'Brake temperature',
  gsrsBrakeTempC: 'Brake temperature, grade-severity estimate',
  airDensityKgM3: 'Air density',
};

export const PROFILE_COLUMNS = [
  { key: 'direction', header: 'Direction' },
  ...CSV_SERIES.map((series) => ({ key: series.name, header: `${PROFILE_SERIES_LABELS[series.name]} (${series.csv.unit})` })),
] as const;

export type ProfileColumnKey = (typeof PROFILE_COLUMNS)[number]['key'];

/** The header line, CSV-quoted where a header holds a comma. */
export function profileCsvHeader(): string {
  return PROFILE_COLUMNS.map(({ header }) => (/[",]/.test(header) ? `"${header.replace(/"/g, '""')}"` : header)).join(',');
}
