/**
 * The per-point series of an analysis: one table that the run state (route-run.ts), the preview
 * and scenario answer (analyse-route.ts), the contract (`profileSchema`, `profileSubsetSchema` in
 * shared/domain/analysis.ts) and the CSV columns (shared/presentation/profile-columns.ts) are all
 * built from. Adding a series here adds it everywhere; the public field names are the `name`s.
 *
 * - `unit`: the SI unit of the values (the engine's and the API's unit, named in the field name).
 * - `kind`: `'point'` is the value at the point (on arrival, before any dwell there);
 *   `'segment'` describes the segment from point i to point i + 1 (forces, powers as segment
 *   means, grade, air density), and the last point repeats the last segment.
 * - `source`: `'model'` comes from the prepared route (geometry, grade, air density), `'run'` from
 *   the run along it. Run series are held in the run state as one Float64Array each.
 * - `csv`: whether the segment CSV shows it, in which display unit (`toCsv` converts from SI) and
 *   with how many decimals; its header is the series' label (keyed by `name` in
 *   shared/presentation/profile-columns.ts) with the unit in brackets. `null`: not in the CSV.
 */

export interface ProfileSeriesCsv {
  /** Unit of the CSV column, shown in brackets in its header. */
  unit: string;
  /** Decimals the CSV keeps. */
  decimals: number;
  /** From the SI value to the CSV's unit. */
  toCsv: (value: number) => number;
}

export interface ProfileSeriesSpec {
  name: string;
  unit: string;
  kind: 'point' | 'segment';
  source: 'model' | 'run';
  csv: ProfileSeriesCsv | null;
}

const asIs = (value: number) => value;
const csv = (unit: string, decimals: number, toCsv: (value: number) => number = asIs): ProfileSeriesCsv => ({ unit, decimals, toCsv });
const kilo = (value: number) => value / 1_000;

/** Every per-point series, in the order the answer and the CSV list them. */
export const PROFILE_SERIES = [
  { name: 'distanceM', unit: 'm', kind: 'point', source: 'model', csv: csv('m', 2) },
  { name: 'lon', unit: '°', kind: 'point', source: 'model', csv: csv('°', 7) },
  { name: 'lat', unit: '°', kind: 'point', source: 'model', csv: csv('°', 7) },
  { name: 'elevationM', unit: 'm', kind: 'point', source: 'model', csv: csv('m', 2) },
  { name: 'gradePercent', unit: '%', kind: 'segment', source: 'model', csv: csv('%', 3) },
  { name: 'speedMps', unit: 'm/s', kind: 'point', source: 'run', csv: csv('km/h', 2, (value) => value * 3.6) },
  { name: 'timeS', unit: 's', kind: 'point', source: 'run', csv: csv('s', 2) },
  { name: 'rollingN', unit: 'N', kind: 'segment', source: 'run', csv: null },
  { name: 'aeroN', unit: 'N', kind: 'segment', source: 'run', csv: null },
  { name: 'gradeN', unit: 'N', kind: 'segment', source: 'run', csv: null },
  { name: 'inertiaN', unit: 'N', kind: 'segment', source: 'run', csv: null },
  { name: 'tractionN', unit: 'N', kind: 'segment', source: 'run', csv: csv('N', 1) },
  { name: 'tractionPowerW', unit: 'W', kind: 'segment', source: 'run', csv: csv('kW', 3, kilo) },
  { name: 'batteryPowerW', unit: 'W', kind: 'segment', source: 'run', csv: csv('kW', 3, kilo) },
  { name: 'regenPowerW', unit: 'W', kind: 'segment', source: 'run', csv: csv('kW', 3, kilo) },
  { name: 'frictionBrakePowerW', unit: 'W', kind: 'segment', source: 'run', csv: csv('kW', 3, kilo) },
  { name: 'soc', unit: '1', kind: 'point', source: 'run', csv: csv('%', 3, (value) => value * 100) },
  { name: 'brakeTempC', unit: '°C', kind: 'point', source: 'run', csv: csv('°C', 2) },
  { name: 'gsrsBrakeTempC', unit: '°C', kind: 'point', source: 'run', csv: csv('°C', 2) },
  { name: 'airDensityKgM3', unit: 'kg/m³', kind: 'segment', source: 'model', csv: csv('kg/m³', 4) },
] as const satisfies readonly ProfileSeriesSpec[];

type Series = (typeof PROFILE_SERIES)[number];

/** The name of one per-point series (a field of the answer's `profile`). */
export type ProfileSeriesName = Series['name'];

/** Series the run computes, held in the run state. */
export type RunSeriesName = Extract<Series, { source: 'run' }>['name'];

/** Series the CSV shows. */
export type CsvSeriesName = Exclude<Series, { csv: null }>['name'];

export const PROFILE_SERIES_NAMES = PROFILE_SERIES.map((series) => series.name) as readonly ProfileSeriesName[] as readonly [
  ProfileSeriesName,
  ...ProfileSeriesName[],
];

/** The run series, in table order. */
export const RUN_SERIES = PROFILE_SERIES.filter((series): series is Extract<Series, { source: 'run' }> => series.source === 'run');

/** The CSV's series, in table order. */
export const CSV_SERIES = PROFILE_SERIES.filter((series): series is Exclude<Series, { csv: null }> => series.csv !== null);
