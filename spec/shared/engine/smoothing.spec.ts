import { describe, expect, it } from 'vitest';
import { ascentDescentM, movingAverageOverDistance, savitzkyGolayOverDistance } from '../../../shared/engine/smoothing';

describe('movingAverageOverDistance', () => {
  it('passes a straight ramp through unchanged on uneven spacing', () => {
    const distance = Float64Array.from([0, 3, 10, 12, 25, 40, 41, 60, 80, 100]);
    const ramp = distance.map((s) => 500 + 0.07 * s);

    const smoothed = movingAverageOverDistance(distance, ramp, 30);

    smoothed.forEach((z, i) => expect(z).toBeCloseTo(ramp[i]!, 9));
  });

  it('keeps both end values, so the net elevation change is preserved', () => {
    const { distance, noisy } = noisyProfile();

    const smoothed = movingAverageOverDistance(distance, noisy, 150);

    expect(smoothed[0]).toBe(noisy[0]);
    expect(smoothed[smoothed.length - 1]).toBe(noisy[noisy.length - 1]);
  });

  it('averages a square bump over the window (exact integral of the piecewise-linear profile)', () => {
    const distance = Float64Array.from({ length: 101 }, (_, i) => i * 10);
    const values = Float64Array.from(distance, (s) => (s === 500 ? 10 : 0));

    const smoothed = movingAverageOverDistance(distance, values, 100);

    // Triangle of height 10 and base 20 m → area 100 m·m over a 100 m window.
    expect(smoothed[50]).toBeCloseTo(1, 12);
  });
});

describe('savitzkyGolayOverDistance', () => {
  it('passes a parabola through unchanged (a local quadratic fit is exact on it)', () => {
    const distance = Float64Array.from({ length: 80 }, (_, i) => i * 10 + (i % 3));
    const parabola = distance.map((s) => 800 + 0.05 * s - 2e-5 * s * s);

    const smoothed = savitzkyGolayOverDistance(distance, parabola, 150);

    smoothed.forEach((z, i) => expect(z).toBeCloseTo(parabola[i]!, 6));
  });

  it('reduces terrain-model noise', () => {
    const { distance, clean, noisy } = noisyProfile();

    const smoothed = savitzkyGolayOverDistance(distance, noisy, 150);

    expect(rms(smoothed, clean)).toBeLessThan(0.6 * rms(noisy, clean));
  });
});

describe('ascentDescentM', () => {
  it('keeps ascent − descent equal to the net change', () => {
    const { noisy } = noisyProfile();

    const { ascentM, descentM } = ascentDescentM(noisy, 2);

    expect(ascentM - descentM).toBeCloseTo(noisy[noisy.length - 1]! - noisy[0]!, 9);
  });

  it('ignores noise below the threshold on a steady climb', () => {
    const { distance, clean, noisy } = noisyProfile();
    const smoothed = movingAverageOverDistance(distance, noisy, 150);

    const raw = ascentDescentM(noisy, 0);
    const filtered = ascentDescentM(smoothed, 2);
    const truth = clean[clean.length - 1]! - clean[0]!;

    expect(raw.ascentM).toBeGreaterThan(1.5 * truth);
    expect(Math.abs(filtered.ascentM - truth)).toBeLessThan(0.05 * truth);
  });
});

// Helpers

/** A 3 km climb at 5 % with ±2 m deterministic pseudo-noise every 10 m. */
function noisyProfile() {
  const distance = Float64Array.from({ length: 301 }, (_, i) => i * 10);
  const clean = distance.map((s) => 1000 + 0.05 * s);
  const noisy = clean.map((z, i) => z + 2 * Math.sin(i * 12.9898 + 78.233 * Math.sin(i)));
  return { distance, clean, noisy };
}

function rms(a: Float64Array, b: Float64Array): number {
  let sum = 0;
  a.forEach((value, i) => (sum += (value - b[i]!) ** 2));
  return Math.sqrt(sum / a.length);
}
