import { describe, expect, it } from 'vitest';
import { Geodesic } from 'geographiclib-geodesic';
import { resampleRoute } from '../../../shared/engine/resample-route';
import { RouteTooLargeError } from '../../../shared/engine/validation';

describe('resampleRoute', () => {
  const route: [number, number, number][] = [
    [11.39, 47.26, 600],
    [11.395, 47.262, 640],
    [11.401, 47.2615, 700],
    [11.41, 47.27, 690],
  ];

  it('measures the same total length as GeographicLib (WGS84 Inverse), within 1 mm', () => {
    const expected = route.slice(1).reduce((sum, p, i) => {
      const q = route[i]!;
      return sum + (Geodesic.WGS84.Inverse(q[1], q[0], p[1], p[0]).s12 ?? Number.NaN);
    }, 0);

    const resampled = resampleRoute(route, 10);

    expect(Math.abs(resampled.distanceM[resampled.distanceM.length - 1]! - expected)).toBeLessThan(1e-3);
  });

  it('refuses, naming both limits, a route whose point count passes the limit, before building points', () => {
    const resampled = () => resampleRoute(route, 1, { maxLengthM: 100_000, maxPoints: 500 });

    expect(resampled).toThrow(RouteTooLargeError);
    expect(resampled).toThrow(/at most 100 km and 500 points/);
  });

  it('counts exactly the points it would build when it checks the limits', () => {
    const built = resampleRoute(route, 10).distanceM.length;

    expect(() => resampleRoute(route, 10, { maxLengthM: 100_000, maxPoints: built })).not.toThrow();
    expect(() => resampleRoute(route, 10, { maxLengthM: 100_000, maxPoints: built - 1 })).toThrow(RouteTooLargeError);
  });

  it('keeps every original vertex and never spaces points further apart than Δs', () => {
    const resampled = resampleRoute(route, 10);

    expect(resampled.vertexIndex).toHaveLength(route.length);
    resampled.vertexIndex.forEach((index, vertex) => {
      expect(resampled.lon[index]).toBe(route[vertex]![0]);
      expect(resampled.lat[index]).toBe(route[vertex]![1]);
      expect(resampled.elevationM![index]).toBe(route[vertex]![2]);
    });
    for (let i = 1; i < resampled.distanceM.length; i++) {
      const step = resampled.distanceM[i]! - resampled.distanceM[i - 1]!;
      expect(step).toBeLessThanOrEqual(10 + 1e-9);
      expect(step).toBeGreaterThan(5);
    }
  });

  it('places new points at their stated geodesic distance from the start vertex (GeographicLib)', () => {
    const resampled = resampleRoute([route[0]!, route[1]!], 10);

    for (let i = 1; i < resampled.distanceM.length; i++) {
      const measured = Geodesic.WGS84.Inverse(route[0]![1], route[0]![0], resampled.lat[i]!, resampled.lon[i]!).s12 ?? Number.NaN;
      expect(Math.abs(measured - resampled.distanceM[i]!)).toBeLessThan(1e-3);
    }
  });

  it('interpolates elevation linearly by distance between vertices', () => {
    const resampled = resampleRoute([route[0]!, route[1]!], 10);
    const total = resampled.distanceM[resampled.distanceM.length - 1]!;
    const middle = Math.floor(resampled.distanceM.length / 2);

    expect(resampled.elevationM![middle]).toBeCloseTo(600 + (40 * resampled.distanceM[middle]!) / total, 9);
  });

  it('carries no elevation when any position lacks z', () => {
    const resampled = resampleRoute(
      [
        [11.39, 47.26],
        [11.395, 47.262, 640],
      ],
      10,
    );

    expect(resampled.elevationM).toBeNull();
  });

  it('merges repeated vertices', () => {
    const resampled = resampleRoute([route[0]!, route[0]!, route[1]!], 10);

    expect(resampled.vertexIndex).toHaveLength(2);
  });

  it('throws naming route.coordinates with fewer than two distinct points', () => {
    expect(() => resampleRoute([route[0]!, route[0]!], 10)).toThrow(/route\.coordinates.*two distinct/);
  });

  it('throws naming options.spacingM when the spacing is 0', () => {
    expect(() => resampleRoute(route, 0)).toThrow(/options\.spacingM/);
  });

  it('throws naming the coordinate when a latitude is NaN', () => {
    expect(() => resampleRoute([route[0]!, [11.4, Number.NaN, 3]], 10)).toThrow(/route\.coordinates\.1\.1/);
  });
});
