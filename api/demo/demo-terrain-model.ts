/**
 * The invented demo region, "Korvel valley": a valley town at about 700 m, the Korvel pass at
 * 1 900 m reached by a switchback road with long 6–10 % grades, a village in the next valley to
 * the north at about 1 200 m, and the Skarnfeld ski slopes east of the pass. Entirely made up; it
 * is placed in UTM zone 32N (EPSG:32632) only so that it sits at a plausible alpine latitude.
 *
 * Deterministic: the same code always produces the same grid (seeded value noise, no Math.random).
 */

/** Grid of the demo model: 16 km × 12 km at 20 m. */
export const DEMO_TERRAIN_GRID = {
  epsg: 32632,
  originX: 612_000,
  originY: 5_172_000,
  pixelSizeM: 20,
  widthPx: 800,
  heightPx: 600,
  nodata: -9999,
} as const;

/** Local plan coordinates: metres east and north of the grid's south-west corner. */
type Local = [number, number];

/** A road of the demo region: plan vertices and the designed elevation at each vertex. */
export interface DemoRoadDesign {
  id: string;
  name: string;
  /** [east, north] metres from the south-west corner, with elevation in metres. */
  vertices: Array<{ at: Local; elevationM: number }>;
}

/**
 * The pass road as designed: the valley stretch from Korvel town, four switchback legs up the
 * south face (grades 6–8 %, 7.6 % up to the pass), the pass, and three legs down to Orren on the north side
 * (7, 8 and 7.4 %). Elevations at vertices; in between they vary linearly with distance.
 */
export function designPassRoad(): DemoRoadDesign {
  const plan: Array<{ at: Local; gradeToHere?: number; elevationM?: number }> = [
    { at: [2500, 3000], elevationM: 700 }, // Korvel town square
    { at: [4000, 3120], gradeToHere: 0.012 },
    { at: [5600, 3250], gradeToHere: 0.02 }, // foot of the climb
    { at: [8800, 3850], gradeToHere: 0.07 }, // hairpin 1
    { at: [5700, 4550], gradeToHere: 0.075 }, // hairpin 2
    { at: [8700, 5350], gradeToHere: 0.08 }, // hairpin 3
    { at: [6000, 6250], gradeToHere: 0.06 }, // hairpin 4
    { at: [9000, 8000], elevationM: 1900 }, // Korvel pass
    { at: [12400, 8900], gradeToHere: -0.07 }, // hairpin 5 (Skarnfeld turn)
    { at: [9400, 9900], gradeToHere: -0.08 }, // hairpin 6
    { at: [11800, 11150], elevationM: 1200 }, // Orren village
  ];
  const vertices: Array<{ at: Local; elevationM: number }> = [];
  let previous: { at: Local; elevationM: number } | null = null;
  for (const point of plan) {
    let elevationM: number;
    if (point.elevationM !== undefined) elevationM = point.elevationM;
    else elevationM = previous!.elevationM + point.gradeToHere! * distance(previous!.at, point.at);
    previous = { at: point.at, elevationM };
    vertices.push(previous);
  }
  return { id: 'korvel-pass-road', name: 'Korvel pass road (Korvel – Korvel pass – Orren)', vertices };
}

/** Named places of the demo region (local metres), for labels and tests. */
export const DEMO_PLACES: ReadonlyArray<{ name: string; at: Local; kind: 'town' | 'pass' | 'village' | 'ski-area' }> = [
  { name: 'Korvel', at: [2500, 3000], kind: 'town' },
  { name: 'Korvel pass', at: [9000, 8000], kind: 'pass' },
  { name: 'Orren', at: [11800, 11150], kind: 'village' },
  { name: 'Skarnfeld ski area', at: [12800, 6800], kind: 'ski-area' },
];

/** Row-major Float32 elevations, north row first, for DEMO_TERRAIN_GRID. */
export function generateDemoTerrain(): Float32Array {
  const { widthPx, heightPx, pixelSizeM } = DEMO_TERRAIN_GRID;
  const road = designPassRoad();
  const noise = valueNoise(20_260_601);
  const values = new Float32Array(widthPx * heightPx);
  const segments = road.vertices.slice(1).map((end, i) => ({ start: road.vertices[i]!, end }));

  for (let row = 0; row < heightPx; row++) {
    const north = (heightPx - row - 0.5) * pixelSizeM;
    for (let col = 0; col < widthPx; col++) {
      const east = (col + 0.5) * pixelSizeM;
      let z = naturalElevationM(east, north, noise);
      // The road is built into the slope: within 30 m the ground is the road's own elevation,
      // blending back to the natural slope over the next 450 m (cuttings and embankments).
      const nearest = nearestOnRoad(segments, east, north);
      if (nearest.distanceM < 480) {
        const t = Math.max(0, (nearest.distanceM - 30) / 450);
        const weight = 1 - t * t * (3 - 2 * t);
        z = weight * nearest.elevationM + (1 - weight) * z;
      }
      values[row * widthPx + col] = Math.round(z * 10) / 10;
    }
  }
  return values;
}

/** Elevation without the road: two valleys, a ridge with the pass saddle, ski slopes, noise. */
function naturalElevationM(east: number, north: number, noise: (x: number, y: number) => number): number {
  const southFloor = 700 + 0.006 * (east - 2500);
  const northFloor = 1200 + 0.012 * (11800 - east);
  const ridgeCrestN = 8000 + 500 * Math.sin(east / 2600);
  // Ridge height along the crest: 1 900 m at the pass saddle (x = 9 000 m), peaks either side.
  const ridge =
    1900 +
    900 * (1 - Math.exp(-(((east - 9000) / 1900) ** 2))) +
    180 * (Math.sin(east / 1100) - Math.sin(9000 / 1100)) * (1 - Math.exp(-(((east - 9000) / 900) ** 2)));
  let z: number;
  const southValleyN = 3000 + 120 * Math.sin(east / 2200);
  if (north <= southValleyN) {
    // South of the town: the opposite valley side rises gently.
    z = southFloor + 0.18 * (southValleyN - north) ** 1.1 * 0.35;
  } else if (north <= ridgeCrestN) {
    const t = (north - southValleyN) / (ridgeCrestN - southValleyN);
    z = southFloor + (ridge - southFloor) * (0.15 * t + 0.85 * t ** 1.35);
  } else {
    const northValleyN = 11150;
    const t = Math.min(1, (north - ridgeCrestN) / (northValleyN - ridgeCrestN));
    z = northFloor + (ridge - northFloor) * (1 - (0.2 * t + 0.8 * t ** 0.9));
    if (north > northValleyN) z = northFloor + 0.12 * (north - northValleyN);
  }
  // Skarnfeld: smooth, broad ski slopes east of the pass (noise damped there).
  const skiDistance = Math.hypot(east - 12800, north - 6800);
  const roughness = skiDistance < 1500 ? 0.25 + 0.75 * (skiDistance / 1500) : 1;
  const reliefShare = Math.min(1, Math.max(0.15, (z - 650) / 900));
  z +=
    roughness *
    reliefShare *
    (55 * noise(east / 1400, north / 1400) + 22 * noise(east / 420, north / 420) + 6 * noise(east / 130, north / 130));
  return z;
}

function nearestOnRoad(
  segments: Array<{ start: { at: Local; elevationM: number }; end: { at: Local; elevationM: number } }>,
  east: number,
  north: number,
): { distanceM: number; elevationM: number } {
  let best = { distanceM: Infinity, elevationM: 0 };
  for (const { start, end } of segments) {
    const [ax, ay] = start.at;
    const [bx, by] = end.at;
    const dx = bx - ax;
    const dy = by - ay;
    const t = Math.max(0, Math.min(1, ((east - ax) * dx + (north - ay) * dy) / (dx * dx + dy * dy)));
    const d = Math.hypot(east - (ax + t * dx), north - (ay + t * dy));
    if (d < best.distanceM) best = { distanceM: d, elevationM: start.elevationM + t * (end.elevationM - start.elevationM) };
  }
  return best;
}

/** Smooth 2-D value noise in [−1, 1] from a seeded hash (deterministic). */
function valueNoise(seed: number): (x: number, y: number) => number {
  const hash = (i: number, j: number) => {
    let h = (i * 374_761_393 + j * 668_265_263 + seed * 2_147_483_647) | 0;
    h = Math.imul(h ^ (h >>> 13), 1_274_126_177);
    h ^= h >>> 16;
    return ((h >>> 0) / 4_294_967_295) * 2 - 1;
  };
  return (x, y) => {
    const i = Math.floor(x);
    const j = Math.floor(y);
    const fx = x - i;
    const fy = y - j;
    const sx = fx * fx * (3 - 2 * fx);
    const sy = fy * fy * (3 - 2 * fy);
    const top = hash(i, j) * (1 - sx) + hash(i + 1, j) * sx;
    const bottom = hash(i, j + 1) * (1 - sx) + hash(i + 1, j + 1) * sx;
    return top * (1 - sy) + bottom * sy;
  };
}

function distance(a: Local, b: Local): number {
  return Math.hypot(b[0] - a[0], b[1] - a[1]);
}
