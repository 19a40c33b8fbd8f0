/**
 * Shared geography of the invented Korvel valley demo region (api/demo/demo-terrain-model.ts):
 * local plan metres (east, north of the demo grid's south-west corner) to WGS 84, and the line
 * of the southern valley floor that the valley roads, the tram and the river follow.
 */
import proj4 from 'proj4';
import { DEMO_TERRAIN_GRID } from './demo-terrain-model';

/** Local plan coordinates: metres east and north of the demo grid's south-west corner. */
export type Local = [number, number];

/** UTM zone 32N on WGS 84 (EPSG:32632), the demo grid's CRS. */
const UTM_32N = '+proj=utm +zone=32 +datum=WGS84 +units=m +no_defs';
const toWgs84 = proj4(UTM_32N, 'EPSG:4326');

/** WGS 84 [longitude, latitude] of a local point, rounded to 1e-7° (the precision OpenStreetMap keeps). */
export function lonLat([east, north]: Local): [number, number] {
  const { originX, originY, heightPx, pixelSizeM } = DEMO_TERRAIN_GRID;
  const [lon, lat] = toWgs84.forward([originX + east, originY - heightPx * pixelSizeM + north]) as [number, number];
  return [round(lon, 7), round(lat, 7)];
}

/** Valley floor south of the ridge (the demo model's own shape): 700 m at Korvel, rising 0.6 % east. */
export function southFloorM(east: number): number {
  return 700 + 0.006 * (east - 2500);
}

/** Northing of the southern valley's axis at `east`, m. */
export function southValleyNorth(east: number): number {
  return 3000 + 120 * Math.sin(east / 2200);
}

/** Northing of the ridge crest between the two valleys at `east`, m. */
export function ridgeCrestNorth(east: number): number {
  return 8000 + 500 * Math.sin(east / 2600);
}

function round(value: number, digits: number): number {
  const factor = 10 ** digits;
  return Math.round(value * factor) / factor;
}
