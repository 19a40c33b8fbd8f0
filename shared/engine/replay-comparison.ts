/**
 * Measured against modelled for a replayed trip.
 *
 * The replay moves through steps: runs of consecutive segments of the replay line lasting at least
 * `REPLAY_STEP_S` together (measured time), and each dwell at a point. For every step the
 * measured battery power is the mean over the measured time of that step (measured energy /
 * measured duration) and the modelled power is the engine's: its segment powers held over the
 * measured time of each segment, and the auxiliary power while standing. Steps of a few seconds
 * rather than single 10 m segments let the inertia work telescope (½·m·(v_end² − v_start²) over
 * the step), so speed noise at single points does not show as power noise, and keep logged
 * power samples at 1 Hz meaningful. Errors are weighted by the measured duration, so the
 * statistics are integrals over the trip's time:
 *
 *   rms  = √(Σ Δtₖ·(P_model,k − P_meas,k)² / Σ Δtₖ)
 *   bias = Σ Δtₖ·(P_model,k − P_meas,k) / Σ Δtₖ          (positive: the model draws more)
 *   energy difference % = 100·(E_model − E_meas) / |E_meas|, E = Σ P·Δt over measured durations
 *
 * SOC and brake temperature are compared at the points where they were logged.
 */
import type { RouteModel } from './route-simulation';
import type { RouteRun } from './route-run';
import type { AlignedTrip } from './trip-alignment';

/** Shortest run of segments compared as one step, s (measured time). */
export const REPLAY_STEP_S = 10;

/** One step of a replay with measured and modelled battery power. */
export interface ReplaySteps {
  /** Measured mean battery power, W (positive while discharging). */
  measuredW: Float64Array;
  modelledW: Float64Array;
  /** Measured duration, s. */
  durationS: Float64Array;
  /** Distance (m) and measured time (s) at the start of each step. */
  distanceM: Float64Array;
  timeS: Float64Array;
}

/** Steps of a replay (per the module comment); measured power needs the battery channel. */
export function replaySteps(model: RouteModel, run: RouteRun, trip: AlignedTrip): ReplaySteps | null {
  const { energyJ, dwellEnergyJ } = trip;
  if (!energyJ || !dwellEnergyJ) return null;
  assertAligned(model, trip);
  const n = trip.distanceM.length;
  const measured: number[] = [];
  const modelled: number[] = [];
  const duration: number[] = [];
  const distance: number[] = [];
  const time: number[] = [];
  const auxW = model.powertrain.auxPowerW;
  // The run of segments gathered so far.
  let open = false;
  let openDistance = 0;
  let openTime = 0;
  let openS = 0;
  let openMeasuredJ = 0;
  let openModelledJ = 0;
  const flush = () => {
    if (open && openS > 1e-6) {
      measured.push(openMeasuredJ / openS);
      modelled.push(openModelledJ / openS);
      duration.push(openS);
      distance.push(openDistance);
      time.push(openTime);
    }
    open = false;
    openS = openMeasuredJ = openModelledJ = 0;
  };
  for (let i = 0; i < n; i++) {
    const dwell = trip.dwellS[i]!;
    if (dwell > 0) {
      flush();
      measured.push(dwellEnergyJ[i]! / dwell);
      modelled.push(auxW);
      duration.push(dwell);
      distance.push(trip.distanceM[i]!);
      time.push(trip.arriveS[i]!);
    }
    if (i === n - 1) break;
    const leave = trip.arriveS[i]! + dwell;
    const dt = trip.arriveS[i + 1]! - leave;
    if (dt <= 1e-6) continue;
    if (!open) {
      open = true;
      openDistance = trip.distanceM[i]!;
      openTime = leave;
    }
    openS += dt;
    openMeasuredJ += energyJ[i + 1]! - energyJ[i]! - dwellEnergyJ[i]!;
    openModelledJ += run.batteryPowerW[i]! * dt;
    if (openS >= REPLAY_STEP_S) flush();
  }
  flush();
  return {
    measuredW: Float64Array.from(measured),
    modelledW: Float64Array.from(modelled),
    durationS: Float64Array.from(duration),
    distanceM: Float64Array.from(distance),
    timeS: Float64Array.from(time),
  };
}

export interface ErrorStatistics {
  rms: number;
  bias: number;
}

export interface PowerComparison {
  rmsErrorW: number;
  biasW: number;
  measuredEnergyWh: number;
  modelledEnergyWh: number;
  energyErrorPercent: number;
}

/** Duration-weighted error statistics of battery power over one or more replays. */
export function comparePower(steps: readonly ReplaySteps[]): PowerComparison {
  let weight = 0;
  let sum = 0;
  let sumSq = 0;
  let measuredJ = 0;
  let modelledJ = 0;
  for (const set of steps) {
    for (let k = 0; k < set.measuredW.length; k++) {
      const dt = set.durationS[k]!;
      const error = set.modelledW[k]! - set.measuredW[k]!;
      weight += dt;
      sum += dt * error;
      sumSq += dt * error * error;
      measuredJ += dt * set.measuredW[k]!;
      modelledJ += dt * set.modelledW[k]!;
    }
  }
  const measuredEnergyWh = measuredJ / 3_600;
  const modelledEnergyWh = modelledJ / 3_600;
  return {
    rmsErrorW: weight > 0 ? Math.sqrt(sumSq / weight) : 0,
    biasW: weight > 0 ? sum / weight : 0,
    measuredEnergyWh,
    modelledEnergyWh,
    energyErrorPercent: Math.abs(measuredJ) > 0 ? (100 * (modelledJ - measuredJ)) / Math.abs(measuredJ) : 0,
  };
}

/** RMS and bias (modelled − measured) at the points where `measured` has a value. */
export function comparePointValues(measured: readonly (number | null)[], modelled: ArrayLike<number>): ErrorStatistics | null {
  let count = 0;
  let sum = 0;
  let sumSq = 0;
  measured.forEach((value, i) => {
    if (value === null || !Number.isFinite(value)) return;
    const error = modelled[i]! - value;
    count++;
    sum += error;
    sumSq += error * error;
  });
  return count > 0 ? { rms: Math.sqrt(sumSq / count), bias: sum / count } : null;
}

/** Per-point series of a replay for charts: measured and modelled at each replay point. */
export interface ReplaySeries {
  distanceM: number[];
  /** Measured time of arrival, s. */
  timeS: number[];
  speedMps: number[];
  elevationM: number[];
  lon: number[];
  lat: number[];
  measuredPowerW: (number | null)[] | null;
  modelledPowerW: number[];
  /** Cumulative battery energy at arrival, Wh (the model's power held over the measured times). */
  measuredEnergyWh: number[] | null;
  modelledEnergyWh: number[];
  measuredSoc: (number | null)[] | null;
  modelledSoc: number[];
  measuredBrakeTempC: (number | null)[] | null;
  modelledBrakeTempC: number[];
}

/** Chart series per point (segment powers in the forward convention, like a route profile). */
export function replaySeries(model: RouteModel, run: RouteRun, trip: AlignedTrip): ReplaySeries {
  assertAligned(model, trip);
  const n = trip.distanceM.length;
  const auxW = model.powertrain.auxPowerW;
  const measuredPowerW: (number | null)[] = [];
  const modelledEnergyWh: number[] = [];
  let modelledJ = 0;
  for (let i = 0; i < n; i++) {
    modelledEnergyWh.push(modelledJ / 3_600);
    const dwell = trip.dwellS[i]!;
    modelledJ += auxW * dwell;
    if (i < n - 1) {
      const dt = trip.arriveS[i + 1]! - trip.arriveS[i]! - dwell;
      modelledJ += run.batteryPowerW[i]! * Math.max(0, dt);
      if (trip.energyJ && trip.dwellEnergyJ && dt > 1e-6) {
        measuredPowerW.push((trip.energyJ[i + 1]! - trip.energyJ[i]! - trip.dwellEnergyJ[i]!) / dt);
      } else {
        measuredPowerW.push(null);
      }
    } else {
      measuredPowerW.push(measuredPowerW[n - 2] ?? null);
    }
  }
  const firstEnergyJ = trip.energyJ?.[0] ?? 0;
  return {
    distanceM: trip.distanceM,
    timeS: trip.arriveS,
    speedMps: trip.speedMps,
    elevationM: Array.from(model.elevationM),
    lon: trip.positions.map((p) => p[0]),
    lat: trip.positions.map((p) => p[1]),
    measuredPowerW: trip.energyJ ? measuredPowerW : null,
    modelledPowerW: Array.from(run.batteryPowerW),
    measuredEnergyWh: trip.energyJ ? trip.energyJ.map((e) => (e - firstEnergyJ) / 3_600) : null,
    modelledEnergyWh,
    measuredSoc: trip.soc,
    modelledSoc: Array.from(run.soc),
    measuredBrakeTempC: trip.brakeTempC,
    modelledBrakeTempC: Array.from(run.brakeTempC),
  };
}

function assertAligned(model: RouteModel, trip: AlignedTrip): void {
  if (model.pointCount !== trip.distanceM.length) {
    throw new RangeError(
      `replay: the model has ${model.pointCount} points, the trip ${trip.distanceM.length}; run replays at REPLAY_SPACING_M`,
    );
  }
}
