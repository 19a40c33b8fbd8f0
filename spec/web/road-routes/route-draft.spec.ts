import {
  APPENDED_VERTEX_STEP_M,
  EMPTY_DRAFT,
  dropRecordedElevations,
  recordedElevations,
  type RouteDraftState,
  RouteDraftHistory,
  addSpeedLimit,
  addStopNear,
  appendVertices,
  deleteVertex,
  insertVertex,
  insertVertexAfter,
  moveVertex,
  parseCoordinate,
  pointAfterVertex,
  polylineLengthM,
  projectOnLine,
  segmentMidpoints,
  setVertexCoordinate,
  type LonLat,
} from '../../../web/app/road-routes/route-draft';
import { roundAlongM } from '@shared/geometry/route-line';

// Three points on a meridian, about 1.11 km apart (0.01° of latitude).
const A: LonLat = [10, 46.0];
const B: LonLat = [10, 46.01];
const C: LonLat = [10, 46.02];

describe('route draft editing', () => {
  it('appends clicked vertices in order', () => {
    const state = appendVertices(appendVertices(EMPTY_DRAFT, [A]), [B, C]);

    expect(state.vertices).toEqual([A, B, C]);
  });

  it('moves one vertex and leaves the others', () => {
    const moved: LonLat = [10.001, 46.01];

    const state = moveVertex(appendVertices(EMPTY_DRAFT, [A, B, C]), 1, moved);

    expect(state.vertices).toEqual([A, moved, C]);
  });

  it('inserts a vertex at the midpoint handle of a segment', () => {
    const state = appendVertices(EMPTY_DRAFT, [A, C]);
    const [midpoint] = segmentMidpoints(state.vertices);

    const next = insertVertex(state, 0, midpoint!);

    expect(next.vertices).toHaveLength(3);
    expect(next.vertices[1]![1]).toBeCloseTo(46.01, 9);
  });

  it('deletes a vertex', () => {
    const state = deleteVertex(appendVertices(EMPTY_DRAFT, [A, B, C]), 0);

    expect(state.vertices).toEqual([B, C]);
  });

  it('throws a RangeError naming the vertex when it does not exist', () => {
    expect(() => deleteVertex(appendVertices(EMPTY_DRAFT, [A, B]), 5)).toThrow(/No vertex 5/);
  });

  it('measures the line along the ellipsoid', () => {
    // 0.02° of latitude at 46° N is about 2 224 m.
    expect(polylineLengthM([A, B, C])).toBeGreaterThan(2_215);
    expect(polylineLengthM([A, B, C])).toBeLessThan(2_230);
  });

  it('places a stop on the nearest point of the line, with its distance along it', () => {
    const state = appendVertices(EMPTY_DRAFT, [A, C]);

    const next = addStopNear(state, [10.002, 46.01], 'Church');

    expect(next.stops).toHaveLength(1);
    expect(next.stops[0]!.lon).toBeCloseTo(10, 6);
    expect(next.stops[0]!.atM).toBeCloseTo(polylineLengthM([A, C]) / 2, -1);
    expect(next.stops[0]!.dwellS).toBe(20);
  });

  it('keeps stops on the line when a vertex moves', () => {
    const withStop = addStopNear(appendVertices(EMPTY_DRAFT, [A, B, C]), B, 'Square');

    const next = moveVertex(withStop, 1, [10.005, 46.01]);
    const projection = projectOnLine(next.vertices, [next.stops[0]!.lon, next.stops[0]!.lat]);

    expect(projection!.offsetM).toBeLessThan(0.5);
  });

  it('cuts speed-limit stretches that run past a shortened route', () => {
    const state = addSpeedLimit(appendVertices(EMPTY_DRAFT, [A, B, C]), { fromM: 500, toM: 2_000, speedKph: 30 });

    const next = deleteVertex(state, 2);

    expect(next.speedLimits).toHaveLength(1);
    expect(next.speedLimits[0]!.toM).toBeLessThanOrEqual(Math.round(polylineLengthM([A, B])));
  });

  it('drops a stretch that lies wholly beyond the new end', () => {
    const state = addSpeedLimit(appendVertices(EMPTY_DRAFT, [A, B, C]), { fromM: 1_500, toM: 2_000, speedKph: 30 });

    expect(deleteVertex(state, 2).speedLimits).toEqual([]);
  });
});

describe('vertex table edits', () => {
  it('reads typed degrees within WGS 84 ranges, rounded to six decimals', () => {
    expect(parseCoordinate('10.12345678', 'lon')).toBe(10.123457);
    expect(parseCoordinate(' -46.5 ', 'lat')).toBe(-46.5);
    expect(parseCoordinate('180', 'lon')).toBe(180);
    expect(parseCoordinate('-90', 'lat')).toBe(-90);
  });

  it('refuses typed degrees out of range or not a number', () => {
    expect(parseCoordinate('180.000001', 'lon')).toBeNull();
    expect(parseCoordinate('91', 'lat')).toBeNull();
    expect(parseCoordinate('', 'lat')).toBeNull();
    expect(parseCoordinate('north', 'lat')).toBeNull();
  });

  it('moves a vertex to a typed longitude, keeping its latitude', () => {
    const state = setVertexCoordinate(appendVertices(EMPTY_DRAFT, [A, B, C]), 1, 'lon', 10.004);

    expect(state.vertices).toEqual([A, [10.004, 46.01], C]);
  });

  it('keeps stops on the line when a typed coordinate moves a vertex', () => {
    const withStop = addStopNear(appendVertices(EMPTY_DRAFT, [A, B, C]), B, 'Square');

    const next = setVertexCoordinate(withStop, 1, 'lon', 10.005);
    const projection = projectOnLine(next.vertices, [next.stops[0]!.lon, next.stops[0]!.lat]);

    expect(next.stops[0]!.lon).not.toBe(10);
    expect(projection!.offsetM).toBeLessThan(0.5);
    expect(next.stops[0]!.atM).toBeCloseTo(projection!.atM, 3);
  });

  it('cuts speed-limit stretches when a typed latitude shortens the route', () => {
    const state = addSpeedLimit(appendVertices(EMPTY_DRAFT, [A, B, C]), { fromM: 500, toM: 2_200, speedKph: 30 });

    const next = setVertexCoordinate(state, 2, 'lat', 46.015);

    // Cut to the length by the route line's one rounding rule (to the millimetre), as the server stores it.
    expect(next.speedLimits[0]!.toM).toBe(roundAlongM(polylineLengthM(next.vertices)));
  });

  it('changes nothing when the typed value is the one shown, so undo gets no empty step', () => {
    const history = new RouteDraftHistory(appendVertices(EMPTY_DRAFT, [[10.1234567, 46], B]));

    history.apply((state) => setVertexCoordinate(state, 0, 'lon', 10.123457));

    expect(history.canUndo).toBe(false);
  });

  it('refuses a coordinate outside WGS 84 or a vertex that does not exist', () => {
    const state = appendVertices(EMPTY_DRAFT, [A, B]);

    expect(() => setVertexCoordinate(state, 0, 'lat', 95)).toThrow(RangeError);
    expect(() => setVertexCoordinate(state, 0, 'lon', Number.NaN)).toThrow(RangeError);
    expect(() => setVertexCoordinate(state, 2, 'lon', 10)).toThrow(/No vertex 2/);
  });

  it('inserts after a vertex at the midpoint of the following segment', () => {
    const state = appendVertices(EMPTY_DRAFT, [A, [10.02, 46.02]]);

    const next = insertVertexAfter(state, 0);

    expect(next.vertices).toEqual([A, [10.01, 46.01], [10.02, 46.02]]);
  });

  it('inserts after the last vertex a short step further along the last segment', () => {
    const state = appendVertices(EMPTY_DRAFT, [A, B]);

    const next = insertVertexAfter(state, 1);
    const added = next.vertices[2]!;

    expect(next.vertices).toHaveLength(3);
    expect(added[0]).toBeCloseTo(10, 6);
    expect(added[1]).toBeGreaterThan(B[1]);
    expect(polylineLengthM([B, added])).toBeCloseTo(APPENDED_VERTEX_STEP_M, 0);
  });

  it('steps due east after a lone vertex', () => {
    const added = pointAfterVertex([A], 0);

    expect(added[1]).toBe(A[1]);
    expect(added[0]).toBeGreaterThan(A[0]);
    expect(polylineLengthM([A, added])).toBeCloseTo(APPENDED_VERTEX_STEP_M, 0);
  });

  it('keeps stops and speed limits when a vertex is inserted after a row', () => {
    let state = addStopNear(appendVertices(EMPTY_DRAFT, [A, C]), B, 'Square');
    state = addSpeedLimit(state, { fromM: 100, toM: 2_000, speedKph: 30 });

    const next = insertVertexAfter(state, 0);

    expect(next.stops).toHaveLength(1);
    expect(next.stops[0]!.atM).toBeCloseTo(state.stops[0]!.atM, 0);
    expect(next.speedLimits).toEqual(state.speedLimits);
  });

  it('undoes an insertion from the table in one step', () => {
    const history = new RouteDraftHistory(appendVertices(EMPTY_DRAFT, [A, C]));

    history.apply((state) => insertVertexAfter(state, 0));

    expect(history.state.vertices).toHaveLength(3);
    expect(history.undo().vertices).toEqual([A, C]);
  });
});

describe('RouteDraftHistory', () => {
  it('undoes and redoes edits in order', () => {
    const history = new RouteDraftHistory();
    history.apply((state) => appendVertices(state, [A]));
    history.apply((state) => appendVertices(state, [B]));

    expect(history.undo().vertices).toEqual([A]);
    expect(history.undo().vertices).toEqual([]);
    expect(history.canUndo).toBe(false);
    expect(history.redo().vertices).toEqual([A]);
    expect(history.redo().vertices).toEqual([A, B]);
    expect(history.canRedo).toBe(false);
  });

  it('drops the redo branch when a new edit follows an undo', () => {
    const history = new RouteDraftHistory();
    history.apply((state) => appendVertices(state, [A]));
    history.apply((state) => appendVertices(state, [B]));
    history.undo();

    history.apply((state) => appendVertices(state, [C]));

    expect(history.state.vertices).toEqual([A, C]);
    expect(history.canRedo).toBe(false);
  });

  it('records nothing for an edit that changes nothing', () => {
    const history = new RouteDraftHistory();

    history.apply((state) => state);

    expect(history.canUndo).toBe(false);
  });

  it('forgets the oldest states past its limit', () => {
    const history = new RouteDraftHistory(EMPTY_DRAFT, 2);
    for (const point of [A, B, C]) history.apply((state) => appendVertices(state, [point]));

    history.undo();
    history.undo();

    expect(history.canUndo).toBe(false);
    expect(history.state.vertices).toEqual([A]);
  });

  it('starts over with nothing to undo after a reset (a saved route)', () => {
    const history = new RouteDraftHistory();
    history.apply((state) => appendVertices(state, [A, B]));

    history.reset({ vertices: [B, C], stops: [], speedLimits: [] });

    expect(history.canUndo).toBe(false);
    expect(history.state.vertices).toEqual([B, C]);
  });
});

describe('recorded elevations (issue 10: an imported track kept its heights only until the editor saved)', () => {
  const track: RouteDraftState = {
    vertices: [
      [9, 46.5, 1210],
      [9.01, 46.5, 1195],
      [9.02, 46.5, 1180],
    ],
    stops: [],
    speedLimits: [],
  };

  it('counts the vertices that carry their own elevation', () => {
    expect(recordedElevations(track)).toEqual({ recorded: 3, total: 3 });
  });

  it('drops a moved vertex’s recorded elevation, keeping the others', () => {
    const moved = moveVertex(track, 1, [9.011, 46.5]);

    expect(moved.vertices).toEqual([
      [9, 46.5, 1210],
      [9.011, 46.5],
      [9.02, 46.5, 1180],
    ]);
    expect(recordedElevations(moved)).toEqual({ recorded: 2, total: 3 });
  });

  it('drops every recorded elevation when the planner chooses the terrain’s', () => {
    expect(dropRecordedElevations(track).vertices).toEqual([
      [9, 46.5],
      [9.01, 46.5],
      [9.02, 46.5],
    ]);
  });
});
