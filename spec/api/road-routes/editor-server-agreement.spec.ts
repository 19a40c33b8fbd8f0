import { describe, expect, it } from 'vitest';
import { roadRouteDraftSchema } from '@shared/domain/road-routes';
import {
  addSpeedLimit,
  addStopNear,
  appendVertices,
  deleteVertex,
  EMPTY_DRAFT,
  moveVertex,
  polylineLengthM,
  type LonLat,
  type RouteDraftState,
} from '../../../web/app/road-routes/route-draft';
import { prepareVersion } from '../../../api/road-routes/road-routes-service';

// An invented hairpin descent above Highpass: five vertices winding down a valley side.
const HAIRPIN: LonLat[] = [
  [9.10213, 46.53871],
  [9.10652, 46.53502],
  [9.10118, 46.53187],
  [9.10794, 46.52803],
  [9.11337, 46.52461],
];

/** What the editor sends when the planner saves (the body of PUT/POST /api/routes). */
function saveBody(state: RouteDraftState) {
  return roadRouteDraftSchema.parse({
    name: 'Highpass hairpins',
    mode: 'bus',
    geometry: { type: 'LineString', coordinates: state.vertices.map(([lon, lat]) => [lon, lat]) },
    stops: state.stops.map((stop) => ({ name: stop.name, lon: stop.lon, lat: stop.lat, dwellS: stop.dwellS })),
    speedLimits: state.speedLimits.map((stretch) => ({ ...stretch })),
    defaultSpeedLimitKph: 50,
    tripsPerDay: 12,
  });
}

describe('the editor’s estimates and the stored version', () => {
  it('give every stop the same distance along the route and every stretch the same ends', () => {
    let state = appendVertices(EMPTY_DRAFT, HAIRPIN);
    state = addStopNear(state, [9.1049, 46.5361], 'Upper bend');
    state = addStopNear(state, [9.1031, 46.5312], 'Chapel');
    state = addStopNear(state, [9.1127, 46.5251], 'Lower bridge');
    state = addSpeedLimit(state, { fromM: 150, toM: 900, speedKph: 30 });
    state = addSpeedLimit(state, { fromM: 1_200, toM: 9_000, speedKph: 20 });
    // Reshaping the line re-places the stops and cuts the last stretch to the new end.
    state = moveVertex(state, 2, [9.10071, 46.53199]);
    state = deleteVertex(state, 4);

    const stored = prepareVersion(saveBody(state), { id: null, name: 'Spec planner' });

    expect(stored.lengthM).toBe(polylineLengthM(state.vertices));
    expect(stored.stops.map((stop) => [stop.name, stop.atM])).toEqual(state.stops.map((stop) => [stop.name, stop.atM]));
    expect(stored.speedLimits).toEqual(state.speedLimits);
    // The last stretch really was cut at the end, by the one rounding rule on both sides.
    expect(state.speedLimits.at(-1)!.toM).toBeLessThan(9_000);
    expect(state.speedLimits.at(-1)!.toM).toBeCloseTo(polylineLengthM(state.vertices), 3);
  });
});
