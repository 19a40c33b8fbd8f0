/**
 * Minimum-time speed profile by the forward–backward pass (engine README §7.4):
 *
 *   forward   a_k = min(a_comfort, (F_trac,max(v_k) − F_res(v_k, θ_k)) / ((1+δ)·m))
 *             v_{k+1} = min(v_lim,{k+1}, √(v_k² + 2·a_k·ℓ_k))
 *   backward  v_k = min(v_k, √(v_{k+1}² + 2·d_k·ℓ_k))
 *   time      Δt_k = 2·ℓ_k / (v_k + v_{k+1})   (exact for constant acceleration over ℓ_k)
 *
 * with F_trac,max(v) = min(maxTractionForceN, tractionPowerW/v). ℓ_k is the segment length along
 * the road. Where the traction envelope cannot hold a grade the speed falls, but never below
 * `CRAWL_SPEED_MPS` (the stretch is then reported as traction-limited instead of stalling).
 */
import { CRAWL_SPEED_MPS, STANDARD_GRAVITY_MPS2 } from './constants';

export interface TractionEnvelopeInput {
  massKg: number;
  rotatingMassFactor: number;
  rollingResistanceCoefficient: number;
  /** Cd·A, m². */
  dragAreaM2: number;
  maxTractionForceN: number;
  tractionPowerW: number;
  /** Per segment. */
  airDensityKgM3: Float64Array;
  /** Per segment: sin θ and cos θ of the grade. */
  sinTheta: Float64Array;
  cosTheta: Float64Array;
}

export interface SpeedProfileInput {
  /** Length of each segment along the road, m (n − 1 entries). */
  segmentLengthM: Float64Array;
  /** Speed limit at each point, m/s (n entries; 0 at stops and terminals). */
  limitMps: Float64Array;
  accelerationMps2: number;
  /** Comfort deceleration, one value or one per segment, m/s². */
  decelerationMps2: number | Float64Array;
  traction?: TractionEnvelopeInput;
}

/** Speed at every point, m/s. */
export function computeSpeedProfile(input: SpeedProfileInput): Float64Array {
  const { segmentLengthM, limitMps, accelerationMps2, decelerationMps2, traction } = input;
  const n = limitMps.length;
  const speed = new Float64Array(n);
  if (n === 0) return speed;
  speed[0] = limitMps[0]!;
  const weightN = traction ? traction.massKg * STANDARD_GRAVITY_MPS2 : 0;
  const effectiveMassKg = traction ? (1 + traction.rotatingMassFactor) * traction.massKg : 1;

  for (let k = 0; k < n - 1; k++) {
    const v = speed[k]!;
    let a = accelerationMps2;
    if (traction) {
      const forceLimitN = v > 0 ? Math.min(traction.maxTractionForceN, traction.tractionPowerW / v) : traction.maxTractionForceN;
      const resistanceN =
        (v > 0 ? traction.rollingResistanceCoefficient * weightN * traction.cosTheta[k]! : 0) +
        0.5 * traction.airDensityKgM3[k]! * traction.dragAreaM2 * v * v +
        weightN * traction.sinTheta[k]!;
      a = Math.min(a, (forceLimitN - resistanceN) / effectiveMassKg);
    }
    const vSq = v * v + 2 * a * segmentLengthM[k]!;
    const limit = limitMps[k + 1]!;
    let next = vSq > 0 ? Math.sqrt(vSq) : 0;
    next = Math.max(next, Math.min(CRAWL_SPEED_MPS, limit));
    speed[k + 1] = Math.min(limit, next);
  }
  for (let k = n - 2; k >= 0; k--) {
    const d = typeof decelerationMps2 === 'number' ? decelerationMps2 : decelerationMps2[k]!;
    const reachable = Math.sqrt(speed[k + 1]! * speed[k + 1]! + 2 * d * segmentLengthM[k]!);
    if (reachable < speed[k]!) speed[k] = reachable;
  }
  return speed;
}

/** Time to cover a segment of length `lengthM` between speeds v1 and v2 at constant acceleration, s. */
export function segmentTimeS(lengthM: number, v1Mps: number, v2Mps: number): number {
  const sum = v1Mps + v2Mps;
  // Two consecutive points at rest (e.g. two stops one point apart): creep at crawl speed.
  return sum > 1e-9 ? (2 * lengthM) / sum : lengthM / CRAWL_SPEED_MPS;
}
