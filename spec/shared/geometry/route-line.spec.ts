import { describe, expect, it } from 'vitest';
import {
  clipRanges,
  lineLengthM,
  placeStops,
  pointAlongLine,
  projectOnLine,
  reverseRoute,
  roundAlongM,
  sliceLine,
  StopOffLineError,
  vertexDistancesM,
} from '@shared/geometry/route-line';
import { geodesicDistanceM } from '@shared/engine/geodesy';
import { eastwardLine, pointNear } from '../../support/road-route-builders';

// Three points on a meridian 0.01° of latitude apart.
const A = [10, 46.0] as const;
const B = [10, 46.01] as const;
const C = [10, 46.02] as const;

describe('route line: length', () => {
  it('sums Vincenty distances between the vertices', () => {
    const expectedM = geodesicDistanceM(10, 46, 10, 46.01) + geodesicDistanceM(10, 46.01, 10, 46.02);

    expect(lineLengthM([A, B, C])).toBeCloseTo(expectedM, 9);
    expect(vertexDistancesM([A, B, C])).toHaveLength(3);
  });

  it('measures 0.02° of latitude at 46° N as 2 223.0 m, as the WGS 84 meridian arc gives', () => {
    // The meridian's radius of curvature M = a(1 − e²)/(1 − e² sin²φ)^1.5 on WGS 84 (a = 6 378 137 m,
    // e² = 0.00669438; Snyder, Map Projections — A Working Manual, USGS Professional Paper 1395)
    // is 6 368 490 m at 46° N: 111 151 m per degree, so 0.02° is 2 223.0 m.
    expect(lineLengthM([A, C])).toBeCloseTo(2_223.0, 0);
  });

  it('is 0 for a line of one vertex or none', () => {
    expect(lineLengthM([A])).toBe(0);
    expect(lineLengthM([])).toBe(0);
  });
});

describe('route line: projection', () => {
  it('finds the nearest point, its distance along the line and its offset', () => {
    const line = eastwardLine({ lengthM: 2_000, withElevation: false });
    const near = pointNear(700, 30);

    const projection = projectOnLine(line.coordinates, [near.lon, near.lat])!;

    expect(projection.atM).toBeCloseTo(700, 0);
    expect(projection.offsetM).toBeCloseTo(30, 0);
    expect(projection.at[1]).toBeCloseTo(46.5, 6);
  });

  it('puts a point beyond the end at exactly the line length', () => {
    const line = eastwardLine({ lengthM: 1_500 });

    const projection = projectOnLine(line.coordinates, [pointNear(1_600).lon, pointNear(1_600).lat])!;

    expect(projection.atM).toBe(lineLengthM(line.coordinates));
  });

  it('gives nothing for a line of fewer than two vertices', () => {
    expect(projectOnLine([A], A)).toBeNull();
  });
});

describe('route line: points and slices', () => {
  it('walks a distance along the line, clamped to its ends', () => {
    const halfway = pointAlongLine([A, C], lineLengthM([A, C]) / 2)!;

    expect(halfway[1]).toBeCloseTo(46.01, 4);
    expect(pointAlongLine([A, C], -5)).toEqual([10, 46]);
    expect(pointAlongLine([A, C], 1e9)).toEqual([10, 46.02]);
  });

  it('slices between two distances keeping the vertices inside', () => {
    const total = lineLengthM([A, B, C]);

    const slice = sliceLine([A, B, C], 100, total - 100);

    expect(slice).toHaveLength(3);
    expect(slice[1]).toEqual([10, 46.01]);
    expect(sliceLine([A, B, C], 500, 500)).toEqual([]);
  });
});

describe('route line: one rounding rule', () => {
  it('rounds distances along the route to the millimetre', () => {
    expect(roundAlongM(1_234.56789)).toBe(1_234.568);
    expect(roundAlongM(0.0004)).toBe(0);
  });

  it('clips ranges to the rounded length, drops those beyond it and sorts them', () => {
    const clipped = clipRanges(
      [
        { fromM: 900, toM: 1_500, speedKph: 30 },
        { fromM: 100, toM: 200, speedKph: 40 },
        { fromM: 1_000.2, toM: 1_300, speedKph: 20 },
      ],
      1_000.123456,
    );

    expect(clipped).toEqual([
      { fromM: 100, toM: 200, speedKph: 40 },
      { fromM: 900, toM: 1_000.123, speedKph: 30 },
    ]);
  });
});

describe('route line: stops', () => {
  it('places stops at their rounded distance, sorted along the route, keeping their own position', () => {
    const line = eastwardLine({ lengthM: 2_000 });
    const far = { name: 'Far', ...pointNear(1_500, 12) };
    const near = { name: 'Near', ...pointNear(250.1234, -5) };

    const placed = placeStops(line.coordinates, [far, near]);

    expect(placed.map((stop) => stop.name)).toEqual(['Near', 'Far']);
    expect(placed[0]!.atM).toBe(roundAlongM(placed[0]!.atM));
    expect(placed[0]!.atM).toBeCloseTo(250.123, 0);
    expect(placed[1]!.lon).toBe(far.lon);
  });

  it('refuses a stop farther from the line than allowed, naming it and its place', () => {
    const line = eastwardLine({ lengthM: 2_000 });
    const stops = [
      { name: 'On', ...pointNear(100) },
      { name: 'Meadow', ...pointNear(800, 120) },
    ];

    const attempt = () => placeStops(line.coordinates, stops, 50);

    expect(attempt).toThrow(StopOffLineError);
    expect(attempt).toThrow(/stops\.1: stop "Meadow" lies 120 m from the route line/);
  });
});

describe('route line: reversal', () => {
  it('reverses positions and mirrors stops and ranges, L − atM to the millimetre', () => {
    const reversed = reverseRoute({
      coordinates: [A, B, C],
      lengthM: 1_000.5,
      stops: [
        { name: 'x', atM: 100.25 },
        { name: 'y', atM: 900 },
      ],
      speedLimits: [{ fromM: 0, toM: 250.1, speedKph: 30 }],
    });

    expect(reversed.coordinates).toEqual([C, B, A]);
    expect(reversed.stops).toEqual([
      { name: 'y', atM: 100.5 },
      { name: 'x', atM: 900.25 },
    ]);
    expect(reversed.speedLimits).toEqual([{ fromM: 750.4, toM: 1_000.5, speedKph: 30 }]);
  });
});
