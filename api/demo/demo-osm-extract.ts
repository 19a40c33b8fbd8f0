/**
 * An invented OpenStreetMap extract of the invented Korvel valley demo region, as OSM XML 0.6:
 * the towns and villages, the valley and pass roads the demo lines run on (sharing their exact
 * vertices, so a route drawn on them follows the roads), town streets with a one-way street, a
 * bus-only link and a pedestrian street, forest tracks and footpaths, the tram line, the Korvel
 * and Orr rivers with their streams, Lindmoor Lake, forests, fields, meadows, rock and the
 * Skarnfeld ski area. Entirely made up and deterministic (no randomness): the same code always
 * writes the same file. The demo seed imports it through the same pipeline as an upload.
 */
import { designPassRoad, DEMO_TERRAIN_GRID, generateDemoTerrain } from './demo-terrain-model';
import { lonLat, ridgeCrestNorth, southValleyNorth, type Local } from './demo-geography';

type Tags = Record<string, string>;

/** Builds OSM XML; untagged nodes at the same local point are one node (that is how ways join). */
class OsmWriter {
  private readonly nodes: Array<{ id: number; at: [number, number]; tags: Tags }> = [];
  private readonly ways: Array<{ id: number; refs: number[]; tags: Tags }> = [];
  private readonly byPoint = new Map<string, number>();
  private nextNodeId = 1;
  private nextWayId = 1;

  node(at: Local, tags: Tags = {}): number {
    const key = `${Math.round(at[0] * 10)}:${Math.round(at[1] * 10)}`;
    const existing = this.byPoint.get(key);
    if (existing !== undefined) {
      if (Object.keys(tags).length > 0) Object.assign(this.nodes[existing - 1]!.tags, tags);
      return existing;
    }
    const id = this.nextNodeId++;
    this.nodes.push({ id, at: lonLat(at), tags: { ...tags } });
    this.byPoint.set(key, id);
    return id;
  }

  /** A free-standing point (a place label) that joins no way. */
  point(at: Local, tags: Tags): void {
    const id = this.nextNodeId++;
    this.nodes.push({ id, at: lonLat(at), tags });
  }

  way(points: readonly Local[], tags: Tags): void {
    this.ways.push({ id: this.nextWayId++, refs: points.map((point) => this.node(point)), tags });
  }

  /** A closed way: the outline's first point repeated at its end. */
  area(outline: readonly Local[], tags: Tags): void {
    const refs = outline.map((point) => this.node(point));
    this.ways.push({ id: this.nextWayId++, refs: [...refs, refs[0]!], tags });
  }

  toXml(): string {
    const escape = (text: string) => text.replace(/&/g, '&amp;').replace(/</g, '&lt;').replace(/"/g, '&quot;');
    const tagLines = (tags: Tags) => Object.entries(tags).map(([k, v]) => `    <tag k="${escape(k)}" v="${escape(v)}"/>`);
    const lines = ['<?xml version="1.0" encoding="UTF-8"?>', '<osm version="0.6" generator="Descentry demo region (invented data)">'];
    for (const node of this.nodes) {
      const open = `  <node id="${node.id}" version="1" lat="${node.at[1].toFixed(7)}" lon="${node.at[0].toFixed(7)}"`;
      const tags = tagLines(node.tags);
      lines.push(tags.length === 0 ? `${open}/>` : `${open}>`, ...tags, ...(tags.length ? ['  </node>'] : []));
    }
    for (const way of this.ways) {
      lines.push(
        `  <way id="${way.id}" version="1">`,
        ...way.refs.map((ref) => `    <nd ref="${ref}"/>`),
        ...tagLines(way.tags),
        '  </way>',
      );
    }
    lines.push('</osm>', '');
    return lines.join('\n');
  }
}

/** Points along the southern valley's axis from `fromEast` to `toEast`, offset north by `offsetM`. */
function alongValley(fromEast: number, toEast: number, offsetM: number, stepM = 400): Local[] {
  const points: Local[] = [];
  const count = Math.max(1, Math.round(Math.abs(toEast - fromEast) / stepM));
  for (let i = 0; i <= count; i++) {
    const east = fromEast + ((toEast - fromEast) * i) / count;
    points.push([east, southValleyNorth(east) + offsetM]);
  }
  return points;
}

/** A band between two offsets from the valley axis, as a closed outline. */
function valleyBand(fromEast: number, toEast: number, southOffsetM: number, northOffsetM: number): Local[] {
  return [...alongValley(fromEast, toEast, southOffsetM, 300), ...alongValley(toEast, fromEast, northOffsetM, 300)];
}

/** An ellipse outline (24 points). */
function ellipse([east, north]: Local, radiusEastM: number, radiusNorthM: number): Local[] {
  return Array.from({ length: 24 }, (_, i) => {
    const angle = (2 * Math.PI * i) / 24;
    return [Math.round(east + radiusEastM * Math.cos(angle)), Math.round(north + radiusNorthM * Math.sin(angle))] as Local;
  });
}

/** A band below the ridge crest: from `belowM` to `aboveM` metres south (negative: north) of it. */
function ridgeBand(fromEast: number, toEast: number, southEdgeM: number, northEdgeM: number, waveM = 0): Local[] {
  const edge = (offsetM: number, reverse: boolean) => {
    const points: Local[] = [];
    for (let east = fromEast; east <= toEast; east += 400)
      points.push([east, ridgeCrestNorth(east) + offsetM + waveM * Math.sin(east / 700)]);
    return reverse ? points.reverse() : points;
  };
  return [...edge(southEdgeM, false), ...edge(northEdgeM, true)];
}

/** The point at `east` on the straight line from `a` to `b`. */
function onChord(a: Local, b: Local, east: number): Local {
  const t = (east - a[0]) / (b[0] - a[0]);
  return [east, Math.round((a[1] + t * (b[1] - a[1])) * 10) / 10];
}

let elevationGrid: Float32Array | null = null;
/** Elevation of the demo terrain at a local point (nearest cell), for the peaks' `ele`. */
function terrainElevationM([east, north]: Local): number {
  elevationGrid ??= generateDemoTerrain();
  const { widthPx, heightPx, pixelSizeM } = DEMO_TERRAIN_GRID;
  const col = Math.min(widthPx - 1, Math.max(0, Math.floor(east / pixelSizeM)));
  const row = Math.min(heightPx - 1, Math.max(0, Math.floor(heightPx - north / pixelSizeM)));
  return Math.round(elevationGrid[row * widthPx + col]!);
}

/** The invented extract as OSM XML. */
export function demoOsmExtractXml(): string {
  const osm = new OsmWriter();
  const pass = designPassRoad().vertices.map((vertex) => vertex.at);
  const svn = southValleyNorth;
  const westgate: Local = [500, svn(500)];
  const valleyEast: Local[] = [
    [8_000, svn(8_000)],
    [11_000, svn(11_000)],
    [14_500, svn(14_500)],
  ];

  // --- Roads the demo lines run on (their vertices are the lines' own waypoints) ---
  // Side streets join the chords between the lines' waypoints at extra (collinear) vertices.
  const millLaneFoot = onChord(westgate, pass[0]!, 1_900);
  const brennAlpFoot = onChord(valleyEast[0]!, valleyEast[1]!, 10_000);
  osm.way([westgate, millLaneFoot, pass[0]!], { highway: 'secondary', name: 'Westgate Road', ref: 'K1' });
  osm.way([pass[0]!, pass[1]!, pass[2]!], { highway: 'secondary', name: 'Brenn Road', ref: 'K1' });
  osm.way([pass[2]!, valleyEast[0]!, brennAlpFoot, valleyEast[1]!, valleyEast[2]!], {
    highway: 'secondary',
    name: 'Lindmoor Road',
    ref: 'K1',
  });
  osm.way(pass.slice(2, 8), { highway: 'primary', name: 'Korvel Pass Road', ref: 'K14' });
  osm.way(pass.slice(7), { highway: 'primary', name: 'Korvel Pass Road', ref: 'K14' });
  osm.node(pass[7]!, { mountain_pass: 'yes', name: 'Korvel Pass', ele: '1900' });
  // Lindmoor Upper: the tram's ramp has a road beside it.
  const lindmoorUpper: Local = [13_900, svn(13_900) + 1_150];
  osm.way([valleyEast[2]!, [14_200, svn(14_200) + 600], lindmoorUpper], { highway: 'tertiary', name: 'Upper Lindmoor Road' });
  // Skarnfeld: from the Skarnfeld turn (hairpin 5) to the lifts.
  osm.way([pass[8]!, [12_900, 8_200], [13_000, 7_500], [12_800, 6_900]], { highway: 'tertiary', name: 'Skarnfeld Road' });

  // --- Korvel town streets around the town square (2 500, 3 000) ---
  const square = pass[0]!;
  osm.way(
    [
      [1_900, 3_350],
      [2_200, 3_365],
      [2_500, 3_380],
      [3_100, 3_390],
    ],
    { highway: 'residential', name: 'Church Street' },
  );
  osm.way([[1_900, 3_350], millLaneFoot], { highway: 'residential', name: 'Mill Lane' });
  osm.way([[2_500, 3_380], square], { highway: 'residential', name: 'Market Street', oneway: 'yes' });
  osm.way([[3_100, 3_390], [3_100, svn(3_100) + 40], pass[1]!], { highway: 'residential', name: 'School Lane' });
  osm.way(
    [
      [2_200, 3_365],
      [2_200, 3_600],
    ],
    { highway: 'pedestrian', name: 'Arcade Walk' },
  );
  // Korvel Station: the tram stop south of the square, reached by a bus-only link.
  const station: Local = [2_500, svn(2_500) - 150];
  osm.way([square, [2_500, svn(2_500) - 145]], { highway: 'busway', name: 'Station Link' });
  osm.point([2_450, 3_150], { place: 'town', name: 'Korvel', population: '8400' });
  osm.point([450, svn(450) + 90], { place: 'village', name: 'Westgate', population: '1200' });
  osm.point([14_450, svn(14_450) + 140], { place: 'village', name: 'Lindmoor', population: '2100' });
  osm.point([lindmoorUpper[0] + 80, lindmoorUpper[1] + 60], { place: 'hamlet', name: 'Lindmoor Upper' });
  osm.point([8_900, 3_950], { place: 'hamlet', name: 'Upper Brenn' });
  osm.point([11_850, 11_260], { place: 'village', name: 'Orren', population: '900' });
  osm.point([12_850, 6_950], { place: 'locality', name: 'Skarnfeld' });

  // --- Orren streets ---
  const orren = pass[10]!;
  osm.way([orren, [12_300, 11_180], [12_700, 11_050]], { highway: 'residential', name: 'Green Lane' });
  osm.way([[11_400, 11_420], orren], { highway: 'residential', name: 'Orr Street' });

  // --- Tracks and paths ---
  osm.way(
    [
      [3_100, 3_390],
      [3_400, 4_300],
      [3_900, 5_200],
      [4_300, 6_100],
    ],
    { highway: 'track', name: 'Hollin Forest Track', tracktype: 'grade3' },
  );
  osm.way(
    [
      [4_300, 6_100],
      [4_500, 6_900],
      [4_600, ridgeCrestNorth(4_600)],
    ],
    { highway: 'path', name: 'Hollin Peak Path' },
  );
  osm.way([brennAlpFoot, [10_200, svn(10_000) + 300], [10_400, 4_300], [10_900, 5_200]], { highway: 'track', name: 'Brenn Alp Track' });
  osm.way([pass[7]!, [8_600, 8_250], [7_800, ridgeCrestNorth(7_800)]], { highway: 'path', name: 'Ridge Path' });

  // --- Tram line A along the south bank, and its ramp to Lindmoor Upper ---
  osm.way([station, ...alongValley(3_000, 13_500, -150, 500)], { railway: 'tram', name: 'Valley Tramway' });
  osm.way([[13_500, svn(13_500) - 150], lindmoorUpper], { railway: 'tram', name: 'Valley Tramway' });

  // --- Peaks on the ridge (elevations from the demo terrain) ---
  for (const [name, east] of [
    ['Hollin Peak', 4_600],
    ['Skarn', 14_300],
    ['Orrenhorn', 6_800],
  ] as const) {
    const at: Local = [east, ridgeCrestNorth(east)];
    osm.point(at, { natural: 'peak', name, ele: String(terrainElevationM(at)) });
  }

  // --- Water: the Korvel river (flows west), its streams, Lindmoor Lake, the Orr (flows east) ---
  osm.way(alongValley(16_000, 0, -310, 500), { waterway: 'river', name: 'Korvel' });
  for (const east of [1_200, 3_600, 6_400, 9_600, 12_200, 15_000]) {
    const top = ridgeCrestNorth(east) - 900;
    osm.way(
      [
        [east + 150, top],
        [east + 60, (top + svn(east)) / 2],
        [east, svn(east) - 310],
      ],
      { waterway: 'stream' },
    );
  }
  osm.area(ellipse([11_000, svn(11_000) - 420], 700, 220), { natural: 'water', water: 'lake', name: 'Lindmoor Lake' });
  osm.area(ellipse([13_350, 7_300], 90, 60), { natural: 'water', water: 'reservoir', name: 'Skarnfeld snow pond' });
  osm.way(
    [
      [6_000, 11_600],
      [8_000, 11_450],
      [10_000, 11_350],
      [11_700, 11_050],
      [13_500, 11_000],
      [16_000, 11_100],
    ],
    { waterway: 'river', name: 'Orr' },
  );

  // --- Land use ---
  osm.area(valleyBand(1_600, 3_500, -120, 700), { landuse: 'residential', name: 'Korvel' });
  osm.area(valleyBand(150, 950, -100, 350), { landuse: 'residential' });
  osm.area(valleyBand(13_800, 15_200, -100, 450), { landuse: 'residential' });
  osm.area(
    [
      [11_300, 10_950],
      [12_400, 10_950],
      [12_400, 11_450],
      [11_300, 11_450],
    ],
    { landuse: 'residential' },
  );
  osm.area(valleyBand(3_900, 4_500, -270, -180), { landuse: 'industrial', name: 'Korvel bus depot' });
  osm.area(valleyBand(0, 7_000, -1_300, -360), { landuse: 'farmland' });
  osm.area(valleyBand(7_400, 16_000, -1_300, -360), { landuse: 'farmland' });
  osm.area(valleyBand(3_600, 13_500, 150, 550), { landuse: 'meadow' });
  osm.area(ridgeBand(0, 16_000, -4_300, -1_700, 250), { landuse: 'forest', name: 'Hollin Forest' });
  osm.area(ridgeBand(0, 16_000, -1_700, -450, 150), { natural: 'grassland' });
  osm.area(ridgeBand(0, 6_800, -450, 500), { natural: 'bare_rock' });
  osm.area(ridgeBand(11_600, 16_000, -450, 500), { natural: 'scree' });
  osm.area(ridgeBand(4_000, 16_000, 900, 2_300, 200), { landuse: 'forest', name: 'Orr Forest' });
  osm.area(ellipse([12_800, 6_800], 1_100, 800), { landuse: 'winter_sports', name: 'Skarnfeld ski area' });

  return osm.toXml();
}
