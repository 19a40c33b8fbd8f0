/**
 * Reads a GTFS feed (gtfs.org Schedule reference) into route drafts, one per GTFS route:
 *
 * - geometry: the route's most used shape (shapes.txt, by shape_pt_sequence);
 * - stops: the stop sequence of the first trip on that shape (stop_times.txt by stop_sequence,
 *   positions from stops.txt), dwell = departure_time − arrival_time, 20 s where they are equal
 *   or absent (from memory: 15–30 s at an urban stop);
 * - tripsPerDay: trips on the busiest weekday of calendar.txt (all trips without it), halved when
 *   the route runs both directions (a round trip is one trip each way);
 * - serviceDaysPerYear: weekdays with service × 365/7 (360 without calendar.txt).
 *
 * Every problem names the file and its line (line 1 is the header).
 */
import JSZip from 'jszip';
import Papa from 'papaparse';
import type { RoadRouteDraftInput } from '@shared/domain/road-routes';
import { ImportError } from './import-error';

type Row = Record<string, string>;
interface Table {
  file: string;
  rows: Row[];
}

const WEEKDAYS = ['monday', 'tuesday', 'wednesday', 'thursday', 'friday', 'saturday', 'sunday'] as const;
/** Dwell where the feed gives none, s (from memory: 15–30 s at an urban stop). */
const DEFAULT_DWELL_S = 20;

export async function gtfsToDrafts(fileName: string, data: Buffer): Promise<{ drafts: RoadRouteDraftInput[]; sources: string[] }> {
  let zip: JSZip;
  try {
    zip = await JSZip.loadAsync(data);
  } catch (error) {
    // JSZip rejects anything that is not a readable zip archive.
    throw new ImportError({ file: fileName }, `not a readable zip archive (${error instanceof Error ? error.message : String(error)})`);
  }
  const read = async (name: string, required: boolean, columns: string[]): Promise<Table | undefined> => {
    const entry = zip.file(name) ?? zip.file(new RegExp(`(^|/)${name.replace('.', '\\.')}$`))[0];
    if (!entry) {
      if (required) throw new ImportError({ file: `${fileName}/${name}` }, 'missing from the feed');
      return undefined;
    }
    const text = (await entry.async('string')).replace(/^\uFEFF/, '');
    const parsed = Papa.parse<Row>(text, { header: true, skipEmptyLines: 'greedy', transformHeader: (h) => h.trim() });
    const problem = parsed.errors[0];
    if (problem) {
      throw new ImportError({ file: name, line: problem.row === undefined ? undefined : problem.row + 2 }, problem.message);
    }
    const header = parsed.meta.fields ?? [];
    for (const column of columns) {
      if (!header.includes(column)) throw new ImportError({ file: name, line: 1, field: column }, `required column "${column}" is missing`);
    }
    return { file: name, rows: parsed.data };
  };

  const shapes = (await read('shapes.txt', true, ['shape_id', 'shape_pt_lat', 'shape_pt_lon', 'shape_pt_sequence']))!;
  const stopsTable = (await read('stops.txt', true, ['stop_id', 'stop_lat', 'stop_lon']))!;
  const stopTimes = (await read('stop_times.txt', true, ['trip_id', 'stop_id', 'stop_sequence']))!;
  const trips = (await read('trips.txt', true, ['route_id', 'service_id', 'trip_id', 'shape_id']))!;
  const routes = await read('routes.txt', false, ['route_id']);
  const calendar = await read('calendar.txt', false, ['service_id', ...WEEKDAYS]);

  const shapePoints = new Map<string, { sequence: number; position: [number, number] }[]>();
  shapes.rows.forEach((row, index) => {
    const line = index + 2;
    const lat = number(shapes, row, 'shape_pt_lat', line, -90, 90);
    const lon = number(shapes, row, 'shape_pt_lon', line, -180, 180);
    const sequence = number(shapes, row, 'shape_pt_sequence', line, 0, Number.MAX_SAFE_INTEGER);
    const id = text(shapes, row, 'shape_id', line);
    const list = shapePoints.get(id) ?? [];
    list.push({ sequence, position: [lon, lat] });
    shapePoints.set(id, list);
  });

  const stopPositions = new Map<string, { name: string; lon: number; lat: number }>();
  stopsTable.rows.forEach((row, index) => {
    const line = index + 2;
    const id = text(stopsTable, row, 'stop_id', line);
    // Stations and entrances (location_type 1–4) carry no vehicle stop of their own.
    if ((row['location_type'] ?? '').trim() !== '' && row['location_type']!.trim() !== '0') return;
    stopPositions.set(id, {
      name: (row['stop_name'] ?? '').trim() || id,
      lat: number(stopsTable, row, 'stop_lat', line, -90, 90),
      lon: number(stopsTable, row, 'stop_lon', line, -180, 180),
    });
  });

  const timesByTrip = new Map<string, { sequence: number; stopId: string; dwellS: number; line: number }[]>();
  stopTimes.rows.forEach((row, index) => {
    const line = index + 2;
    const tripId = text(stopTimes, row, 'trip_id', line);
    const stopId = text(stopTimes, row, 'stop_id', line);
    const sequence = number(stopTimes, row, 'stop_sequence', line, 0, Number.MAX_SAFE_INTEGER);
    const arrival = clockS(stopTimes, row, 'arrival_time', line);
    const departure = clockS(stopTimes, row, 'departure_time', line);
    const dwell = arrival !== undefined && departure !== undefined && departure > arrival ? departure - arrival : DEFAULT_DWELL_S;
    const list = timesByTrip.get(tripId) ?? [];
    list.push({ sequence, stopId, dwellS: Math.min(dwell, 3_600), line });
    timesByTrip.set(tripId, list);
  });

  const serviceDays = new Map<string, boolean[]>();
  calendar?.rows.forEach((row, index) => {
    const line = index + 2;
    serviceDays.set(
      text(calendar, row, 'service_id', line),
      WEEKDAYS.map((day) => {
        const value = (row[day] ?? '').trim();
        if (value !== '0' && value !== '1') throw new ImportError({ file: calendar.file, line, field: day }, `must be 0 or 1, got "${value}"`);
        return value === '1';
      }),
    );
  });

  const tripsByRoute = new Map<string, { row: Row; line: number }[]>();
  trips.rows.forEach((row, index) => {
    const line = index + 2;
    const routeId = text(trips, row, 'route_id', line);
    const shapeId = text(trips, row, 'shape_id', line);
    if (!shapePoints.has(shapeId)) throw new ImportError({ file: trips.file, line, field: 'shape_id' }, `shape "${shapeId}" is not in shapes.txt`);
    const list = tripsByRoute.get(routeId) ?? [];
    list.push({ row, line });
    tripsByRoute.set(routeId, list);
  });
  if (tripsByRoute.size === 0) throw new ImportError({ file: trips.file }, 'no trips: nothing to import');

  const drafts: RoadRouteDraftInput[] = [];
  const sources: string[] = [];
  for (const [routeId, routeTrips] of tripsByRoute) {
    const shapeUse = new Map<string, number>();
    for (const { row } of routeTrips) shapeUse.set(row['shape_id']!.trim(), (shapeUse.get(row['shape_id']!.trim()) ?? 0) + 1);
    const [shapeId] = [...shapeUse.entries()].sort((a, b) => b[1] - a[1] || a[0].localeCompare(b[0]))[0]!;
    const points = [...shapePoints.get(shapeId)!].sort((a, b) => a.sequence - b.sequence);
    if (points.length < 2) throw new ImportError({ file: shapes.file, field: 'shape_id' }, `shape "${shapeId}" has fewer than two points`);

    const firstTrip = routeTrips.find(({ row }) => row['shape_id']!.trim() === shapeId)!;
    const tripId = firstTrip.row['trip_id']!.trim();
    const times = [...(timesByTrip.get(tripId) ?? [])].sort((a, b) => a.sequence - b.sequence);
    const stops = times.map((time) => {
      const stop = stopPositions.get(time.stopId);
      if (!stop) throw new ImportError({ file: stopTimes.file, line: time.line, field: 'stop_id' }, `stop "${time.stopId}" is not in stops.txt`);
      return { name: stop.name.slice(0, 120), lon: stop.lon, lat: stop.lat, dwellS: time.dwellS };
    });

    const directions = new Set(routeTrips.map(({ row }) => (row['direction_id'] ?? '').trim() || '0'));
    let tripsPerDay: number;
    let serviceDaysPerYear = 360;
    if (calendar) {
      const perWeekday = WEEKDAYS.map((_, day) => routeTrips.filter(({ row }) => serviceDays.get(row['service_id']!.trim())?.[day]).length);
      tripsPerDay = Math.max(...perWeekday);
      const activeDays = perWeekday.filter((count) => count > 0).length;
      serviceDaysPerYear = Math.min(366, Math.round((activeDays * 365) / 7));
    } else {
      tripsPerDay = routeTrips.length;
    }
    if (directions.size > 1) tripsPerDay /= 2;

    const route = routes?.rows.find((row) => (row['route_id'] ?? '').trim() === routeId);
    const name = [route?.['route_short_name'], route?.['route_long_name']].map((part) => (part ?? '').trim()).filter(Boolean).join(' – ');
    const routeType = (route?.['route_type'] ?? '3').trim();
    drafts.push({
      name: (name || `GTFS route ${routeId}`).slice(0, 120),
      description: `Imported from ${fileName} (GTFS route ${routeId}, shape ${shapeId})`.slice(0, 2_000),
      mode: routeType === '0' ? 'tram' : routeType === '11' ? 'trolleybus' : 'bus',
      geometry: { type: 'LineString', coordinates: points.map((point) => point.position) },
      stops,
      tripsPerDay: Math.min(500, tripsPerDay),
      serviceDaysPerYear,
    });
    sources.push(`trips.txt line ${firstTrip.line} (route ${routeId}, shape ${shapeId})`);
  }
  return { drafts, sources };
}

function text(table: Table, row: Row, column: string, line: number): string {
  const value = (row[column] ?? '').trim();
  if (!value) throw new ImportError({ file: table.file, line, field: column }, 'is empty');
  return value;
}

function number(table: Table, row: Row, column: string, line: number, min: number, max: number): number {
  const raw = (row[column] ?? '').trim();
  const value = Number(raw);
  if (raw === '' || !Number.isFinite(value) || value < min || value > max) {
    throw new ImportError({ file: table.file, line, field: column }, `must be a number in ${min}…${max}, got "${raw}"`);
  }
  return value;
}

/** GTFS times are H:MM:SS or HH:MM:SS and may pass 24:00:00; empty means not timed. */
function clockS(table: Table, row: Row, column: string, line: number): number | undefined {
  const raw = (row[column] ?? '').trim();
  if (!raw) return undefined;
  const match = /^(\d{1,3}):([0-5]\d):([0-5]\d)$/.exec(raw);
  if (!match) throw new ImportError({ file: table.file, line, field: column }, `must be HH:MM:SS, got "${raw}"`);
  return Number(match[1]) * 3600 + Number(match[2]) * 60 + Number(match[3]);
}
