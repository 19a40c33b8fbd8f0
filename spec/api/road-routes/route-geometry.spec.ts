import { describe, expect, it } from 'vitest';
import { clipSpeedLimits, engineSpeedLimits, mirrorRoute, placeStops } from '../../../api/road-routes/route-geometry';
import { eastwardLine, pointNear } from '../../support/road-route-builders';

describe('placeStops', () => {
  it('places a stop exactly on a middle vertex at that vertex’s distance (issue: Turf’s segment distance at vertices)', () => {
    const line = eastwardLine({ lengthM: 2_000, vertexSpacingM: 1_000 });

    const [stop] = placeStops(line.coordinates, [{ name: 'Weir', ...pointNear(1_000), dwellS: 20 }]);

    expect(stop!.atM).toBeCloseTo(1_000, 1);
  });

  it('puts a stop at the far end at the route length', () => {
    const line = eastwardLine({ lengthM: 1_500 });

    const [stop] = placeStops(line.coordinates, [{ name: 'End', ...pointNear(1_500), dwellS: 20 }]);

    expect(stop!.atM).toBeCloseTo(1_500, 1);
  });
});

describe('speed limits', () => {
  it('clips stretches to the length and drops those beyond it', () => {
    expect(
      clipSpeedLimits(
        [
          { fromM: 900, toM: 1_500, speedKph: 30 },
          { fromM: 1_200, toM: 1_300, speedKph: 20 },
        ],
        1_000,
      ),
    ).toEqual([{ fromM: 900, toM: 1_000, speedKph: 30 }]);
  });

  it('fills the gaps between stretches with the default limit', () => {
    expect(engineSpeedLimits([{ fromM: 200, toM: 400, speedKph: 30 }], 50, 1_000)).toEqual([
      { fromM: 0, toM: 200, speedKph: 50 },
      { fromM: 200, toM: 400, speedKph: 30 },
      { fromM: 400, toM: 1_000, speedKph: 50 },
    ]);
    expect(engineSpeedLimits([], 60, 1_000)).toBe(60);
  });
});

describe('mirrorRoute', () => {
  it('reverses the line and maps atM → L − atM for stops and stretches', () => {
    const line = eastwardLine({ lengthM: 1_000 });

    const inbound = mirrorRoute({
      coordinates: line.coordinates,
      lengthM: 1_000,
      stops: [
        { name: 'A', lon: 0, lat: 0, dwellS: 20, atM: 100 },
        { name: 'B', lon: 0, lat: 0, dwellS: 20, atM: 700 },
      ],
      speedLimits: [{ fromM: 0, toM: 250, speedKph: 30 }],
    });

    expect(inbound.coordinates[0]).toEqual(line.coordinates.at(-1));
    expect(inbound.stops.map((stop) => [stop.name, stop.atM])).toEqual([
      ['B', 300],
      ['A', 900],
    ]);
    expect(inbound.speedLimits).toEqual([{ fromM: 750, toM: 1_000, speedKph: 30 }]);
  });
});
