/**
 * The route editor's editing logic, kept free of Leaflet and Angular so it can be tested alone:
 * the draft (vertices, stops, speed-limit stretches), the edits a planner makes on the map and in
 * the tables, and undo/redo over them. Positions are GeoJSON order, [lon, lat].
 */
import { LATITUDE_DEG, LONGITUDE_DEG, STOP_DWELL_S } from '@shared/domain/limits';
import type { RoadRoute } from '@shared/domain/road-routes';
import { metresPerDegree } from '@shared/engine/geodesy';
import { clipRanges, lineLengthM, pointAlongLine, projectOnLine, roundAlongM } from '@shared/geometry/route-line';

// The route-line rules the editor draws and estimates with: the same ones the API stores by
// (shared/geometry/route-line.ts), so an estimate here equals the server's value after a save.
export { pointAlongLine, projectOnLine, sliceLine, type LineProjection } from '@shared/geometry/route-line';

/**
 * A vertex: [lon, lat], or [lon, lat, elevation m] when the route carries its own elevation there
 * (an imported GPS track). Moving or inserting a vertex gives it none, so the terrain then
 * supplies the route's elevations (they are used only when every vertex has one).
 */
export type LonLat = readonly [number, number] | readonly [number, number, number];

export interface DraftStop {
  name: string;
  lon: number;
  lat: number;
  /** Dwell time, s. */
  dwellS: number;
  /** Distance along the route, m: the server's value after a save, an estimate while editing. */
  atM: number;
}

export interface DraftSpeedLimit {
  fromM: number;
  toM: number;
  speedKph: number;
}

export interface RouteDraftState {
  readonly vertices: readonly LonLat[];
  readonly stops: readonly DraftStop[];
  readonly speedLimits: readonly DraftSpeedLimit[];
}

export const EMPTY_DRAFT: RouteDraftState = { vertices: [], stops: [], speedLimits: [] };

/** A saved route (or an older version of it) as a draft: its line, its stops with the server's `atM`, its stretches. */
export function draftOfRoute(route: RoadRoute): RouteDraftState {
  return {
    vertices: route.geometry.coordinates.map(([lon, lat, elevationM]) =>
      elevationM === undefined ? ([lon!, lat!] as const) : ([lon!, lat!, elevationM] as const),
    ),
    stops: route.stops.map((stop) => ({ name: stop.name, lon: stop.lon, lat: stop.lat, dwellS: stop.dwellS, atM: stop.atM })),
    speedLimits: route.speedLimits.map((stretch) => ({ ...stretch })),
  };
}

/** A vertex as a GeoJSON position, with its recorded elevation when it has one. */
export function positionOf(vertex: LonLat): [number, number] | [number, number, number] {
  return vertex.length === 3 ? [vertex[0], vertex[1], vertex[2]] : [vertex[0], vertex[1]];
}

/** How many vertices carry a recorded elevation, of how many. */
export function recordedElevations(state: RouteDraftState): { recorded: number; total: number } {
  return { recorded: state.vertices.filter((vertex) => vertex.length === 3).length, total: state.vertices.length };
}

/** Drops every recorded elevation: the terrain then supplies the route's elevations. */
export function dropRecordedElevations(state: RouteDraftState): RouteDraftState {
  if (state.vertices.every((vertex) => vertex.length === 2)) return state;
  return { ...state, vertices: state.vertices.map(([lon, lat]) => [lon, lat] as const) };
}

/** Default dwell of a new stop, s (shared/domain/limits.ts). */
export const DEFAULT_DWELL_S = STOP_DWELL_S.default;

/** Length of a polyline along the ellipsoid, m. */
export function polylineLengthM(vertices: readonly LonLat[]): number {
  return lineLengthM(vertices);
}

/** Midpoint of every segment: the handles a planner clicks to insert a vertex there. */
export function segmentMidpoints(vertices: readonly LonLat[]): LonLat[] {
  const midpoints: LonLat[] = [];
  for (let i = 1; i < vertices.length; i++) {
    const a = vertices[i - 1]!;
    const b = vertices[i]!;
    midpoints.push([(a[0] + b[0]) / 2, (a[1] + b[1]) / 2]);
  }
  return midpoints;
}

/**
 * Keeps stops and speed limits consistent with a changed geometry: every stop moves to the nearest
 * point of the new line (its `atM` re-estimated; the server's value replaces it after a save), and
 * speed-limit stretches are cut to the new length (a stretch wholly beyond the end is dropped).
 */
export function reconcile(state: RouteDraftState): RouteDraftState {
  const { vertices } = state;
  if (vertices.length < 2) return state;
  const lengthM = lineLengthM(vertices);
  const stops = state.stops.map((stop) => {
    const projection = projectOnLine(vertices, [stop.lon, stop.lat]);
    return projection ? { ...stop, lon: projection.at[0], lat: projection.at[1], atM: roundAlongM(projection.atM) } : stop;
  });
  stops.sort((a, b) => a.atM - b.atM);
  return { vertices, stops, speedLimits: clipRanges(state.speedLimits, lengthM) };
}

/** Decimals a coordinate keeps when typed in the vertex table: 1e-6° is about 0.1 m. */
export const COORDINATE_DECIMALS = 6;

/** How far beyond the last vertex "insert after" puts a new one, m. */
export const APPENDED_VERTEX_STEP_M = 50;

/** Rounds WGS 84 degrees to the decimals the vertex table shows. */
export function roundDegrees(value: number): number {
  const factor = 10 ** COORDINATE_DECIMALS;
  return Math.round(value * factor) / factor;
}

/**
 * A longitude or latitude typed in the vertex table, in WGS 84 degrees and rounded to
 * COORDINATE_DECIMALS; null when the text is not a number within ±180° (longitude) or ±90° (latitude).
 */
export function parseCoordinate(text: string, axis: 'lon' | 'lat'): number | null {
  if (text.trim() === '') return null;
  const value = Number(text);
  const range = axis === 'lon' ? LONGITUDE_DEG : LATITUDE_DEG;
  return Number.isFinite(value) && value >= range.min && value <= range.max ? roundDegrees(value) : null;
}

/**
 * Where "insert after vertex `index`" puts the new vertex: the midpoint of the segment that follows
 * it, or, after the last vertex, APPENDED_VERTEX_STEP_M further along the last segment's heading
 * (due east when there is no segment to follow).
 */
export function pointAfterVertex(vertices: readonly LonLat[], index: number): LonLat {
  const from = vertices[index];
  if (!from) throw new RangeError(`No vertex ${index} on a route of ${vertices.length} vertices`);
  const next = vertices[index + 1];
  if (next) return [roundDegrees((from[0] + next[0]) / 2), roundDegrees((from[1] + next[1]) / 2)];
  const scale = metresPerDegree(from[1]);
  const previous = vertices[index - 1];
  const eastM = previous ? (from[0] - previous[0]) * scale.eastM : 0;
  const northM = previous ? (from[1] - previous[1]) * scale.northM : 0;
  const lengthM = Math.hypot(eastM, northM);
  const [unitEast, unitNorth] = lengthM > 0 ? [eastM / lengthM, northM / lengthM] : [1, 0];
  const lon = from[0] + (unitEast * APPENDED_VERTEX_STEP_M) / scale.eastM;
  const lat = from[1] + (unitNorth * APPENDED_VERTEX_STEP_M) / scale.northM;
  return [roundDegrees(lon), roundDegrees(Math.min(90, Math.max(-90, lat)))];
}

// ---- Edits: each returns a new state (the history keeps the old one) ----

export function appendVertices(state: RouteDraftState, points: readonly LonLat[]): RouteDraftState {
  return reconcile({ ...state, vertices: [...state.vertices, ...points] });
}

export function moveVertex(state: RouteDraftState, index: number, to: LonLat): RouteDraftState {
  assertIndex(state, index);
  return reconcile({ ...state, vertices: state.vertices.map((vertex, i) => (i === index ? to : vertex)) });
}

/** Inserts a vertex into segment `segmentIndex` (between vertices segmentIndex and segmentIndex + 1). */
export function insertVertex(state: RouteDraftState, segmentIndex: number, at: LonLat): RouteDraftState {
  if (segmentIndex < 0 || segmentIndex >= state.vertices.length - 1) {
    throw new RangeError(`No segment ${segmentIndex} on a route of ${state.vertices.length} vertices`);
  }
  const vertices = [...state.vertices];
  vertices.splice(segmentIndex + 1, 0, at);
  return reconcile({ ...state, vertices });
}

/** Inserts a vertex after vertex `index` (from the vertex table), where pointAfterVertex puts it. */
export function insertVertexAfter(state: RouteDraftState, index: number): RouteDraftState {
  assertIndex(state, index);
  const at = pointAfterVertex(state.vertices, index);
  return index < state.vertices.length - 1 ? insertVertex(state, index, at) : appendVertices(state, [at]);
}

/**
 * Sets one coordinate of vertex `index` to a value typed in the vertex table, keeping the other.
 * Typing the value already shown changes nothing, so it leaves no step in the undo history.
 */
export function setVertexCoordinate(state: RouteDraftState, index: number, axis: 'lon' | 'lat', degrees: number): RouteDraftState {
  assertIndex(state, index);
  const range = axis === 'lon' ? LONGITUDE_DEG : LATITUDE_DEG;
  if (!(degrees >= range.min && degrees <= range.max)) {
    throw new RangeError(`A ${axis === 'lon' ? 'longitude' : 'latitude'} of ${degrees}° is outside WGS 84`);
  }
  const [lon, lat] = state.vertices[index]!;
  const current = axis === 'lon' ? lon : lat;
  // A vertex moved by typing keeps no recorded elevation: it no longer stands where that was measured.
  if (roundDegrees(current) === roundDegrees(degrees)) return state;
  return moveVertex(state, index, axis === 'lon' ? [degrees, lat] : [lon, degrees]);
}

/** Replaces vertex `index` by `points` in order (a path along the roads through where it was dropped). */
export function replaceVertex(state: RouteDraftState, index: number, points: readonly LonLat[]): RouteDraftState {
  assertIndex(state, index);
  const vertices = [...state.vertices];
  vertices.splice(index, 1, ...points);
  return reconcile({ ...state, vertices });
}

export function deleteVertex(state: RouteDraftState, index: number): RouteDraftState {
  assertIndex(state, index);
  return reconcile({ ...state, vertices: state.vertices.filter((_, i) => i !== index) });
}

/** Places a stop on the line at the point nearest `near`. */
export function addStopNear(state: RouteDraftState, near: LonLat, name: string, dwellS = DEFAULT_DWELL_S): RouteDraftState {
  const projection = projectOnLine(state.vertices, near);
  if (!projection) throw new RangeError('A stop needs a route of at least two vertices');
  const stop: DraftStop = { name, lon: projection.at[0], lat: projection.at[1], atM: roundAlongM(projection.atM), dwellS };
  return { ...state, stops: [...state.stops, stop].sort((a, b) => a.atM - b.atM) };
}

/** Moves a stop to `atM` metres along the line (typed in the table). */
export function moveStopTo(state: RouteDraftState, index: number, atM: number): RouteDraftState {
  const at = pointAlongLine(state.vertices, atM);
  if (!at) return state;
  const lengthM = lineLengthM(state.vertices);
  return updateStop(state, index, { lon: at[0], lat: at[1], atM: roundAlongM(Math.min(Math.max(0, atM), lengthM)) });
}

export function updateStop(state: RouteDraftState, index: number, change: Partial<DraftStop>): RouteDraftState {
  const stops = state.stops.map((stop, i) => (i === index ? { ...stop, ...change } : stop));
  return { ...state, stops: stops.sort((a, b) => a.atM - b.atM) };
}

export function removeStop(state: RouteDraftState, index: number): RouteDraftState {
  return { ...state, stops: state.stops.filter((_, i) => i !== index) };
}

export function addSpeedLimit(state: RouteDraftState, stretch: DraftSpeedLimit): RouteDraftState {
  if (!(stretch.toM > stretch.fromM)) throw new RangeError('A speed-limit stretch must end after it starts');
  const speedLimits = [...state.speedLimits, stretch].sort((a, b) => a.fromM - b.fromM);
  return { ...state, speedLimits };
}

export function updateSpeedLimit(state: RouteDraftState, index: number, change: Partial<DraftSpeedLimit>): RouteDraftState {
  const speedLimits = state.speedLimits.map((stretch, i) => (i === index ? { ...stretch, ...change } : stretch));
  return { ...state, speedLimits };
}

export function removeSpeedLimit(state: RouteDraftState, index: number): RouteDraftState {
  return { ...state, speedLimits: state.speedLimits.filter((_, i) => i !== index) };
}

function assertIndex(state: RouteDraftState, index: number): void {
  if (index < 0 || index >= state.vertices.length) {
    throw new RangeError(`No vertex ${index} on a route of ${state.vertices.length} vertices`);
  }
}

/**
 * Undo/redo over whole draft states. An edit after an undo drops the redo branch, as in every
 * editor; the oldest states fall off past `limit`.
 */
export class RouteDraftHistory {
  private past: RouteDraftState[] = [];
  private future: RouteDraftState[] = [];
  private current: RouteDraftState;

  constructor(
    initial: RouteDraftState = EMPTY_DRAFT,
    private readonly limit = 200,
  ) {
    this.current = initial;
  }

  get state(): RouteDraftState {
    return this.current;
  }

  /** Whether there is an edit to undo. */
  get canUndo(): boolean {
    return this.past.length > 0;
  }

  /** Whether there is an undone edit to redo. */
  get canRedo(): boolean {
    return this.future.length > 0;
  }

  /** Applies an edit; an edit that changes nothing is not recorded. */
  apply(edit: (state: RouteDraftState) => RouteDraftState): RouteDraftState {
    const next = edit(this.current);
    if (next === this.current) return next;
    this.past.push(this.current);
    if (this.past.length > this.limit) this.past.shift();
    this.future = [];
    this.current = next;
    return next;
  }

  undo(): RouteDraftState {
    const previous = this.past.pop();
    if (previous) {
      this.future.push(this.current);
      this.current = previous;
    }
    return this.current;
  }

  redo(): RouteDraftState {
    const next = this.future.pop();
    if (next) {
      this.past.push(this.current);
      this.current = next;
    }
    return this.current;
  }

  /** Starts over from `state` (a loaded or saved route): nothing to undo. */
  reset(state: RouteDraftState): void {
    this.past = [];
    this.future = [];
    this.current = state;
  }
}
