import type { LineString } from '@shared/domain/analysis';
import type { RoadRouteDraftInput } from '@shared/domain/road-routes';
import { metresPerDegree } from '@shared/engine/geodesy';

/** Start of the spec routes: an invented spot in the Alps' latitude band. */
export const ORIGIN: [number, number] = [9.0, 46.5];

/**
 * A straight line heading east from `origin`, `lengthM` long, falling `dropM` evenly (positions
 * carry elevation unless `withElevation` is false), with a vertex every `vertexSpacingM`.
 */
export function eastwardLine(
  options: {
    lengthM?: number;
    dropM?: number;
    topM?: number;
    vertexSpacingM?: number;
    withElevation?: boolean;
    origin?: [number, number];
  } = {},
): LineString {
  const { lengthM = 2_000, dropM = 0, topM = 1_200, vertexSpacingM = 250, withElevation = true, origin = ORIGIN } = options;
  const { eastM } = metresPerDegree(origin[1]);
  const count = Math.max(1, Math.round(lengthM / vertexSpacingM));
  const coordinates = Array.from({ length: count + 1 }, (_, i) => {
    const s = (lengthM * i) / count;
    const lon = origin[0] + s / eastM;
    return withElevation
      ? ([lon, origin[1], topM - (dropM * s) / lengthM] as [number, number, number])
      : ([lon, origin[1]] as [number, number]);
  });
  return { type: 'LineString', coordinates };
}

/** A point `alongM` east of the origin and `northM` north of the line. */
export function pointNear(alongM: number, northM = 0, origin: [number, number] = ORIGIN): { lon: number; lat: number } {
  const { eastM, northM: perDegreeNorth } = metresPerDegree(origin[1]);
  return { lon: origin[0] + alongM / eastM, lat: origin[1] + northM / perDegreeNorth };
}

export function aRouteDraft(overrides: Partial<RoadRouteDraftInput> = {}): RoadRouteDraftInput {
  return {
    name: 'Spec line 1',
    mode: 'bus',
    geometry: eastwardLine({ lengthM: 2_000, dropM: 120 }),
    stops: [
      { name: 'Lower square', ...pointNear(600, 10), dwellS: 25 },
      { name: 'Mill bridge', ...pointNear(1_400, -8), dwellS: 20 },
    ],
    speedLimits: [{ fromM: 0, toM: 500, speedKph: 30 }],
    defaultSpeedLimitKph: 50,
    tripsPerDay: 20,
    ...overrides,
  };
}
