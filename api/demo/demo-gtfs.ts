/**
 * The invented Highpass Valley Transit Authority's timetable as a GTFS Schedule feed (gtfs.org
 * reference: agency, stops, routes, calendar, shapes, trips with block_id, stop_times), written
 * from the demo routes (api/demo/demo-network.ts) and the demo service days' blocks
 * (api/demo/demo-service-days.ts): weekday service WKD (Monday to Friday) and Sunday service SUN.
 * Each route's long name is the demo route's name, so `POST /api/service-days/gtfs-blocks` finds
 * the seeded routes by name. Trips leave 15 minutes after the block's pull-out, one every
 * headway, outbound (direction_id 0, the route's drawn order) then inbound; running times are the
 * distance at an assumed 24 km/h between stops plus each stop's dwell.
 *
 * Everything here is invented for the demo. `scripts/make-demo-gtfs.ts` writes it to
 * data/demo-gtfs.zip; spec/api/demo/demo-gtfs.spec.ts keeps that file equal to what this makes.
 */
import JSZip from 'jszip';
import { demoRouteDesign } from './demo-network';
import { SUNDAY_BLOCKS, WEEKDAY_BLOCKS, type DemoBlock } from './demo-service-days';

export const DEMO_GTFS_FILE = 'data/demo-gtfs.zip';

const SPEED_MPS = 24 / 3.6;
const ROUTES = [
  { gtfsId: 'VAL', key: 'demo-route:valley-line', block: 'valley' as const, type: 3 },
  { gtfsId: 'PAS', key: 'demo-route:pass-line', block: 'pass' as const, type: 3 },
];

/** The feed's text files, by name. */
export function demoGtfsFiles(): Record<string, string> {
  const stops = new Map<string, { id: string; lat: number; lon: number }>();
  const stopId = (name: string, lon: number, lat: number) => {
    const existing = stops.get(name);
    if (existing) return existing.id;
    const id = `S${String(stops.size + 1).padStart(2, '0')}`;
    stops.set(name, { id, lat, lon });
    return id;
  };
  const shapes: string[] = [];
  const trips: string[] = [];
  const stopTimes: string[] = [];
  const routes: string[] = [];

  for (const route of ROUTES) {
    const design = demoRouteDesign(route.key);
    routes.push(csvRow(route.gtfsId, 'HVTA', '', design.name, route.type));
    for (const direction of ['0', '1'] as const) {
      const order = design.coordinates.map((_, i) => i);
      if (direction === '1') order.reverse();
      const shapeId = `${route.gtfsId}-${direction}`;
      order.forEach((index, sequence) => {
        const [lon, lat] = design.coordinates[index]!;
        shapes.push(csvRow(shapeId, lat.toFixed(6), lon.toFixed(6), sequence + 1));
      });
    }
    const blocks = (service: string, list: DemoBlock[]) => {
      for (const block of list.filter((candidate) => candidate.route === route.block)) {
        for (let i = 0; i < block.roundTrips * 2; i++) {
          const direction = i % 2 === 0 ? '0' : '1';
          const tripId = `${service}-${block.blockId}-${String(i + 1).padStart(2, '0')}`;
          trips.push(csvRow(route.gtfsId, service, tripId, direction, `${route.gtfsId}-${direction}`, block.blockId));
          let clock = block.pullOutS + 15 * 60 + i * block.headwayS;
          const order = design.coordinates.map((_, index) => index);
          if (direction === '1') order.reverse();
          let sequence = 0;
          let previous: number | undefined;
          for (const index of order) {
            if (previous !== undefined) clock += metres(design.coordinates[previous]!, design.coordinates[index]!) / SPEED_MPS;
            previous = index;
            const name = design.stopNames[index];
            if (!name) continue;
            const [lon, lat] = design.coordinates[index]!;
            const first = sequence === 0;
            const dwell = first ? 0 : (design.stopsAtWaypoints[index] ?? 0);
            const arrival = Math.round(clock);
            clock += dwell;
            stopTimes.push(csvRow(tripId, hms(arrival), hms(Math.round(clock)), stopId(name, lon, lat), ++sequence));
          }
        }
      }
    };
    blocks('WKD', WEEKDAY_BLOCKS);
    blocks('SUN', SUNDAY_BLOCKS);
  }

  return {
    'agency.txt': lines('agency_id,agency_name,agency_url,agency_timezone,agency_lang', [
      csvRow('HVTA', 'Highpass Valley Transit Authority (invented demo)', 'https://highpass-valley.example/', 'Europe/Zurich', 'en'),
    ]),
    'stops.txt': lines(
      'stop_id,stop_name,stop_lat,stop_lon',
      [...stops.entries()].map(([name, stop]) => csvRow(stop.id, name, stop.lat.toFixed(6), stop.lon.toFixed(6))),
    ),
    'routes.txt': lines('route_id,agency_id,route_short_name,route_long_name,route_type', routes),
    'calendar.txt': lines('service_id,monday,tuesday,wednesday,thursday,friday,saturday,sunday,start_date,end_date', [
      csvRow('WKD', 1, 1, 1, 1, 1, 0, 0, '20260101', '20261231'),
      csvRow('SUN', 0, 0, 0, 0, 0, 0, 1, '20260101', '20261231'),
    ]),
    'shapes.txt': lines('shape_id,shape_pt_lat,shape_pt_lon,shape_pt_sequence', shapes),
    'trips.txt': lines('route_id,service_id,trip_id,direction_id,shape_id,block_id', trips),
    'stop_times.txt': lines('trip_id,arrival_time,departure_time,stop_id,stop_sequence', stopTimes),
  };
}

/** The feed as a zip archive (fixed dates, so the same input makes the same bytes). */
export async function demoGtfsZip(): Promise<Buffer> {
  const zip = new JSZip();
  const date = new Date(Date.UTC(2026, 0, 1));
  for (const [name, text] of Object.entries(demoGtfsFiles())) zip.file(name, text, { date });
  return zip.generateAsync({ type: 'nodebuffer', compression: 'DEFLATE', platform: 'UNIX' });
}

function csvRow(...values: (string | number)[]): string {
  return values
    .map((value) => (typeof value === 'string' && /[",\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : String(value)))
    .join(',');
}

function lines(header: string, rows: string[]): string {
  return `${[header, ...rows].join('\n')}\n`;
}

function hms(seconds: number): string {
  const pad = (value: number) => String(Math.floor(value)).padStart(2, '0');
  return `${pad(seconds / 3600)}:${pad((seconds % 3600) / 60)}:${pad(seconds % 60)}`;
}

/** Great-circle distance (m) between two [lon, lat] positions, spherical Earth of radius 6 371 km. */
function metres(a: readonly number[], b: readonly number[]): number {
  const rad = Math.PI / 180;
  const dLat = (b[1]! - a[1]!) * rad;
  const dLon = (b[0]! - a[0]!) * rad;
  const h = Math.sin(dLat / 2) ** 2 + Math.cos(a[1]! * rad) * Math.cos(b[1]! * rad) * Math.sin(dLon / 2) ** 2;
  return 2 * 6_371_000 * Math.asin(Math.sqrt(h));
}
