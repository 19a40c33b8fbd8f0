import type { RoadNetwork } from '@shared/domain/road-routes';
import { EMPTY_DRAFT, type LonLat, type RouteDraftState } from '../../../web/app/road-routes/route-draft';
import { LIMIT_COLOR, ROUTE_COLOR, STOP_COLOR, routeOverlays, type RouteOverlayInput } from '../../../web/app/road-routes/route-overlays';

// Three points on a meridian, about 1.11 km apart (0.01° of latitude, 111.2 km per degree).
const A: LonLat = [10, 46.0];
const B: LonLat = [10, 46.01];
const C: LonLat = [10, 46.02];

const DRAFT: RouteDraftState = {
  vertices: [A, B, C],
  stops: [{ name: 'Upper square', lon: 10, lat: 46.005, dwellS: 20, atM: 556 }],
  speedLimits: [{ fromM: 500, toM: 1500, speedKph: 30 }],
};

const NETWORK: RoadNetwork = {
  type: 'FeatureCollection',
  features: [
    {
      type: 'Feature',
      properties: {},
      geometry: {
        type: 'LineString',
        coordinates: [
          [10.1, 46],
          [10.1, 46.1],
        ],
      },
    },
  ],
} as unknown as RoadNetwork;

function input(change: Partial<RouteOverlayInput> = {}): RouteOverlayInput {
  return {
    draft: DRAFT,
    network: null,
    editing: true,
    tool: 'draw',
    selectedVertex: null,
    pendingLimitFromM: null,
    units: 'metric',
    ...change,
  };
}

const ids = (change: Partial<RouteOverlayInput>) => routeOverlays(input(change)).map((overlay) => overlay.id);

describe('route map overlays', () => {
  it('draws network, limit band, route, midpoints, vertices and stops bottom to top while drawing', () => {
    expect(ids({ network: NETWORK })).toEqual([
      'network:0',
      'limit:0',
      'route',
      'mid:0',
      'mid:1',
      'vertex:0',
      'vertex:1',
      'vertex:2',
      'stop:0',
    ]);
  });

  it('shows no handles to someone who may not edit, and the route line does not take clicks', () => {
    const overlays = routeOverlays(input({ editing: false }));

    expect(overlays.map((overlay) => overlay.id)).toEqual(['limit:0', 'route', 'stop:0']);
    const route = overlays.find((overlay) => overlay.id === 'route');
    expect(route).toMatchObject({ kind: 'line', color: ROUTE_COLOR, interactive: false, label: undefined });
  });

  it('makes the route line clickable with the stop and limit tools, and hides midpoints there', () => {
    const stop = routeOverlays(input({ tool: 'stop' }));
    const limit = routeOverlays(input({ tool: 'limit' }));

    expect(stop.find((overlay) => overlay.id === 'route')).toMatchObject({ interactive: true, label: 'Click to place a stop here' });
    expect(limit.find((overlay) => overlay.id === 'route')).toMatchObject({
      interactive: true,
      label: 'Click the start, then the end of the stretch',
    });
    expect(stop.some((overlay) => overlay.id.startsWith('mid:'))).toBe(false);
    // Vertices still show (to be seen) but only the draw tool drags them.
    expect(stop.filter((overlay) => overlay.kind === 'handle').every((overlay) => overlay.kind === 'handle' && !overlay.draggable)).toBe(
      true,
    );
  });

  it('marks the selected vertex and counts vertices in the labels', () => {
    const handles = routeOverlays(input({ selectedVertex: 1 })).filter((overlay) => overlay.id.startsWith('vertex:'));

    expect(handles.map((overlay) => (overlay.kind === 'handle' ? overlay.variant : null))).toEqual(['vertex', 'selected', 'vertex']);
    expect(handles.map((overlay) => overlay.label)).toEqual(['Vertex 1 of 3', 'Vertex 2 of 3', 'Vertex 3 of 3']);
  });

  it('cuts the limit band from the route between its ends and labels it in the chosen unit', () => {
    const metric = routeOverlays(input()).find((overlay) => overlay.id === 'limit:0');
    const imperial = routeOverlays(input({ units: 'imperial' })).find((overlay) => overlay.id === 'limit:0');

    expect(metric).toMatchObject({ kind: 'line', color: LIMIT_COLOR, label: 'Speed limit 30 km/h' });
    // 30 km/h = 18.64 mph (1 mi = 1.609344 km, the international mile), shown whole.
    expect(imperial?.label).toBe('Speed limit 19 mph');
    const positions = metric?.kind === 'line' ? metric.positions : [];
    // 500 m and 1500 m along a meridian from 46°: 0.0045° and 0.0135° north, with B in between.
    expect(positions[0]![1]).toBeCloseTo(46.0045, 3);
    expect(positions.at(-1)![1]).toBeCloseTo(46.0135, 3);
    expect(positions).toContainEqual([B[0], B[1]]);
  });

  it('pins the stop where it stands and the start of a stretch being placed', () => {
    const overlays = routeOverlays(input({ tool: 'limit', pendingLimitFromM: 1112 }));

    expect(overlays.find((overlay) => overlay.id === 'stop:0')).toMatchObject({
      kind: 'pin',
      at: [10, 46.005],
      color: STOP_COLOR,
      label: 'Stop: Upper square',
    });
    const start = overlays.find((overlay) => overlay.id === 'limit-start');
    expect(start?.kind === 'pin' ? start.at[1] : null).toBeCloseTo(46.01, 3);
  });

  it('draws nothing of a route with no vertices, and no line for a single vertex', () => {
    expect(ids({ draft: EMPTY_DRAFT })).toEqual([]);
    expect(ids({ draft: { ...EMPTY_DRAFT, vertices: [A] } })).toEqual(['vertex:0']);
  });
});
