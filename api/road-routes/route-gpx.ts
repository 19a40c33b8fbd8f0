/**
 * Routes as GPX 1.1 (topografix.com/GPX/1/1). Export: <metadata> with the name, one <wpt> per stop
 * (dwell in our own extension namespace, ignored by other readers), and the line as a <trk> with
 * one <trkseg>; <ele> where the positions carry elevation. Import: the first <trk> (all its
 * segments joined), else the first <rte>; every <wpt> becomes a stop. Points are checked here, so
 * a bad one is named with its line; @tmcw/togeojson then reads the line.
 */
import { DOMParser, type Element as XmlElement } from '@xmldom/xmldom';
import { gpx as gpxToGeoJson } from '@tmcw/togeojson';
import type { RoadRoute, RoadRouteDraftInput } from '@shared/domain/road-routes';
import { ImportError } from './import-error';
import { baseName } from './route-geojson';

/** Namespace of our GPX extension elements (dwell time of a stop). */
export const DESCENTRY_GPX_NAMESPACE = 'urn:descentry:gpx:1';

export function routeToGpx(route: RoadRoute): string {
  const lines = [
    '<?xml version="1.0" encoding="UTF-8"?>',
    `<gpx version="1.1" creator="Descentry" xmlns="http://www.topografix.com/GPX/1/1" xmlns:descentry="${DESCENTRY_GPX_NAMESPACE}">`,
    '  <metadata>',
    `    <name>${escapeXml(route.name)}</name>`,
    ...(route.description ? [`    <desc>${escapeXml(route.description)}</desc>`] : []),
    '  </metadata>',
  ];
  for (const stop of route.stops) {
    lines.push(
      `  <wpt lat="${stop.lat}" lon="${stop.lon}">`,
      `    <name>${escapeXml(stop.name)}</name>`,
      '    <type>stop</type>',
      `    <extensions><descentry:dwellS>${stop.dwellS}</descentry:dwellS></extensions>`,
      '  </wpt>',
    );
  }
  lines.push('  <trk>', `    <name>${escapeXml(route.name)}</name>`, `    <type>${route.mode}</type>`, '    <trkseg>');
  for (const [lon, lat, elevation] of route.geometry.coordinates) {
    lines.push(
      elevation === undefined
        ? `      <trkpt lat="${lat}" lon="${lon}"/>`
        : `      <trkpt lat="${lat}" lon="${lon}"><ele>${elevation}</ele></trkpt>`,
    );
  }
  lines.push('    </trkseg>', '  </trk>', '</gpx>', '');
  return lines.join('\n');
}

/** Reads a GPX file into a route draft; throws ImportError naming file, line and field. */
export function gpxToDraft(fileName: string, text: string): RoadRouteDraftInput {
  let document;
  try {
    document = new DOMParser({
      onError: (level, message) => {
        if (level !== 'warning') throw new Error(message);
      },
    }).parseFromString(text, 'text/xml');
  } catch (error) {
    // xmldom reports malformed XML by throwing a ParseError that carries the line.
    const locator = (error as { locator?: { lineNumber?: number } }).locator;
    const message = (error instanceof Error ? error.message : String(error)).replace(/^.*?caused Error: \w+: /, '');
    throw new ImportError({ file: fileName, line: locator?.lineNumber || undefined }, `not well-formed XML (${message})`);
  }
  const root = document.documentElement;
  if (!root || root.localName !== 'gpx') throw new ImportError({ file: fileName, line: lineOf(root) }, 'the root element must be <gpx>');

  const tracks = elements(root, 'trk');
  const routes = elements(root, 'rte');
  let points: XmlElement[];
  let lineElement: XmlElement;
  if (tracks[0]) {
    lineElement = tracks[0];
    points = elements(lineElement, 'trkpt');
  } else if (routes[0]) {
    lineElement = routes[0];
    points = elements(lineElement, 'rtept');
  } else {
    throw new ImportError({ file: fileName }, 'no <trk> or <rte>: nothing to import as a route');
  }
  const positions = points.map((point) => readPosition(fileName, point));
  if (positions.length < 2)
    throw new ImportError({ file: fileName, line: lineOf(lineElement) }, `<${lineElement.localName}> needs at least two points`);
  const withElevation = positions.every((position) => position.length === 3);
  const coordinates = positions.map(([lon, lat, ele]) =>
    withElevation ? ([lon!, lat!, ele!] as [number, number, number]) : ([lon!, lat!] as [number, number]),
  );

  // togeojson reads the line the same way (and keeps GPX-specific details such as times out).
  const collection = gpxToGeoJson(document as unknown as Document);
  const feature = collection.features.find(
    (candidate) => candidate.geometry?.type === 'LineString' || candidate.geometry?.type === 'MultiLineString',
  );
  const name =
    textOf(lineElement, 'name') ?? textOf(elements(root, 'metadata')[0], 'name') ?? (feature?.properties?.['name'] as string | undefined);

  const stops = elements(root, 'wpt').map((waypoint, index) => {
    const [lon, lat] = readPosition(fileName, waypoint);
    const dwellText = elements(waypoint, 'dwellS')[0]?.textContent?.trim();
    const dwellS = dwellText === undefined ? 20 : Number(dwellText);
    if (!Number.isFinite(dwellS) || dwellS < 0 || dwellS > 3_600) {
      throw new ImportError(
        { file: fileName, line: lineOf(waypoint), field: 'wpt.extensions.dwellS' },
        `dwell must be 0–3600 s, got "${dwellText}"`,
      );
    }
    return { name: (textOf(waypoint, 'name') ?? `Stop ${index + 1}`).slice(0, 120), lon: lon!, lat: lat!, dwellS };
  });
  const type = textOf(lineElement, 'type');
  const description = textOf(elements(root, 'metadata')[0], 'desc') ?? textOf(lineElement, 'desc');
  return {
    name: (name ?? baseName(fileName)).slice(0, 120),
    ...(description ? { description: description.slice(0, 2_000) } : {}),
    ...(type === 'bus' || type === 'trolleybus' || type === 'tram' ? { mode: type } : {}),
    geometry: { type: 'LineString', coordinates },
    stops,
  };
}

function readPosition(fileName: string, point: XmlElement): number[] {
  const tag = point.localName;
  const lat = Number(point.getAttribute('lat'));
  const lon = Number(point.getAttribute('lon'));
  const line = lineOf(point);
  if (point.getAttribute('lat') === null || !Number.isFinite(lat) || lat < -90 || lat > 90) {
    throw new ImportError({ file: fileName, line, field: `${tag}.lat` }, `latitude must be −90…90, got "${point.getAttribute('lat')}"`);
  }
  if (point.getAttribute('lon') === null || !Number.isFinite(lon) || lon < -180 || lon > 180) {
    throw new ImportError({ file: fileName, line, field: `${tag}.lon` }, `longitude must be −180…180, got "${point.getAttribute('lon')}"`);
  }
  const eleText = elements(point, 'ele')[0]?.textContent?.trim();
  if (eleText === undefined || eleText === '') return [lon, lat];
  const ele = Number(eleText);
  if (!Number.isFinite(ele) || ele < -1_000 || ele > 11_000) {
    throw new ImportError({ file: fileName, line, field: `${tag}.ele` }, `elevation must be −1000…11000 m, got "${eleText}"`);
  }
  return [lon, lat, ele];
}

function elements(parent: XmlElement | undefined | null, localName: string): XmlElement[] {
  if (!parent) return [];
  return Array.from(parent.getElementsByTagNameNS('*', localName) as ArrayLike<XmlElement>);
}

/** Text of the first direct child named `localName`. */
function textOf(parent: XmlElement | undefined | null, localName: string): string | undefined {
  if (!parent) return undefined;
  for (let node = parent.firstChild; node; node = node.nextSibling) {
    if (node.nodeType === 1 && (node as XmlElement).localName === localName) {
      const text = node.textContent?.trim();
      return text ? text : undefined;
    }
  }
  return undefined;
}

function lineOf(node: unknown): number | undefined {
  const line = (node as { lineNumber?: number } | null)?.lineNumber;
  return typeof line === 'number' && line > 0 ? line : undefined;
}

function escapeXml(text: string): string {
  return text.replace(/[<>&"']/g, (c) => ({ '<': '&lt;', '>': '&gt;', '&': '&amp;', '"': '&quot;', "'": '&apos;' })[c]!);
}
