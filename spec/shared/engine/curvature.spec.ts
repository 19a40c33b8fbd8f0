import { describe, expect, it } from 'vitest';
import { circumradiusM, curveRadiiM, curveSpeedLimitMps } from '../../../shared/engine/curvature';
import { resampleRoute } from '../../../shared/engine/resample-route';
import { geodesicDirect } from '../../../shared/engine/geodesy';

describe('curveSpeedLimitMps', () => {
  it('gives 8.660 m/s for R 50 m at 1.5 m/s² (engine README §8 case 9)', () => {
    expect(curveSpeedLimitMps(50, 1.5)).toBeCloseTo(8.66025, 4);
  });

  it('gives 6.928 m/s for R 40 m at 1.2 m/s² (engine README §7 case B)', () => {
    expect(curveSpeedLimitMps(40, 1.2)).toBeCloseTo(Math.sqrt(48), 9);
  });
});

describe('circumradiusM', () => {
  it('recovers the radius of three points on a circle', () => {
    const r = 37;
    const p = (angle: number) => [r * Math.cos(angle), r * Math.sin(angle)] as const;
    const [a, b, c] = [p(0.1), p(0.9), p(2.2)];

    expect(circumradiusM(a[0], a[1], b[0], b[1], c[0], c[1])).toBeCloseTo(r, 9);
  });

  it('is infinite for collinear points', () => {
    expect(circumradiusM(0, 0, 1, 1, 2, 2)).toBe(Number.POSITIVE_INFINITY);
  });
});

describe('curveRadiiM', () => {
  it('finds a 200 m radius in the middle of a geographic arc and the cap on the straights', () => {
    const coordinates = arcRoute(200);
    const resampled = resampleRoute(coordinates, 5);

    const radii = curveRadiiM(resampled.distanceM, resampled.lon, resampled.lat, 30);

    const middle = radii[Math.floor(radii.length / 2)]!;
    expect(Math.abs(middle / 200 - 1)).toBeLessThan(0.02);
    expect(radii[3]).toBe(10_000);
  });
});

// Helpers

/** 300 m straight, a 90° arc of `radiusM` (vertices every 2°), 300 m straight, at 46° N. */
function arcRoute(radiusM: number): [number, number][] {
  const out: [number, number] = [0, 0];
  const coordinates: [number, number][] = [[9, 46]];
  geodesicDirect(9, 46, 0, 300, out);
  coordinates.push([out[0], out[1]]);
  const startLon = out[0];
  const startLat = out[1];
  // Centre lies east of the arc start; heading turns from north to east.
  const centre: [number, number] = [0, 0];
  geodesicDirect(startLon, startLat, Math.PI / 2, radiusM, centre);
  for (let deg = 2; deg <= 90; deg += 2) {
    const bearingFromCentre = ((270 + deg) * Math.PI) / 180;
    geodesicDirect(centre[0], centre[1], bearingFromCentre, radiusM, out);
    coordinates.push([out[0], out[1]]);
  }
  const [lastLon, lastLat] = coordinates[coordinates.length - 1]!;
  geodesicDirect(lastLon, lastLat, Math.PI / 2, 300, out);
  coordinates.push([out[0], out[1]]);
  return coordinates;
}
