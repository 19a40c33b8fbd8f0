import type { RoadNetwork } from '@shared/domain/road-routes';
import { kphToDisplay, type UnitSystem } from '@shared/presentation/index';
import type { MapOverlay, MapPosition } from '../map/terrain-map';
import { unitLabel } from '../units/unit-format';
import { pointAlongLine, segmentMidpoints, sliceLine, type LonLat, type RouteDraftState } from './route-draft';

/** What a click on the map does. */
export type EditorTool = 'draw' | 'stop' | 'limit';

// Our map palette: a deep teal route over the warm terrain tint, violet stops, amber limits.
export const ROUTE_COLOR = '#0b5567';
export const NETWORK_COLOR = '#5c6b70';
export const STOP_COLOR = '#6a2c91';
export const LIMIT_COLOR = '#c2570c';

/** Everything the route map shows, as the editor knows it. */
export interface RouteOverlayInput {
  /** The route shown: the draft, or an older version being looked at. */
  draft: RouteDraftState;
  /** The reference road network drawn under the route, if there is one. */
  network: RoadNetwork | null;
  /** Whether the person may change what is shown (handles appear only then). */
  editing: boolean;
  tool: EditorTool;
  /** Index of the selected vertex, or null. */
  selectedVertex: number | null;
  /** First end of a speed-limit stretch being placed, m along the route, or null. */
  pendingLimitFromM: number | null;
  units: UnitSystem;
}

/**
 * What the route map draws, bottom to top: the road network, speed-limit bands, the route line,
 * segment midpoints (draw tool), vertex handles (when editing), stops and the start of a stretch
 * being placed. Pure: the same input always gives the same overlays.
 */
export function routeOverlays(input: RouteOverlayInput): MapOverlay[] {
  const { vertices, stops, speedLimits } = input.draft;
  const { editing, tool, selectedVertex } = input;
  const overlays: MapOverlay[] = [];
  for (const [index, feature] of (input.network?.features ?? []).entries()) {
    overlays.push({
      kind: 'line',
      id: `network:${index}`,
      positions: feature.geometry.coordinates.map(lonLatOf),
      color: NETWORK_COLOR,
      weight: 2,
      opacity: 0.7,
    });
  }
  speedLimits.forEach((stretch, index) => {
    overlays.push({
      kind: 'line',
      id: `limit:${index}`,
      positions: sliceLine(vertices, stretch.fromM, stretch.toM).map(lonLatOf),
      color: LIMIT_COLOR,
      // Wider than the route line and nearly opaque: a saved stretch shows as a band either side of it.
      weight: 15,
      opacity: 0.9,
      label: `Speed limit ${formatSpeed(stretch.speedKph, input.units)}`,
    });
  });
  if (vertices.length >= 2) {
    overlays.push({
      kind: 'line',
      id: 'route',
      positions: vertices.map(lonLatOf),
      color: ROUTE_COLOR,
      weight: 5,
      interactive: editing && tool !== 'draw',
      label:
        editing && tool === 'stop'
          ? 'Click to place a stop here'
          : editing && tool === 'limit'
            ? 'Click the start, then the end of the stretch'
            : undefined,
    });
  }
  if (editing && tool === 'draw') {
    segmentMidpoints(vertices).forEach((at, index) =>
      overlays.push({
        kind: 'handle',
        id: `mid:${index}`,
        at: lonLatOf(at),
        variant: 'midpoint',
        draggable: false,
        label: `Insert a vertex in segment ${index + 1}`,
      }),
    );
  }
  if (editing) {
    vertices.forEach((vertex, index) =>
      overlays.push({
        kind: 'handle',
        id: `vertex:${index}`,
        at: lonLatOf(vertex),
        variant: index === selectedVertex ? 'selected' : 'vertex',
        draggable: tool === 'draw',
        label: `Vertex ${index + 1} of ${vertices.length}`,
      }),
    );
  }
  stops.forEach((stop, index) =>
    overlays.push({ kind: 'pin', id: `stop:${index}`, at: [stop.lon, stop.lat], color: STOP_COLOR, label: `Stop: ${stop.name}` }),
  );
  if (input.pendingLimitFromM !== null) {
    const at = pointAt(vertices, input.pendingLimitFromM);
    if (at) overlays.push({ kind: 'pin', id: 'limit-start', at, color: LIMIT_COLOR, label: 'Start of the new speed-limit stretch' });
  }
  return overlays;
}

export function lonLatOf(position: readonly number[]): readonly [number, number] {
  return [position[0]!, position[1]!];
}

/** The map position `atM` metres along the line, or null for a line of fewer than two vertices. */
export function pointAt(vertices: readonly LonLat[], atM: number): MapPosition | null {
  const at = pointAlongLine(vertices, atM);
  return at && lonLatOf(at);
}

function formatSpeed(speedKph: number, system: UnitSystem): string {
  return `${Math.round(kphToDisplay(speedKph, system))} ${unitLabel('speed', system)}`;
}
