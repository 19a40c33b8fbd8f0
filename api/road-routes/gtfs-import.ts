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
 * The feed is streamed: the zip entry by entry (yauzl), each file row by row (papaparse's
 * streaming mode), and only what the drafts need is kept (the trips are tallied per route as
 * they pass; only the chosen shapes' points, the chosen trips' stop times and their stops stay).
 * Memory therefore depends on the routes imported, not on the size of the feed. A feed past a
 * bound (entries, a file's or the whole feed's unpacked size, a file's rows) is refused with 413
 * naming the file and the limit, before or as soon as the bound is passed.
 *
 * Every other problem names the file and its line (line 1 is the header).
 */
import type { Readable } from 'node:stream';
import Papa from 'papaparse';
import yauzl, { type Entry, type ZipFile } from 'yauzl';
import { STOP_DWELL_S } from '@shared/domain/limits';
import type { RoadRouteDraftInput } from '@shared/domain/road-routes';
import { HttpError } from '../http/http-error';
import { ImportError } from './import-error';

type Row = Record<string, string>;

const WEEKDAYS = ['monday', 'tuesday', 'wednesday', 'thursday', 'friday', 'saturday', 'sunday'] as const;
/** Dwell where the feed gives none, s: the stops' default (shared/domain/limits.ts). */
const DEFAULT_DWELL_S = STOP_DWELL_S.default;

const MIB = 1024 * 1024;

/**
 * Bounds on one feed. GTFS defines about 30 files, so 100 entries is generous; a mountain
 * authority's feed unpacks to tens of megabytes (common practice: a mid-size city's stop_times.txt
 * is a few million rows, 100–300 MB).
 */
export const GTFS_LIMITS = {
  maxEntries: 100,
  maxEntryBytes: 256 * MIB,
  maxTotalBytes: 1024 * MIB,
  maxRows: {
    'shapes.txt': 3_000_000,
    'stop_times.txt': 6_000_000,
    'trips.txt': 1_000_000,
    'stops.txt': 500_000,
    'routes.txt': 20_000,
    'calendar.txt': 100_000,
  },
  /**
   * Points one imported shape may have: a 300 km line (the longest route one analysis takes) at
   * a point every 3 m. A saved route with more could not be edited in the browser anyway.
   */
  maxShapePoints: 100_000,
} as const;

type FeedFile = keyof typeof GTFS_LIMITS.maxRows;

/** 413 for a feed past one of the bounds, naming the file and the limit. */
export class FeedTooLargeError extends HttpError {
  constructor(file: string, problem: string, limit: string) {
    super(413, 'feed_too_large', `${file}: ${problem}; the limit is ${limit}`, { file, limit });
  }
}

/** One route's trips, tallied as trips.txt streams past. */
interface RouteTally {
  /** Trips per shape, and the first trip on each shape with its line. */
  shapes: Map<string, { trips: number; firstTrip: string; line: number }>;
  directions: Set<string>;
  /** Trips per weekday (Monday first) of the services in calendar.txt. */
  perWeekday: number[];
  trips: number;
}

export async function gtfsToDrafts(fileName: string, data: Buffer): Promise<{ drafts: RoadRouteDraftInput[]; sources: string[] }> {
  const feed = await openFeed(fileName, data);
  try {
    for (const name of ['shapes.txt', 'stops.txt', 'stop_times.txt', 'trips.txt'] as const) {
      if (!feed.entries.has(name)) throw new ImportError({ file: `${fileName}/${name}` }, 'missing from the feed');
    }

    // calendar.txt: which weekdays each service runs.
    let serviceDays: Map<string, boolean[]> | undefined;
    if (feed.entries.has('calendar.txt')) {
      const days = new Map<string, boolean[]>();
      await feed.stream('calendar.txt', ['service_id', ...WEEKDAYS], (row, line, file) => {
        days.set(
          text(file, row, 'service_id', line),
          WEEKDAYS.map((day) => {
            const value = (row[day] ?? '').trim();
            if (value !== '0' && value !== '1') throw new ImportError({ file, line, field: day }, `must be 0 or 1, got "${value}"`);
            return value === '1';
          }),
        );
      });
      serviceDays = days;
    }

    // trips.txt: tallied per route; the first line naming each shape is kept to report a missing one.
    const tallies = new Map<string, RouteTally>();
    const shapeFirstUse = new Map<string, number>();
    await feed.stream('trips.txt', ['route_id', 'service_id', 'trip_id', 'shape_id'], (row, line, file) => {
      const routeId = text(file, row, 'route_id', line);
      const shapeId = text(file, row, 'shape_id', line);
      const tripId = (row['trip_id'] ?? '').trim();
      if (!shapeFirstUse.has(shapeId)) shapeFirstUse.set(shapeId, line);
      let tally = tallies.get(routeId);
      if (!tally) {
        tally = { shapes: new Map(), directions: new Set(), perWeekday: new Array<number>(7).fill(0), trips: 0 };
        tallies.set(routeId, tally);
      }
      const onShape = tally.shapes.get(shapeId);
      if (onShape) onShape.trips++;
      else tally.shapes.set(shapeId, { trips: 1, firstTrip: tripId, line });
      tally.directions.add((row['direction_id'] ?? '').trim() || '0');
      const days = serviceDays?.get((row['service_id'] ?? '').trim());
      if (days) days.forEach((runs, day) => runs && tally.perWeekday[day]!++);
      tally.trips++;
    });
    if (tallies.size === 0) throw new ImportError({ file: 'trips.txt' }, 'no trips: nothing to import');

    // Each route's most used shape (ties: the smallest id) and the first trip on it.
    const chosen = new Map<string, { shapeId: string; tripId: string; line: number }>();
    for (const [routeId, tally] of tallies) {
      const [shapeId, use] = [...tally.shapes.entries()].sort((a, b) => b[1].trips - a[1].trips || a[0].localeCompare(b[0]))[0]!;
      chosen.set(routeId, { shapeId, tripId: use.firstTrip, line: use.line });
    }
    const chosenShapes = new Set([...chosen.values()].map((choice) => choice.shapeId));
    const chosenTrips = new Set([...chosen.values()].map((choice) => choice.tripId));

    // shapes.txt: every row checked, only the chosen shapes' points kept.
    const shapeIds = new Set<string>();
    const shapePoints = new Map<string, { sequence: number; position: [number, number] }[]>();
    await feed.stream('shapes.txt', ['shape_id', 'shape_pt_lat', 'shape_pt_lon', 'shape_pt_sequence'], (row, line, file) => {
      const lat = number(file, row, 'shape_pt_lat', line, -90, 90);
      const lon = number(file, row, 'shape_pt_lon', line, -180, 180);
      const sequence = number(file, row, 'shape_pt_sequence', line, 0, Number.MAX_SAFE_INTEGER);
      const id = text(file, row, 'shape_id', line);
      shapeIds.add(id);
      if (!chosenShapes.has(id)) return;
      let list = shapePoints.get(id);
      if (!list) shapePoints.set(id, (list = []));
      if (list.length >= GTFS_LIMITS.maxShapePoints) {
        const limit = `${GTFS_LIMITS.maxShapePoints.toLocaleString('en')} points per shape`;
        throw new FeedTooLargeError(file, `shape "${id}" has more than ${GTFS_LIMITS.maxShapePoints.toLocaleString('en')} points`, limit);
      }
      list.push({ sequence, position: [lon, lat] });
    });
    const missingShape = [...shapeFirstUse].filter(([id]) => !shapeIds.has(id)).sort((a, b) => a[1] - b[1])[0];
    if (missingShape) {
      throw new ImportError(
        { file: 'trips.txt', line: missingShape[1], field: 'shape_id' },
        `shape "${missingShape[0]}" is not in shapes.txt`,
      );
    }

    // stop_times.txt: every row checked, only the chosen trips' stop times kept.
    const timesByTrip = new Map<string, { sequence: number; stopId: string; dwellS: number; line: number }[]>();
    await feed.stream('stop_times.txt', ['trip_id', 'stop_id', 'stop_sequence'], (row, line, file) => {
      const tripId = text(file, row, 'trip_id', line);
      const stopId = text(file, row, 'stop_id', line);
      const sequence = number(file, row, 'stop_sequence', line, 0, Number.MAX_SAFE_INTEGER);
      const arrival = clockS(file, row, 'arrival_time', line);
      const departure = clockS(file, row, 'departure_time', line);
      if (!chosenTrips.has(tripId)) return;
      const dwell = arrival !== undefined && departure !== undefined && departure > arrival ? departure - arrival : DEFAULT_DWELL_S;
      let list = timesByTrip.get(tripId);
      if (!list) timesByTrip.set(tripId, (list = []));
      list.push({ sequence, stopId, dwellS: Math.min(dwell, 3_600), line });
    });
    const neededStops = new Set([...timesByTrip.values()].flatMap((times) => times.map((time) => time.stopId)));

    // stops.txt: every row checked, only the stops the chosen trips call at kept.
    const stopPositions = new Map<string, { name: string; lon: number; lat: number }>();
    await feed.stream('stops.txt', ['stop_id', 'stop_lat', 'stop_lon'], (row, line, file) => {
      const id = text(file, row, 'stop_id', line);
      // Stations and entrances (location_type 1–4) carry no vehicle stop of their own.
      if ((row['location_type'] ?? '').trim() !== '' && row['location_type']!.trim() !== '0') return;
      const lat = number(file, row, 'stop_lat', line, -90, 90);
      const lon = number(file, row, 'stop_lon', line, -180, 180);
      if (neededStops.has(id)) stopPositions.set(id, { name: (row['stop_name'] ?? '').trim() || id, lat, lon });
    });

    // routes.txt (optional): names and modes of the imported routes only.
    const routeRows = new Map<string, Row>();
    if (feed.entries.has('routes.txt')) {
      await feed.stream('routes.txt', ['route_id'], (row) => {
        const id = (row['route_id'] ?? '').trim();
        if (tallies.has(id)) routeRows.set(id, row);
      });
    }

    const drafts: RoadRouteDraftInput[] = [];
    const sources: string[] = [];
    for (const [routeId, tally] of tallies) {
      const { shapeId, tripId, line } = chosen.get(routeId)!;
      const points = [...(shapePoints.get(shapeId) ?? [])].sort((a, b) => a.sequence - b.sequence);
      if (points.length < 2)
        throw new ImportError({ file: 'shapes.txt', field: 'shape_id' }, `shape "${shapeId}" has fewer than two points`);
      const times = [...(timesByTrip.get(tripId) ?? [])].sort((a, b) => a.sequence - b.sequence);
      const stops = times.map((time) => {
        const stop = stopPositions.get(time.stopId);
        if (!stop)
          throw new ImportError({ file: 'stop_times.txt', line: time.line, field: 'stop_id' }, `stop "${time.stopId}" is not in stops.txt`);
        return { name: stop.name.slice(0, 120), lon: stop.lon, lat: stop.lat, dwellS: time.dwellS };
      });

      let tripsPerDay: number;
      let serviceDaysPerYear = 360;
      if (serviceDays) {
        tripsPerDay = Math.max(...tally.perWeekday);
        const activeDays = tally.perWeekday.filter((count) => count > 0).length;
        serviceDaysPerYear = Math.min(366, Math.round((activeDays * 365) / 7));
      } else {
        tripsPerDay = tally.trips;
      }
      if (tally.directions.size > 1) tripsPerDay /= 2;

      const route = routeRows.get(routeId);
      const name = gtfsRouteName(route);
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
      sources.push(`trips.txt line ${line} (route ${routeId}, shape ${shapeId})`);
    }
    return { drafts, sources };
  } finally {
    feed.close();
  }
}

interface OpenFeed {
  /** The feed's files by base name (a feed zipped inside a folder is accepted). */
  entries: Map<string, Entry>;
  /**
   * Streams one file row by row into `onRow` (line numbers count the header as line 1), after
   * checking its header has `columns`; refuses the file past its row or byte bound.
   */
  stream(name: FeedFile, columns: string[], onRow: (row: Row, line: number, file: string) => void): Promise<void>;
  close(): void;
}

/** Opens the zip and checks its directory against the bounds before any file is unpacked. */
async function openFeed(fileName: string, data: Buffer): Promise<OpenFeed> {
  let zip: ZipFile;
  try {
    zip = await new Promise<ZipFile>((resolve, reject) =>
      yauzl.fromBuffer(data, { lazyEntries: true, validateEntrySizes: true, decodeStrings: true }, (error, opened) =>
        error ? reject(error) : resolve(opened),
      ),
    );
  } catch (error) {
    // yauzl rejects anything that is not a readable zip archive.
    throw new ImportError({ file: fileName }, `not a readable zip archive (${error instanceof Error ? error.message : String(error)})`);
  }
  if (zip.entryCount > GTFS_LIMITS.maxEntries) {
    zip.close();
    throw new FeedTooLargeError(fileName, `the archive holds ${zip.entryCount} entries`, `${GTFS_LIMITS.maxEntries} entries`);
  }
  const entries = new Map<string, Entry>();
  let declaredTotal = 0;
  try {
    await new Promise<void>((resolve, reject) => {
      zip.on('entry', (entry: Entry) => {
        const name = entry.fileName;
        if (!name.endsWith('/')) {
          declaredTotal += entry.uncompressedSize;
          const base = name.slice(name.lastIndexOf('/') + 1);
          if (entry.uncompressedSize > GTFS_LIMITS.maxEntryBytes) {
            reject(
              new FeedTooLargeError(
                name,
                `unpacks to ${formatMiB(entry.uncompressedSize)}`,
                `${formatMiB(GTFS_LIMITS.maxEntryBytes)} per file`,
              ),
            );
            return;
          }
          if (declaredTotal > GTFS_LIMITS.maxTotalBytes) {
            reject(
              new FeedTooLargeError(
                fileName,
                `its files unpack to more than ${formatMiB(GTFS_LIMITS.maxTotalBytes)}`,
                `${formatMiB(GTFS_LIMITS.maxTotalBytes)} in all`,
              ),
            );
            return;
          }
          // A file at the top of the archive wins over one of the same name in a folder.
          if (!entries.has(base) || !name.includes('/')) entries.set(base, entry);
        }
        zip.readEntry();
      });
      zip.once('end', resolve);
      zip.once('error', reject);
      zip.readEntry();
    });
  } catch (error) {
    zip.close();
    if (error instanceof HttpError) throw error;
    // A damaged directory (yauzl names the problem).
    throw new ImportError({ file: fileName }, `not a readable zip archive (${error instanceof Error ? error.message : String(error)})`);
  }

  return {
    entries,
    close: () => zip.close(),
    async stream(name, columns, onRow) {
      const entry = entries.get(name)!;
      if (entry.isEncrypted()) throw new ImportError({ file: name }, 'is encrypted; send the feed without a password');
      const input = await new Promise<Readable>((resolve, reject) =>
        zip.openReadStream(entry, (error, stream) => (error ? reject(error) : resolve(stream))),
      );
      await parseRows(name, input, columns, GTFS_LIMITS.maxRows[name], onRow);
    },
  };
}

/**
 * papaparse's streaming mode over one unpacked file: rows arrive one at a time through `step`,
 * the first problem (a malformed row, a bad value thrown by `onRow`, a bound passed) aborts the
 * parse and destroys the stream, so nothing more is unpacked.
 */
function parseRows(
  file: string,
  input: Readable,
  columns: string[],
  maxRows: number,
  onRow: (row: Row, line: number, file: string) => void,
): Promise<void> {
  return new Promise<void>((resolve, reject) => {
    let rows = 0;
    let bytes = 0;
    let failure: unknown;
    let headerChecked = false;
    const fail = (error: unknown, parser?: Papa.Parser) => {
      if (failure) return;
      failure = error;
      parser?.abort();
      input.destroy();
      reject(error);
    };
    input.on('data', (chunk: Buffer) => {
      bytes += chunk.length;
      if (bytes > GTFS_LIMITS.maxEntryBytes) {
        fail(
          new FeedTooLargeError(
            file,
            `unpacks to more than ${formatMiB(GTFS_LIMITS.maxEntryBytes)}`,
            `${formatMiB(GTFS_LIMITS.maxEntryBytes)} per file`,
          ),
        );
      }
    });
    input.once('error', (error) => fail(new ImportError({ file }, `could not be unpacked (${error.message})`)));
    Papa.parse<Row>(input as unknown as File, {
      header: true,
      skipEmptyLines: 'greedy',
      transformHeader: (header) => header.replace(/^\uFEFF/, '').trim(),
      step: (results, parser) => {
        if (failure) return;
        try {
          if (!headerChecked) {
            headerChecked = true;
            const header = results.meta.fields ?? [];
            for (const column of columns) {
              if (!header.includes(column))
                throw new ImportError({ file, line: 1, field: column }, `required column "${column}" is missing`);
            }
          }
          rows++;
          const line = rows + 1;
          const problem = results.errors[0];
          if (problem) throw new ImportError({ file, line }, problem.message);
          if (rows > maxRows)
            throw new FeedTooLargeError(file, `has more than ${maxRows.toLocaleString('en')} rows`, `${maxRows.toLocaleString('en')} rows`);
          onRow(results.data, line, file);
        } catch (error) {
          fail(error, parser);
        }
      },
      complete: () => {
        if (!failure) resolve();
      },
      error: (error: Error) => fail(new ImportError({ file }, error.message)),
    });
  });
}

function formatMiB(bytes: number): string {
  return bytes >= 1024 * MIB ? `${(bytes / (1024 * MIB)).toFixed(1)} GiB` : `${Math.ceil(bytes / MIB)} MiB`;
}

function text(file: string, row: Row, column: string, line: number): string {
  const value = (row[column] ?? '').trim();
  if (!value) throw new ImportError({ file, line, field: column }, 'is empty');
  return value;
}

function number(file: string, row: Row, column: string, line: number, min: number, max: number): number {
  const raw = (row[column] ?? '').trim();
  const value = Number(raw);
  if (raw === '' || !Number.isFinite(value) || value < min || value > max) {
    throw new ImportError({ file, line, field: column }, `must be a number in ${min}…${max}, got "${raw}"`);
  }
  return value;
}

/** GTFS times are H:MM:SS or HH:MM:SS and may pass 24:00:00; empty means not timed. */
function clockS(file: string, row: Row, column: string, line: number): number | undefined {
  const raw = (row[column] ?? '').trim();
  if (!raw) return undefined;
  const match = /^(\d{1,3}):([0-5]\d):([0-5]\d)$/.exec(raw);
  if (!match) throw new ImportError({ file, line, field: column }, `must be HH:MM:SS, got "${raw}"`);
  return Number(match[1]) * 3600 + Number(match[2]) * 60 + Number(match[3]);
}

/** The name the import gives a GTFS route: "short – long" name, either alone, or empty. */
function gtfsRouteName(route: Row | undefined): string {
  return [route?.['route_short_name'], route?.['route_long_name']]
    .map((part) => (part ?? '').trim())
    .filter(Boolean)
    .join(' – ');
}

/** One trip of a GTFS block: what a service day's block needs from trips.txt and stop_times.txt. */
export interface GtfsBlockTrip {
  tripId: string;
  routeId: string;
  shapeId: string;
  directionId: string;
  blockId: string;
  /** First departure and last arrival of the trip, s after midnight of the service day. */
  departureS: number;
  arrivalS: number;
  /** Line of the trip in trips.txt (line 1 is the header). */
  line: number;
}

/**
 * The trips of one service_id that carry a block_id, with their first departure and last arrival
 * (stop_times.txt by stop_sequence), streamed and bounded like `gtfsToDrafts`. Trips of that
 * service without a block_id are counted, not kept.
 */
export async function gtfsBlockTrips(
  fileName: string,
  data: Buffer,
  serviceId: string,
): Promise<{ trips: GtfsBlockTrip[]; withoutBlock: number; routeNames: Map<string, string> }> {
  const feed = await openFeed(fileName, data);
  try {
    for (const name of ['stop_times.txt', 'trips.txt'] as const) {
      if (!feed.entries.has(name)) throw new ImportError({ file: `${fileName}/${name}` }, 'missing from the feed');
    }
    const trips = new Map<string, GtfsBlockTrip>();
    let withoutBlock = 0;
    let anyOfService = false;
    await feed.stream('trips.txt', ['route_id', 'service_id', 'trip_id', 'shape_id'], (row, line, file) => {
      if ((row['service_id'] ?? '').trim() !== serviceId) return;
      anyOfService = true;
      const blockId = (row['block_id'] ?? '').trim();
      if (!blockId) {
        withoutBlock++;
        return;
      }
      const tripId = text(file, row, 'trip_id', line);
      trips.set(tripId, {
        tripId,
        routeId: text(file, row, 'route_id', line),
        shapeId: text(file, row, 'shape_id', line),
        directionId: (row['direction_id'] ?? '').trim() || '0',
        blockId,
        departureS: Number.NaN,
        arrivalS: Number.NaN,
        line,
      });
    });
    if (!anyOfService) throw new ImportError({ file: 'trips.txt', field: 'service_id' }, `no trip runs on service "${serviceId}"`);
    const first = new Map<string, number>();
    const last = new Map<string, number>();
    await feed.stream('stop_times.txt', ['trip_id', 'stop_sequence'], (row, line, file) => {
      const trip = trips.get((row['trip_id'] ?? '').trim());
      if (!trip) return;
      const sequence = number(file, row, 'stop_sequence', line, 0, Number.MAX_SAFE_INTEGER);
      const departure = clockS(file, row, 'departure_time', line) ?? clockS(file, row, 'arrival_time', line);
      const arrival = clockS(file, row, 'arrival_time', line) ?? departure;
      if (departure !== undefined && sequence < (first.get(trip.tripId) ?? Number.POSITIVE_INFINITY)) {
        first.set(trip.tripId, sequence);
        trip.departureS = departure;
      }
      if (arrival !== undefined && sequence >= (last.get(trip.tripId) ?? Number.NEGATIVE_INFINITY)) {
        last.set(trip.tripId, sequence);
        trip.arrivalS = arrival;
      }
    });
    for (const trip of trips.values()) {
      if (!Number.isFinite(trip.departureS) || !Number.isFinite(trip.arrivalS)) {
        throw new ImportError(
          { file: 'stop_times.txt', field: 'departure_time' },
          `trip "${trip.tripId}" (trips.txt line ${trip.line}) has no timed stop`,
        );
      }
    }
    // routes.txt (optional): the names of the blocks' routes, as the route import names them.
    const routeNames = new Map<string, string>();
    if (feed.entries.has('routes.txt')) {
      const wanted = new Set([...trips.values()].map((trip) => trip.routeId));
      await feed.stream('routes.txt', ['route_id'], (row) => {
        const id = (row['route_id'] ?? '').trim();
        const name = gtfsRouteName(row);
        if (wanted.has(id) && name) routeNames.set(id, name);
      });
    }
    return { trips: [...trips.values()], withoutBlock, routeNames };
  } finally {
    feed.close();
  }
}

/** Each service_id of trips.txt, in order of first appearance, with its trips, trips with a block_id and blocks. */
export async function gtfsServices(
  fileName: string,
  data: Buffer,
): Promise<{ serviceId: string; trips: number; tripsWithBlock: number; blocks: number }[]> {
  const feed = await openFeed(fileName, data);
  try {
    if (!feed.entries.has('trips.txt')) throw new ImportError({ file: `${fileName}/trips.txt` }, 'missing from the feed');
    const services = new Map<string, { trips: number; tripsWithBlock: number; blocks: Set<string> }>();
    await feed.stream('trips.txt', ['service_id', 'trip_id'], (row, line, file) => {
      const serviceId = text(file, row, 'service_id', line);
      const service = services.get(serviceId) ?? { trips: 0, tripsWithBlock: 0, blocks: new Set<string>() };
      service.trips++;
      const blockId = (row['block_id'] ?? '').trim();
      if (blockId) {
        service.tripsWithBlock++;
        service.blocks.add(blockId);
      }
      services.set(serviceId, service);
    });
    return [...services.entries()].map(([serviceId, service]) => ({
      serviceId,
      trips: service.trips,
      tripsWithBlock: service.tripsWithBlock,
      blocks: service.blocks.size,
    }));
  } finally {
    feed.close();
  }
}
