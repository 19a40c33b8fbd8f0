/**
 * Reads a logged-trip CSV: comma-separated, a header row naming the columns with their units,
 * one row per sample. Parsed with papaparse in streaming mode (row by row from a stream, stopped
 * as soon as a row is refused or the row limit is passed), so a bad file costs no more than the
 * rows before its first problem.
 *
 * Columns (names are matched without regard to case or surrounding spaces):
 * - time: `time_s` (seconds, any origin) or `timestamp` (ISO 8601 with a time-zone offset or Z);
 * - position: `lat`, `lon` (WGS 84 degrees);
 * - speed: `speed_mps` or `speed_kph`;
 * - optional: `elevation_m`, `battery_power_w` (positive while discharging) or both
 *   `battery_voltage_v` and `battery_current_a` (power = V·I, current positive while
 *   discharging), `soc` (0–1) or `soc_percent` (0–100), `ambient_c`, `brake_temp_c`, `passengers`.
 * Other columns are ignored and listed. Required cells must hold a value; optional cells may be
 * empty (the channel is then interpolated between the rows that have it).
 *
 * Every refusal is a `LoggedTripFileError` naming the row (the header is row 1) and the column.
 */
import { Readable } from 'node:stream';
import Papa from 'papaparse';
import type { TripSamples } from '@shared/engine/trip-alignment';
import { HttpError } from '../http/http-error';

/** Largest gap between two consecutive rows, s (common practice: loggers record at 1–10 Hz; a longer gap loses the stops and accelerations a replay needs). */
export const MAX_SAMPLE_GAP_S = 10;
/** Highest speed accepted, m/s (180 km/h: beyond any bus, trolleybus or tram). */
export const MAX_SPEED_MPS = 50;
/** Largest change of speed between rows, m/s² (beyond 1 g no road or rail vehicle can brake or accelerate). */
export const MAX_ACCELERATION_MPS2 = 10;
/** Fewest rows of a trip. */
export const MIN_ROWS = 10;

export interface ParsedTrip {
  samples: TripSamples;
  rows: number;
  /** The first row's time when the file gives `timestamp`. */
  startedAt: string | null;
  /** Recognised columns as named in the file. */
  columns: string[];
  ignoredColumns: string[];
  ambientC: Float64Array | null;
  passengers: Float64Array | null;
}

/** A refused logged-trip file: 400 (413 past the row limit) naming the row and column. */
export class LoggedTripFileError extends HttpError {
  constructor(code: string, where: { file: string; row?: number; column?: string }, problem: string, status = 400) {
    const place = [
      where.file,
      where.row === undefined ? undefined : `row ${where.row}`,
      where.column === undefined ? undefined : `column ${where.column}`,
    ]
      .filter(Boolean)
      .join(', ');
    super(status, code, `${place}: ${problem}`, { file: where.file, row: where.row ?? null, column: where.column ?? null });
  }
}

type Channel =
  | 'time_s'
  | 'timestamp'
  | 'lat'
  | 'lon'
  | 'speed_mps'
  | 'speed_kph'
  | 'elevation_m'
  | 'battery_power_w'
  | 'battery_voltage_v'
  | 'battery_current_a'
  | 'soc'
  | 'soc_percent'
  | 'ambient_c'
  | 'brake_temp_c'
  | 'passengers';

/** Accepted range of every numeric column (inclusive); values outside are impossible. */
const RANGES: Record<Exclude<Channel, 'timestamp'>, readonly [number, number, string]> = {
  time_s: [-1e9, 1e9, 's'],
  lat: [-90, 90, '°'],
  lon: [-180, 180, '°'],
  speed_mps: [0, MAX_SPEED_MPS, 'm/s'],
  speed_kph: [0, MAX_SPEED_MPS * 3.6, 'km/h'],
  elevation_m: [-500, 9_000, 'm'],
  battery_power_w: [-5e6, 5e6, 'W'],
  battery_voltage_v: [0, 2_000, 'V'],
  battery_current_a: [-5_000, 5_000, 'A'],
  soc: [0, 1, ''],
  soc_percent: [0, 100, '%'],
  ambient_c: [-60, 60, '°C'],
  brake_temp_c: [-60, 1_200, '°C'],
  passengers: [0, 500, ''],
};
const KNOWN = new Set<string>(['timestamp', ...Object.keys(RANGES)]);
const REQUIRED: Channel[] = ['lat', 'lon'];

/** Parses and checks a logged trip per the module comment. */
export async function parseLoggedTripCsv(data: Buffer, file: string, maxRows: number): Promise<ParsedTrip> {
  const refuse = (code: string, problem: string, row?: number, column?: string): never => {
    throw new LoggedTripFileError(code, { file, row, column }, problem);
  };
  const text = data.toString('utf8').replace(/^\uFEFF/, '');
  if (text.trim().length === 0) refuse('empty_file', 'the file is empty; it needs a header row and one row per sample');

  let header = null as string[] | null;
  let index = new Map<Channel, number>();
  let width = 0;
  let row = 0;
  const values = new Map<Channel, number[]>();
  const times: number[] = [];
  let startedAt: string | null = null;
  let refusal: unknown = null;

  await new Promise<void>((resolve) => {
    Papa.parse<string[]>(Readable.from(chunks(text)), {
      header: false,
      delimiter: ',',
      skipEmptyLines: 'greedy',
      step: (result, parser) => {
        try {
          row++;
          const fields = result.data;
          if (!header) {
            ({ header, index, width } = readHeader(fields, refuse));
            for (const channel of index.keys()) values.set(channel, []);
            return;
          }
          if (row - 1 > maxRows) {
            throw new LoggedTripFileError(
              'too_many_rows',
              { file, row },
              `the file has more than ${maxRows.toLocaleString('en-GB')} samples, the most one trip may have; split it into shorter trips`,
              413,
            );
          }
          if (fields.length !== width) {
            refuse('invalid_row', `expected ${width} comma-separated values as in the header, found ${fields.length}`, row);
          }
          readRow(fields, row);
        } catch (error) {
          // A refused row ends the parse; the error is rethrown once papaparse has stopped.
          refusal = error;
          parser.abort();
        }
      },
      complete: () => resolve(),
      error: (error) => {
        refusal = new LoggedTripFileError('not_csv', { file }, `the file cannot be read as CSV (${error.message})`);
        resolve();
      },
    });
  });
  if (refusal) throw refusal;
  if (!header) refuse('empty_file', 'the file has no header row');
  const rows = times.length;
  if (rows < MIN_ROWS) refuse('too_few_rows', `a trip needs at least ${MIN_ROWS} samples; the file has ${rows}`);

  function readRow(fields: string[], rowNumber: number) {
    for (const [channel, column] of index) {
      const raw = (fields[column] ?? '').trim();
      const name = header![column]!;
      const required =
        REQUIRED.includes(channel) || channel === 'time_s' || channel === 'timestamp' || channel === 'speed_mps' || channel === 'speed_kph';
      if (raw === '') {
        if (required) refuse('missing_value', 'the cell is empty; this column needs a value in every row', rowNumber, name);
        values.get(channel)!.push(Number.NaN);
        continue;
      }
      if (channel === 'timestamp') {
        if (index.has('time_s')) continue;
        const ms = parseIsoTimestamp(raw);
        if (ms === null)
          refuse(
            'invalid_value',
            `"${raw}" is not an ISO 8601 date and time with a time-zone offset (e.g. 2026-03-14T07:05:00Z)`,
            rowNumber,
            name,
          );
        values.get(channel)!.push(ms! / 1000);
        if (startedAt === null) startedAt = new Date(ms!).toISOString();
        continue;
      }
      const value = Number(raw);
      if (!/^[+-]?(\d+\.?\d*|\.\d+)([eE][+-]?\d+)?$/.test(raw) || !Number.isFinite(value)) {
        refuse('invalid_value', `"${raw}" is not a number`, rowNumber, name);
      }
      const [min, max, unit] = RANGES[channel as Exclude<Channel, 'timestamp'>];
      if (value < min || value > max) {
        const hint = channel === 'soc' && value > 1 && value <= 100 ? '; a SOC in per cent belongs in a column named soc_percent' : '';
        refuse(
          'impossible_value',
          `${raw}${unit ? ` ${unit}` : ''} is outside the possible range ${min}–${max}${unit ? ` ${unit}` : ''}${hint}`,
          rowNumber,
          name,
        );
      }
      if (channel === 'passengers' && !Number.isInteger(value))
        refuse('impossible_value', `${raw} is not a whole number of passengers`, rowNumber, name);
      values.get(channel)!.push(value);
    }
    const timeChannel: Channel = index.has('time_s') ? 'time_s' : 'timestamp';
    const time = values.get(timeChannel)!.at(-1)!;
    const timeName = header![index.get(timeChannel)!]!;
    const previous = times.at(-1);
    if (previous !== undefined) {
      if (time === previous)
        refuse(
          'duplicate_time',
          `the time repeats the previous row's (${describeTime(time, timeChannel)}); every row needs its own time`,
          rowNumber,
          timeName,
        );
      if (time < previous)
        refuse(
          'unordered_time',
          `the time (${describeTime(time, timeChannel)}) is earlier than the previous row's (${describeTime(previous, timeChannel)}); rows must be in time order`,
          rowNumber,
          timeName,
        );
      if (time - previous > MAX_SAMPLE_GAP_S) {
        refuse(
          'time_gap',
          `${(time - previous).toFixed(1)} s have passed since the previous row; the longest gap allowed is ${MAX_SAMPLE_GAP_S} s (split the trip at the gap)`,
          rowNumber,
          timeName,
        );
      }
      const speedChannel: Channel = index.has('speed_mps') ? 'speed_mps' : 'speed_kph';
      const speeds = values.get(speedChannel)!;
      const factor = speedChannel === 'speed_kph' ? 1 / 3.6 : 1;
      const acceleration = (Math.abs(speeds.at(-1)! - speeds.at(-2)!) * factor) / (time - previous);
      if (acceleration > MAX_ACCELERATION_MPS2) {
        refuse(
          'impossible_value',
          `the speed changes by ${acceleration.toFixed(1)} m/s² from the previous row; more than ${MAX_ACCELERATION_MPS2} m/s² is impossible for a road or rail vehicle`,
          rowNumber,
          header![index.get(speedChannel)!]!,
        );
      }
    }
    times.push(time);
  }

  const column = (channel: Channel) => (values.has(channel) ? Float64Array.from(values.get(channel)!) : null);
  const time = column(index.has('time_s') ? 'time_s' : 'timestamp')!;
  const t0 = time[0]!;
  const timeS = time.map((t) => t - t0);
  const speed = column('speed_mps') ?? column('speed_kph')!.map((v) => v / 3.6);
  let batteryPowerW = column('battery_power_w');
  if (!batteryPowerW && values.has('battery_voltage_v')) {
    const voltage = column('battery_voltage_v')!;
    const current = column('battery_current_a')!;
    batteryPowerW = voltage.map((v, i) => v * current[i]!);
  }
  const soc = column('soc') ?? column('soc_percent')?.map((v) => v / 100) ?? null;
  const allMissing = (channel: Float64Array | null) => (channel && channel.every((v) => Number.isNaN(v)) ? null : channel);
  const headerNames = header as string[];
  return {
    samples: {
      timeS,
      lat: column('lat')!,
      lon: column('lon')!,
      speedMps: speed,
      elevationM: allMissing(column('elevation_m')),
      batteryPowerW: allMissing(batteryPowerW),
      soc: allMissing(soc),
      brakeTempC: allMissing(column('brake_temp_c')),
    },
    rows,
    startedAt,
    columns: [...index.values()].map((i) => headerNames[i]!),
    ignoredColumns: headerNames.filter((name) => !KNOWN.has(normalise(name))),
    ambientC: allMissing(column('ambient_c')),
    passengers: allMissing(column('passengers')),
  };
}

function readHeader(fields: string[], refuse: (code: string, problem: string, row?: number, column?: string) => never) {
  const names = fields.map(normalise);
  if (fields.length === 1 && /[;\t]/.test(fields[0]!)) {
    refuse('not_csv', 'the header holds one column with semicolons or tabs in it; the file must be comma-separated', 1);
  }
  if (names.every((name) => name === '' || /^[+-]?[\d.]+$/.test(name))) {
    refuse(
      'missing_header',
      'the first row must be a header naming the columns (time_s or timestamp, lat, lon, speed_mps or speed_kph, …), not data',
      1,
    );
  }
  const index = new Map<Channel, number>();
  names.forEach((name, column) => {
    if (!KNOWN.has(name)) return;
    if (index.has(name as Channel))
      refuse('duplicate_column', `the column "${fields[column]!.trim()}" appears twice in the header`, 1, fields[column]!.trim());
    index.set(name as Channel, column);
  });
  const missing = (what: string) => refuse('missing_column', `the required column ${what} is missing from the header`, 1, what);
  if (!index.has('time_s') && !index.has('timestamp')) missing('time_s (or timestamp)');
  if (!index.has('lat')) missing('lat');
  if (!index.has('lon')) missing('lon');
  if (!index.has('speed_mps') && !index.has('speed_kph')) missing('speed_mps (or speed_kph)');
  if (index.has('speed_mps') && index.has('speed_kph')) index.delete('speed_kph');
  if (index.has('soc') && index.has('soc_percent')) index.delete('soc_percent');
  if (index.has('time_s') && index.has('timestamp')) index.delete('timestamp');
  if (index.has('battery_power_w')) {
    index.delete('battery_voltage_v');
    index.delete('battery_current_a');
  } else if (index.has('battery_voltage_v') !== index.has('battery_current_a')) {
    const present = index.has('battery_voltage_v') ? 'battery_voltage_v' : 'battery_current_a';
    const absent = present === 'battery_voltage_v' ? 'battery_current_a' : 'battery_voltage_v';
    refuse('missing_column', `${present} needs ${absent} beside it to give the battery power (or give battery_power_w)`, 1, absent);
  }
  return { header: fields.map((field) => field.trim()), index, width: fields.length };
}

function normalise(name: string): string {
  return name.trim().toLowerCase();
}

function* chunks(text: string): Generator<string> {
  const size = 64 * 1024;
  for (let i = 0; i < text.length; i += size) yield text.slice(i, i + size);
}

/** Milliseconds since the epoch of an ISO 8601 date-time with an offset or Z; null otherwise. */
function parseIsoTimestamp(raw: string): number | null {
  if (!/^\d{4}-\d{2}-\d{2}[T ]\d{2}:\d{2}(:\d{2}(\.\d+)?)?(Z|[+-]\d{2}:?\d{2})$/i.test(raw)) return null;
  const ms = Date.parse(raw.replace(' ', 'T'));
  return Number.isFinite(ms) ? ms : null;
}

function describeTime(value: number, channel: Channel): string {
  return channel === 'timestamp' ? new Date(value * 1000).toISOString() : `${value} s`;
}
