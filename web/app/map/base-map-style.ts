import {
  CenteredTextSymbolizer,
  LineLabelSymbolizer,
  LineSymbolizer,
  PolygonSymbolizer,
  type LabelRule,
  type PaintRule,
} from 'protomaps-leaflet';

/**
 * Descentry's own cartography for the base-map vector tiles (layers and properties as served by
 * /api/tiles/base, see shared/domain/basemap.ts): quiet, warm land tints so routes, stops and
 * warnings stay the loudest things on the map; water in a grey-blue; roads white with a warm
 * grey casing, the main roads in a pale sand; labels in the self-hosted Noto Sans with a halo.
 */
const PALETTE = {
  land: '#f4f1ea',
  forest: '#d3dcc4',
  grass: '#e2e7d2',
  farmland: '#ece6d3',
  residential: '#e9e2dc',
  commercial: '#eaded8',
  industrial: '#e1dcd6',
  rock: '#e0ddd8',
  glacier: '#eef3f5',
  winterSports: '#e6ebef',
  wetland: '#dde6e1',
  water: '#a9c3cf',
  waterLine: '#8fb0bf',
  casing: '#b9ada0',
  road: '#ffffff',
  mainRoad: '#f3dca8',
  mainCasing: '#c59f5f',
  track: '#9a8b78',
  path: '#8f8477',
  rail: '#7d7a78',
  tram: '#8a6f92',
  label: '#3b3632',
  waterLabel: '#3d6475',
  halo: '#fbfaf7',
} as const;

const FONT = '"Noto Sans", sans-serif';

const LANDUSE_FILLS: Record<string, string> = {
  forest: PALETTE.forest,
  grass: PALETTE.grass,
  scrub: PALETTE.grass,
  farmland: PALETTE.farmland,
  residential: PALETTE.residential,
  commercial: PALETTE.commercial,
  industrial: PALETTE.industrial,
  military: PALETTE.industrial,
  cemetery: PALETTE.grass,
  rock: PALETTE.rock,
  sand: PALETTE.farmland,
  glacier: PALETTE.glacier,
  winter_sports: PALETTE.winterSports,
  wetland: PALETTE.wetland,
};

const MAIN_ROADS = new Set(['motorway', 'trunk', 'primary', 'secondary']);
const STREETS = new Set(['tertiary', 'minor', 'busway', 'service']);

/** Road width in pixels by class and zoom: wider for main roads, growing as one zooms in. */
function roadWidth(zoom: number, roadClass: string): number {
  const base = MAIN_ROADS.has(roadClass) ? 1.6 : roadClass === 'tertiary' ? 1.3 : roadClass === 'service' ? 0.6 : 0.9;
  return base * Math.max(0.6, 1.45 ** (zoom - 12));
}

function classOf(feature: { props: Record<string, unknown> } | undefined): string {
  return String(feature?.props['class'] ?? '');
}

/** What the map paints, bottom to top. */
export function baseMapPaintRules(): PaintRule[] {
  return [
    {
      dataLayer: 'landuse',
      symbolizer: new PolygonSymbolizer({ fill: (_z, f) => LANDUSE_FILLS[classOf(f)] ?? PALETTE.land }),
    },
    { dataLayer: 'water', symbolizer: new PolygonSymbolizer({ fill: PALETTE.water }) },
    {
      dataLayer: 'waterways',
      symbolizer: new LineSymbolizer({
        color: PALETTE.waterLine,
        width: (z, f) => (f?.props['kind'] === 'river' || f?.props['kind'] === 'canal' ? 1.2 : 0.6) * Math.max(0.8, 1.3 ** (z - 12)),
        lineCap: 'round',
      }),
    },
    {
      dataLayer: 'roads',
      filter: (_z, f) => f.props['class'] === 'track' || f.props['class'] === 'path',
      minzoom: 13,
      symbolizer: new LineSymbolizer({
        color: (_z, f) => (classOf(f) === 'track' ? PALETTE.track : PALETTE.path),
        width: 0.9,
        dash: [3, 2],
      }),
    },
    {
      dataLayer: 'roads',
      filter: (_z, f) => f.props['class'] === 'rail' || f.props['class'] === 'tram',
      symbolizer: new LineSymbolizer({
        color: (_z, f) => (classOf(f) === 'tram' ? PALETTE.tram : PALETTE.rail),
        width: (z) => (z >= 14 ? 1.6 : 1),
        dash: [5, 3],
      }),
    },
    // Casings first, then fills, so junctions read as one surface.
    {
      dataLayer: 'roads',
      filter: (_z, f) => STREETS.has(classOf(f)),
      minzoom: 12,
      symbolizer: new LineSymbolizer({
        color: PALETTE.casing,
        width: (z, f) => roadWidth(z, classOf(f)) + 1.4,
        lineCap: 'round',
        lineJoin: 'round',
      }),
    },
    {
      dataLayer: 'roads',
      filter: (_z, f) => STREETS.has(classOf(f)),
      symbolizer: new LineSymbolizer({
        color: PALETTE.road,
        width: (z, f) => roadWidth(z, classOf(f)),
        lineCap: 'round',
        lineJoin: 'round',
      }),
    },
    {
      dataLayer: 'roads',
      filter: (_z, f) => MAIN_ROADS.has(classOf(f)),
      symbolizer: new LineSymbolizer({
        color: PALETTE.mainCasing,
        width: (z, f) => roadWidth(z, classOf(f)) + 1.6,
        lineCap: 'round',
        lineJoin: 'round',
      }),
    },
    {
      dataLayer: 'roads',
      filter: (_z, f) => MAIN_ROADS.has(classOf(f)),
      symbolizer: new LineSymbolizer({
        color: PALETTE.mainRoad,
        width: (z, f) => roadWidth(z, classOf(f)),
        lineCap: 'round',
        lineJoin: 'round',
      }),
    },
  ];
}

const PLACE_SIZES: Record<string, number> = {
  city: 17,
  town: 15,
  village: 13,
  suburb: 12,
  island: 12,
  hamlet: 12,
  pass: 11,
  peak: 11,
  locality: 11,
};
const PLACE_RANK: Record<string, number> = { city: 0, town: 1, village: 2, island: 3, suburb: 4, pass: 5, peak: 6, hamlet: 7, locality: 8 };

/** Labels: places (larger for larger places, peaks and passes with their elevation), roads along their line, water. */
export function baseMapLabelRules(): LabelRule[] {
  return [
    {
      dataLayer: 'places',
      symbolizer: new CenteredTextSymbolizer({
        // `label`: the name, with the elevation for peaks and passes.
        labelProps: ['label', 'name'],
        fontFamily: FONT,
        fontWeight: (_z, f) => (f?.props['kind'] === 'town' || f?.props['kind'] === 'city' ? 700 : 500),
        fontSize: (_z, f) => PLACE_SIZES[String(f?.props['kind'])] ?? 11,
        fill: PALETTE.label,
        stroke: PALETTE.halo,
        width: 2.5,
        maxLineChars: 24,
      }),
      sort: (a, b) => (PLACE_RANK[String(a['kind'])] ?? 9) - (PLACE_RANK[String(b['kind'])] ?? 9),
    },
    {
      dataLayer: 'roads',
      minzoom: 13,
      filter: (_z, f) => typeof f.props['name'] === 'string' && !['rail', 'tram', 'path', 'track'].includes(classOf(f)),
      symbolizer: new LineLabelSymbolizer({
        fontFamily: FONT,
        fontSize: 11,
        fontWeight: 500,
        fill: PALETTE.label,
        stroke: PALETTE.halo,
        width: 2,
      }),
    },
    {
      dataLayer: 'waterways',
      minzoom: 12,
      filter: (_z, f) => typeof f.props['name'] === 'string',
      symbolizer: new LineLabelSymbolizer({
        fontFamily: FONT,
        fontSize: 11,
        fontStyle: 'italic',
        fill: PALETTE.waterLabel,
        stroke: PALETTE.halo,
        width: 2,
      }),
    },
    {
      dataLayer: 'water',
      minzoom: 12,
      filter: (_z, f) => typeof f.props['name'] === 'string',
      symbolizer: new CenteredTextSymbolizer({
        fontFamily: FONT,
        fontSize: 11,
        fontStyle: 'italic',
        fill: PALETTE.waterLabel,
        stroke: PALETTE.halo,
        width: 2,
      }),
    },
  ];
}

/** The map's background where the extract has nothing (the land tint). */
export const BASE_MAP_BACKGROUND = PALETTE.land;
