/**
 * Geodesics on the WGS 84 ellipsoid by Vincenty's inverse and direct formulae (T. Vincenty,
 * "Direct and inverse solutions of geodesics on the ellipsoid", Survey Review 23(176), 1975),
 * accurate to well below a millimetre for the short lines between route vertices. Lengths are
 * horizontal (on the ellipsoid); heights do not enter.
 */
import { WGS84_FLATTENING, WGS84_SEMI_MAJOR_AXIS_M } from './constants';
import { EngineInputError } from './validation';

const A = WGS84_SEMI_MAJOR_AXIS_M;
const F = WGS84_FLATTENING;
const B = A * (1 - F);
const DEG = Math.PI / 180;
const MAX_ITERATIONS = 200;
const CONVERGENCE_RAD = 1e-12;

/** Vincenty's series coefficients A and B for u² = cos²α · (a² − b²) / b². */
function seriesCoefficients(cosSqAlpha: number): { bigA: number; bigB: number } {
  const uSq = (cosSqAlpha * (A * A - B * B)) / (B * B);
  return {
    bigA: 1 + (uSq / 16384) * (4096 + uSq * (-768 + uSq * (320 - 175 * uSq))),
    bigB: (uSq / 1024) * (256 + uSq * (-128 + uSq * (74 - 47 * uSq))),
  };
}

/** Vincenty's Δσ: the difference between the arc on the auxiliary sphere and s / (b·A). */
function deltaSigmaOf(bigB: number, sinSigma: number, cosSigma: number, cos2SigmaM: number): number {
  return (
    bigB *
    sinSigma *
    (cos2SigmaM +
      (bigB / 4) *
        (cosSigma * (-1 + 2 * cos2SigmaM * cos2SigmaM) -
          (bigB / 6) * cos2SigmaM * (-3 + 4 * sinSigma * sinSigma) * (-3 + 4 * cos2SigmaM * cos2SigmaM)))
  );
}

/** Vincenty's λ − L: longitude on the auxiliary sphere minus longitude on the ellipsoid. */
function longitudeDifferenceOf(
  cosSqAlpha: number,
  sinAlpha: number,
  sigma: number,
  sinSigma: number,
  cosSigma: number,
  cos2SigmaM: number,
): number {
  const C = (F / 16) * cosSqAlpha * (4 + F * (4 - 3 * cosSqAlpha));
  return (1 - C) * F * sinAlpha * (sigma + C * sinSigma * (cos2SigmaM + C * cosSigma * (-1 + 2 * cos2SigmaM * cos2SigmaM)));
}

export interface GeodesicInverse {
  distanceM: number;
  /** Forward azimuth at the first point, radians clockwise from north. */
  azimuthRad: number;
}

/** Geodesic distance and initial azimuth from (lon1, lat1) to (lon2, lat2), degrees. */
export function geodesicInverse(lon1: number, lat1: number, lon2: number, lat2: number): GeodesicInverse {
  const L = (lon2 - lon1) * DEG;
  const tanU1 = (1 - F) * Math.tan(lat1 * DEG);
  const tanU2 = (1 - F) * Math.tan(lat2 * DEG);
  const cosU1 = 1 / Math.sqrt(1 + tanU1 * tanU1);
  const sinU1 = tanU1 * cosU1;
  const cosU2 = 1 / Math.sqrt(1 + tanU2 * tanU2);
  const sinU2 = tanU2 * cosU2;

  let lambda = L;
  let sinLambda = 0;
  let cosLambda = 1;
  let sinSigma = 0;
  let cosSigma = 1;
  let sigma = 0;
  let cosSqAlpha = 1;
  let cos2SigmaM = 0;
  let converged = false;
  for (let i = 0; i < MAX_ITERATIONS; i++) {
    sinLambda = Math.sin(lambda);
    cosLambda = Math.cos(lambda);
    const t1 = cosU2 * sinLambda;
    const t2 = cosU1 * sinU2 - sinU1 * cosU2 * cosLambda;
    sinSigma = Math.sqrt(t1 * t1 + t2 * t2);
    if (sinSigma === 0) return { distanceM: 0, azimuthRad: 0 };
    cosSigma = sinU1 * sinU2 + cosU1 * cosU2 * cosLambda;
    sigma = Math.atan2(sinSigma, cosSigma);
    const sinAlpha = (cosU1 * cosU2 * sinLambda) / sinSigma;
    cosSqAlpha = 1 - sinAlpha * sinAlpha;
    // On the equator line cos²α = 0 and the term vanishes (Vincenty 1975).
    cos2SigmaM = cosSqAlpha !== 0 ? cosSigma - (2 * sinU1 * sinU2) / cosSqAlpha : 0;
    const previous = lambda;
    lambda = L + longitudeDifferenceOf(cosSqAlpha, sinAlpha, sigma, sinSigma, cosSigma, cos2SigmaM);
    if (Math.abs(lambda - previous) < CONVERGENCE_RAD) {
      converged = true;
      break;
    }
  }
  if (!converged) {
    throw new EngineInputError('route.coordinates', 'two consecutive points are nearly antipodal');
  }
  const { bigA, bigB } = seriesCoefficients(cosSqAlpha);
  const distanceM = B * bigA * (sigma - deltaSigmaOf(bigB, sinSigma, cosSigma, cos2SigmaM));
  const azimuthRad = Math.atan2(cosU2 * sinLambda, cosU1 * sinU2 - sinU1 * cosU2 * cosLambda);
  return { distanceM, azimuthRad };
}

/** Geodesic distance between two points in degrees, m. */
export function geodesicDistanceM(lon1: number, lat1: number, lon2: number, lat2: number): number {
  return geodesicInverse(lon1, lat1, lon2, lat2).distanceM;
}

/**
 * Point reached from (lon1, lat1) along azimuth `azimuthRad` after `distanceM`; writes
 * [lon, lat] in degrees into `out` to keep hot loops free of allocations.
 */
export function geodesicDirect(lon1: number, lat1: number, azimuthRad: number, distanceM: number, out: [number, number]): void {
  const sinAlpha1 = Math.sin(azimuthRad);
  const cosAlpha1 = Math.cos(azimuthRad);
  const tanU1 = (1 - F) * Math.tan(lat1 * DEG);
  const cosU1 = 1 / Math.sqrt(1 + tanU1 * tanU1);
  const sinU1 = tanU1 * cosU1;
  const sigma1 = Math.atan2(tanU1, cosAlpha1);
  const sinAlpha = cosU1 * sinAlpha1;
  const cosSqAlpha = 1 - sinAlpha * sinAlpha;
  const { bigA, bigB } = seriesCoefficients(cosSqAlpha);

  let sigma = distanceM / (B * bigA);
  let sinSigma = 0;
  let cosSigma = 1;
  let cos2SigmaM = 0;
  for (let i = 0; i < MAX_ITERATIONS; i++) {
    cos2SigmaM = Math.cos(2 * sigma1 + sigma);
    sinSigma = Math.sin(sigma);
    cosSigma = Math.cos(sigma);
    const previous = sigma;
    sigma = distanceM / (B * bigA) + deltaSigmaOf(bigB, sinSigma, cosSigma, cos2SigmaM);
    if (Math.abs(sigma - previous) < CONVERGENCE_RAD) break;
  }
  sinSigma = Math.sin(sigma);
  cosSigma = Math.cos(sigma);
  cos2SigmaM = Math.cos(2 * sigma1 + sigma);
  const tmp = sinU1 * sinSigma - cosU1 * cosSigma * cosAlpha1;
  const lat2 = Math.atan2(sinU1 * cosSigma + cosU1 * sinSigma * cosAlpha1, (1 - F) * Math.sqrt(sinAlpha * sinAlpha + tmp * tmp));
  const lambda = Math.atan2(sinSigma * sinAlpha1, cosU1 * cosSigma - sinU1 * sinSigma * cosAlpha1);
  const L = lambda - longitudeDifferenceOf(cosSqAlpha, sinAlpha, sigma, sinSigma, cosSigma, cos2SigmaM);
  let lon2 = lon1 + L / DEG;
  if (lon2 > 180) lon2 -= 360;
  else if (lon2 < -180) lon2 += 360;
  out[0] = lon2;
  out[1] = lat2 / DEG;
}

const E2 = F * (2 - F);

/**
 * Local metres per degree of longitude and latitude at `latDeg` on WGS 84 (prime-vertical and
 * meridian radii of curvature), for planar geometry over a few hundred metres.
 */
export function metresPerDegree(latDeg: number): { eastM: number; northM: number } {
  const sinLat = Math.sin(latDeg * DEG);
  const w = 1 - E2 * sinLat * sinLat;
  const primeVerticalM = A / Math.sqrt(w);
  const meridianM = (A * (1 - E2)) / (w * Math.sqrt(w));
  return { eastM: primeVerticalM * Math.cos(latDeg * DEG) * DEG, northM: meridianM * DEG };
}
