/**
 * The per-point columns of the segment CSV export: one header per quantity, named as the charts
 * and the result screen name it, with its unit in brackets (SI or the trade's usual unit, fixed so
 * a spreadsheet reads every export the same way).
 */
export const PROFILE_COLUMNS = [
  { key: 'direction', header: 'Direction' },
  { key: 'distanceM', header: 'Distance (m)' },
  { key: 'lon', header: 'Longitude (°)' },
  { key: 'lat', header: 'Latitude (°)' },
  { key: 'elevationM', header: 'Elevation (m)' },
  { key: 'gradePercent', header: 'Grade (%)' },
  { key: 'speedKph', header: 'Speed (km/h)' },
  { key: 'timeS', header: 'Time (s)' },
  { key: 'tractionN', header: 'Traction force (N)' },
  { key: 'tractionPowerKw', header: 'Traction power (kW)' },
  { key: 'batteryPowerKw', header: 'Battery or line power (kW)' },
  { key: 'regenPowerKw', header: 'Regeneration power (kW)' },
  { key: 'frictionBrakePowerKw', header: 'Friction brake power (kW)' },
  { key: 'socPercent', header: 'SOC (%)' },
  { key: 'brakeTempC', header: 'Brake temperature (°C)' },
  { key: 'gsrsBrakeTempC', header: 'Brake temperature, grade-severity estimate (°C)' },
  { key: 'airDensityKgM3', header: 'Air density (kg/m³)' },
] as const;

export type ProfileColumnKey = (typeof PROFILE_COLUMNS)[number]['key'];

/** The header line, CSV-quoted where a header holds a comma. */
export function profileCsvHeader(): string {
  return PROFILE_COLUMNS.map(({ header }) => (/[",]/.test(header) ? `"${header.replace(/"/g, '""')}"` : header)).join(',');
}
