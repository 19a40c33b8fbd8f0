import { describe, expect, it } from 'vitest';
import { Geodesic } from 'geographiclib-geodesic';
import { geodesicDirect, geodesicDistanceM, geodesicInverse } from '../../../shared/engine/geodesy';

// Reference: GeographicLib (Karney 2013), Geodesic.WGS84.Inverse.
const lines: [name: string, lon1: number, lat1: number, lon2: number, lat2: number][] = [
  ['short (12 m, Alps)', 7.6601, 45.9763, 7.66012, 45.97641],
  ['route leg (1.4 km)', 11.3933, 47.2682, 11.4101, 47.2741],
  ['long (Zürich–Vienna)', 8.5417, 47.3769, 16.3738, 48.2082],
  ['very long (Oslo–Cape Town)', 10.7522, 59.9139, 18.4241, -33.9249],
  ['high latitude (Svalbard)', 15.6, 78.2, 16.2, 78.9],
  ['along the equator', -10, 0, 10, 0],
  ['along a meridian', 20, -5, 20, 40],
];

describe('geodesicDistanceM', () => {
  it.each(lines)('matches GeographicLib within 1 mm on the %s line', (_name, lon1, lat1, lon2, lat2) => {
    const reference = Geodesic.WGS84.Inverse(lat1, lon1, lat2, lon2).s12 ?? Number.NaN;

    expect(Math.abs(geodesicDistanceM(lon1, lat1, lon2, lat2) - reference)).toBeLessThan(1e-3);
  });

  it('is zero between identical points', () => {
    expect(geodesicDistanceM(8, 46, 8, 46)).toBe(0);
  });
});

describe('geodesicDirect', () => {
  it.each(lines)('lands on the far end of the %s line (GeographicLib azimuth and length)', (_name, lon1, lat1, lon2, lat2) => {
    const reference = Geodesic.WGS84.Inverse(lat1, lon1, lat2, lon2);
    const { azimuthRad } = geodesicInverse(lon1, lat1, lon2, lat2);
    const out: [number, number] = [0, 0];

    geodesicDirect(lon1, lat1, azimuthRad, reference.s12 ?? 0, out);

    expect(geodesicDistanceM(out[0], out[1], lon2, lat2)).toBeLessThan(2e-3);
    // 1e-4° over 12 m is a 20 µm sideways offset.
    expect((azimuthRad * 180) / Math.PI).toBeCloseTo(reference.azi1 ?? Number.NaN, 4);
  });
});
