import { describe, expect, it } from 'vitest';
import { computeSpeedProfile, segmentTimeS } from '../../../shared/engine/speed-profile';

describe('computeSpeedProfile', () => {
  it('runs 400 m stop to stop at 50 km/h, a 1.0, d 1.2 in 41.53 s (engine README §7 case A, ±0.05 s at 1 m)', () => {
    const { lengths, limits } = stopToStop(400, 1, () => 50 / 3.6);

    const speed = computeSpeedProfile({ segmentLengthM: lengths, limitMps: limits, accelerationMps2: 1, decelerationMps2: 1.2 });

    expect(Math.abs(totalTimeS(lengths, speed) - 41.53)).toBeLessThan(0.05);
    expect(Math.max(...speed)).toBeCloseTo(50 / 3.6, 9);
  });

  it('takes 47.62 s with a 40 m radius curve on 180–220 m at 1.2 m/s² (engine README §7 case B, ±0.05 s)', () => {
    const curveMps = Math.sqrt(1.2 * 40);
    const { lengths, limits } = stopToStop(400, 1, (s) => (s >= 180 && s <= 220 ? curveMps : 50 / 3.6));

    const speed = computeSpeedProfile({ segmentLengthM: lengths, limitMps: limits, accelerationMps2: 1, decelerationMps2: 1.2 });

    expect(Math.abs(totalTimeS(lengths, speed) - 47.62)).toBeLessThan(0.05);
    // Braking for the curve starts near 119.62 m (engine README §7 case B).
    expect(speed[118]).toBeCloseTo(50 / 3.6, 9);
    expect(speed[121]!).toBeLessThan(50 / 3.6);
  });

  it('never exceeds the limit at any point', () => {
    const { lengths, limits } = stopToStop(1000, 5, (s) => 8 + 4 * Math.sin(s / 60));

    const speed = computeSpeedProfile({ segmentLengthM: lengths, limitMps: limits, accelerationMps2: 1, decelerationMps2: 1.2 });

    speed.forEach((v, i) => expect(v).toBeLessThanOrEqual(limits[i]! + 1e-12));
  });

  it('falls to the balance speed on a climb the power limit cannot hold at the speed limit', () => {
    // 19 t on 10 %: grade force ≈ 18.5 kN; 150 kW holds about 7.6 m/s.
    const n = 301;
    const { lengths, limits } = stopToStop(3000, 10, () => 20);
    const sin = new Float64Array(n - 1).fill(0.1 / Math.sqrt(1.01));
    const cos = new Float64Array(n - 1).fill(1 / Math.sqrt(1.01));

    const speed = computeSpeedProfile({
      segmentLengthM: lengths,
      limitMps: limits,
      accelerationMps2: 1,
      decelerationMps2: 1.2,
      traction: {
        massKg: 19_000,
        rotatingMassFactor: 0,
        rollingResistanceCoefficient: 0.007,
        dragAreaM2: 5.6,
        maxTractionForceN: 60_000,
        tractionPowerW: 150_000,
        airDensityKgM3: new Float64Array(n - 1).fill(1.225),
        sinTheta: sin,
        cosTheta: cos,
      },
    });

    const cruise = speed[150]!;
    const resistanceN = 19_000 * 9.80665 * (0.007 * cos[0]! + sin[0]!) + 0.5 * 1.225 * 5.6 * cruise * cruise;
    expect(cruise).toBeLessThan(20);
    expect(Math.abs((resistanceN * cruise) / 150_000 - 1)).toBeLessThan(0.01);
  });
});

describe('segmentTimeS', () => {
  it('is exact for constant acceleration: 0 → 10 m/s over 50 m takes 10 s', () => {
    expect(segmentTimeS(50, 0, 10)).toBeCloseTo(10, 12);
  });
});

// Helpers

function stopToStop(lengthM: number, stepM: number, limitAt: (s: number) => number) {
  const n = Math.round(lengthM / stepM) + 1;
  const lengths = new Float64Array(n - 1).fill(stepM);
  const limits = Float64Array.from({ length: n }, (_, i) => limitAt(i * stepM));
  limits[0] = 0;
  limits[n - 1] = 0;
  return { lengths, limits };
}

function totalTimeS(lengths: Float64Array, speed: Float64Array): number {
  let t = 0;
  lengths.forEach((l, k) => (t += segmentTimeS(l, speed[k]!, speed[k + 1]!)));
  return t;
}
