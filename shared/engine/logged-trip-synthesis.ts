/**
 * Invented logged trips: a vehicle with known ("true") parameters is driven along a route by the
 * engine's own minimum-time speed profile, and what a data logger would have recorded is written
 * out at a fixed rate, with noise, as a logged-trip CSV. Used by the demo (scripts/make-demo-logged-trips.ts)
 * and by the checks that a fit recovers the parameters a trip was made from.
 *
 * Between the engine's points the vehicle moves at constant acceleration (as the engine assumes),
 * so speed is linear and distance quadratic in time within a segment; battery power is the
 * segment's mean; SOC and brake temperature are interpolated in time. Noise is Gaussian from a
 * seeded generator (the same seed gives the same file).
 */
import type { PreviewRequestInput } from '../domain/analysis';
import { analyseRouteDetailed } from './analyse-route';
import { geodesicDirect, geodesicInverse } from './geodesy';

export interface SynthesisNoise {
  /** Standard deviation of the logged battery power, W. */
  powerW: number;
  /** Standard deviation of each GPS coordinate (east and north), m. */
  gpsM: number;
  /** Standard deviation of the logged speed, m/s. */
  speedMps: number;
  /** Standard deviation of the logged brake temperature, °C. */
  brakeTempC: number;
  /** Standard deviation of the logged elevation, m. */
  elevationM: number;
}

export interface SynthesisOptions {
  /** The engine request: route (with elevations), the true vehicle, conditions and options. */
  request: PreviewRequestInput;
  sampleRateHz: number;
  noise: SynthesisNoise;
  seed: number;
  /** Passengers written in the `passengers` column (omitted when undefined). */
  passengers?: number;
  /** Whether to write the `elevation_m`, `brake_temp_c` and `soc` columns. */
  withElevation?: boolean;
  withBrakeTemperature?: boolean;
  withSoc?: boolean;
  /** ISO 8601 time of the first row; written as `timestamp` instead of `time_s` when given. */
  startedAt?: string;
}

/** A CSV text (header + one row per sample) of the trip the vehicle drove. */
export async function synthesiseLoggedTripCsv(options: SynthesisOptions): Promise<string> {
  const { model, run, conditions } = await analyseRouteDetailed(options.request);
  const random = gaussian(options.seed);
  const n = model.pointCount;
  const dtS = 1 / options.sampleRateHz;
  const columns = [options.startedAt ? 'timestamp' : 'time_s', 'lat', 'lon', 'speed_mps'];
  if (options.withElevation) columns.push('elevation_m');
  columns.push('battery_power_w');
  if (options.withSoc) columns.push('soc');
  columns.push('ambient_c');
  if (options.withBrakeTemperature) columns.push('brake_temp_c');
  if (options.passengers !== undefined) columns.push('passengers');
  const lines = [columns.join(',')];
  const startMs = options.startedAt ? Date.parse(options.startedAt) : 0;
  const auxW = model.powertrain.auxPowerW;
  const ambientC = conditions.ambientC ?? model.ambientC[0]!;
  const point: [number, number] = [0, 0];

  let i = 0;
  let phaseStart = 0; // time the current phase (dwell at i, then segment i) began
  let dwelling = model.dwellS[0]! > 0;
  for (let t = 0; t <= run.durationS + 1e-9; t += dtS) {
    // Advance to the phase containing t.
    for (;;) {
      if (dwelling) {
        if (t <= phaseStart + model.dwellS[i]! || i === n - 1) break;
        phaseStart += model.dwellS[i]!;
        dwelling = false;
      }
      if (i === n - 1) break;
      const end = phaseStart + run.segmentDurationS[i]!;
      if (t <= end) break;
      phaseStart = end;
      i++;
      dwelling = model.dwellS[i]! > 0;
    }
    let lon: number;
    let lat: number;
    let speed: number;
    let powerW: number;
    let soc: number;
    let brakeC: number;
    let elevation: number;
    if (dwelling || i === n - 1) {
      lon = model.lon[i]!;
      lat = model.lat[i]!;
      speed = i === n - 1 ? run.speedMps[i]! : 0;
      powerW = auxW;
      soc = run.soc[Math.min(i + 1, n - 1)]!;
      brakeC = run.brakeTempC[i]!;
      elevation = model.elevationM[i]!;
    } else {
      const duration = run.segmentDurationS[i]!;
      const tau = Math.min(duration, Math.max(0, t - phaseStart));
      const v1 = run.speedMps[i]!;
      const v2 = run.speedMps[i + 1]!;
      const a = (v2 - v1) / duration;
      speed = v1 + a * tau;
      const along = v1 * tau + 0.5 * a * tau * tau;
      const horizontal = model.distanceM[i + 1]! - model.distanceM[i]!;
      const fraction = Math.min(1, along / model.slopeLengthM[i]!);
      const { azimuthRad } = geodesicInverse(model.lon[i]!, model.lat[i]!, model.lon[i + 1]!, model.lat[i + 1]!);
      geodesicDirect(model.lon[i]!, model.lat[i]!, azimuthRad, fraction * horizontal, point);
      [lon, lat] = point;
      powerW = run.batteryPowerW[i]!;
      const f = tau / duration;
      soc = run.soc[i]! + f * (run.soc[i + 1]! - run.soc[i]!);
      brakeC = run.brakeTempC[i]! + f * (run.brakeTempC[i + 1]! - run.brakeTempC[i]!);
      elevation = model.elevationM[i]! + fraction * (model.elevationM[i + 1]! - model.elevationM[i]!);
    }
    const [noisyLon, noisyLat] = offsetByMetres(lon, lat, random() * options.noise.gpsM, random() * options.noise.gpsM);
    const loggedSpeed = Math.max(0, speed + (speed > 0.5 ? random() * options.noise.speedMps : 0));
    const row = [
      options.startedAt ? new Date(startMs + t * 1000).toISOString() : t.toFixed(2),
      noisyLat.toFixed(7),
      noisyLon.toFixed(7),
      loggedSpeed.toFixed(3),
    ];
    if (options.withElevation) row.push((elevation + random() * options.noise.elevationM).toFixed(1));
    row.push((powerW + random() * options.noise.powerW).toFixed(0));
    if (options.withSoc) row.push(soc.toFixed(4));
    row.push(ambientC.toFixed(1));
    if (options.withBrakeTemperature) row.push((brakeC + random() * options.noise.brakeTempC).toFixed(1));
    if (options.passengers !== undefined) row.push(String(options.passengers));
    lines.push(row.join(','));
  }
  return `${lines.join('\n')}\n`;
}

function offsetByMetres(lon: number, lat: number, eastM: number, northM: number): [number, number] {
  const latRad = (lat * Math.PI) / 180;
  return [lon + eastM / (111_320 * Math.cos(latRad)), lat + northM / 110_574];
}

/** Standard normal numbers from a seeded generator (mulberry32 + Box–Muller). */
export function gaussian(seed: number): () => number {
  let state = seed >>> 0;
  const uniform = () => {
    state = (state + 0x6d2b79f5) >>> 0;
    let x = state;
    x = Math.imul(x ^ (x >>> 15), x | 1);
    x ^= x + Math.imul(x ^ (x >>> 7), x | 61);
    return ((x ^ (x >>> 14)) >>> 0) / 4_294_967_296;
  };
  let spare: number | null = null;
  return () => {
    if (spare !== null) {
      const value = spare;
      spare = null;
      return value;
    }
    const u = Math.max(uniform(), 1e-12);
    const v = uniform();
    const r = Math.sqrt(-2 * Math.log(u));
    spare = r * Math.sin(2 * Math.PI * v);
    return r * Math.cos(2 * Math.PI * v);
  };
}
