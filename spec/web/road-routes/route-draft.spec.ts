import {
  EMPTY_DRAFT,
  RouteDraftHistory,
  addSpeedLimit,
  addStopNear,
  appendVertices,
  deleteVertex,
  insertVertex,
  moveVertex,
  polylineLengthM,
  projectOnLine,
  segmentMidpoints,
  type LonLat,
} from '../../../web/app/road-routes/route-draft';

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
