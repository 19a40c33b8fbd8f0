/**
 * A whole trip along one route line: outbound, inbound, or the round trip (outbound, a layover at
 * the far terminal, then inbound).
 *
 * - inbound: the outbound line reversed, stops and speed-limit stretches mirrored (atM → L − atM);
 * - round trip: the inbound run starts with the outbound end SOC and with the brake temperature
 *   the layover leaves: the lumped brake model cooling at standstill (no heat in, still-air
 *   convection and radiation) for `layoverS`. Totals combine both directions (`combineDirections`).
 *
 * The caller supplies the analyser (a worker pool, or `analyseRoute` in-process), so one leg's
 * calculation runs wherever the caller runs calculations. An engine input problem (terrain gap,
 * no elevations, a limit) ends the trip with the leg it stopped at, as data: it is a result to
 * record, not a fault.
 */
import type { LineString, PreviewRequestInput, PreviewResponse, Summary, VehicleInput } from '../domain/analysis';
import { advanceBrakeTemperatureC, brakeConvectionWPerM2K } from './brake-thermal';
import { combineDirections } from './summary';
import { EngineInputError } from './validation';
import { reverseRoute } from '../geometry/route-line';

export type TripLegDirection = 'outbound' | 'inbound';
export type TripDirection = TripLegDirection | 'round-trip';

/** A stop along the line, metres from its start. */
export interface TripStop {
  atM: number;
  dwellS: number;
  name: string;
}

/** A speed limit over a stretch of the line, metres from its start. */
export interface TripSpeedLimit {
  fromM: number;
  toM: number;
  speedKph: number;
}

/** The route line as drawn (outbound), with its stops and limits placed along it. */
export interface TripLine {
  coordinates: LineString['coordinates'];
  stops: readonly TripStop[];
  speedLimits: readonly TripSpeedLimit[];
  /** The limit between the stretches, km/h. */
  defaultSpeedLimitKph: number;
  /** The line's length, m: the measure its stops and stretches are placed on. */
  lengthM: number;
}

export interface TripPlan {
  line: TripLine;
  direction: TripDirection;
  /** The vehicle with its payload and auxiliary power for this trip. */
  vehicle: VehicleInput;
  ambientC: number;
  startSoc: number;
  /** Standstill at the far terminal between the two directions of a round trip, s. */
  layoverS: number;
  spacingM: number;
  smoothingWindowM: number;
  descentSpeedCapKph?: number;
  /** Whether the line's stops (with their dwell) are served. */
  useStops: boolean;
  /** Safety settings for the descents' assessment (worst case, fade margin…). */
  safety?: NonNullable<PreviewRequestInput['options']>['safety'];
}

export interface TripLegInput {
  direction: TripLegDirection;
  request: PreviewRequestInput;
}

export interface TripLayover {
  durationS: number;
  brakeTempBeforeC: number;
  brakeTempAfterC: number;
  ambientC: number;
}

/** What the trip ran on: each leg's exact engine request and the layover between them. */
export interface TripInputs {
  directions: TripLegInput[];
  layover?: TripLayover;
}

export interface TripLegResult {
  direction: TripLegDirection;
  summary: Summary;
  profile: PreviewResponse['profile'];
  descents: PreviewResponse['descents'];
  uncoveredStretches?: NonNullable<PreviewResponse['uncoveredStretches']>;
}

export type TripOutcome =
  | { ok: true; summary: Summary; directions: TripLegResult[]; inputs: TripInputs }
  | { ok: false; error: EngineInputError; direction: TripLegDirection; legCount: number; inputs: TripInputs };

export type TripAnalyser = (request: PreviewRequestInput) => Promise<PreviewResponse> | PreviewResponse;

/** The legs a direction choice runs, in order. */
export function tripLegs(direction: TripDirection): TripLegDirection[] {
  return direction === 'round-trip' ? ['outbound', 'inbound'] : [direction];
}

/** Runs every leg of `plan` with `analyse`; see the module comment. */
export async function runRoundTrip(plan: TripPlan, analyse: TripAnalyser): Promise<TripOutcome> {
  const legs = tripLegs(plan.direction);
  const inputs: TripInputs = { directions: [] };
  const results: TripLegResult[] = [];
  let startSoc = plan.startSoc;
  let initialBrakeTempC: number | undefined;
  for (const direction of legs) {
    const previous = results.at(-1);
    if (previous) {
      startSoc = previous.summary.endSoc;
      const before = previous.profile.brakeTempC.at(-1)!;
      const after = layoverBrakeTempC(plan.vehicle, before, plan.ambientC, plan.layoverS);
      inputs.layover = { durationS: plan.layoverS, brakeTempBeforeC: before, brakeTempAfterC: after, ambientC: plan.ambientC };
      initialBrakeTempC = after;
    }
    const request = legRequest(plan, direction, startSoc, initialBrakeTempC);
    inputs.directions.push({ direction, request });
    try {
      const response = await analyse(request);
      results.push({
        direction,
        summary: response.summary,
        profile: response.profile,
        descents: response.descents,
        ...(response.uncoveredStretches ? { uncoveredStretches: response.uncoveredStretches } : {}),
      });
    } catch (error) {
      if (error instanceof EngineInputError) return { ok: false, error, direction, legCount: legs.length, inputs };
      throw error;
    }
  }
  const summary = results.length === 2 ? combineDirections(results[0]!.summary, results[1]!.summary) : results[0]!.summary;
  return { ok: true, summary, directions: results, inputs };
}

/**
 * Brake temperature after a standstill of `durationS` at `ambientC`, starting from `beforeC`:
 * no heat in, still-air convection and radiation, the vehicle's lumped brake (its contract's
 * defaults where a field is absent).
 */
export function layoverBrakeTempC(vehicle: VehicleInput, beforeC: number, ambientC: number, durationS: number): number {
  return advanceBrakeTemperatureC({
    temperatureC: beforeC,
    ambientC,
    heatInW: 0,
    convectionWPerM2K: brakeConvectionWPerM2K(0),
    coolingAreaM2: vehicle.brakeCoolingAreaM2 ?? 1.6,
    thermalMassJPerK: vehicle.brakeThermalMassJPerK ?? 92_000,
    emissivity: vehicle.brakeEmissivity ?? 0.6,
    durationS,
  });
}

/** The engine request of one leg. */
export function legRequest(plan: TripPlan, direction: TripLegDirection, startSoc: number, initialBrakeTempC?: number): PreviewRequestInput {
  const { line: outbound } = plan;
  const line = direction === 'outbound' ? outbound : reverseTripLine(outbound);
  return {
    route: { type: 'LineString', coordinates: line.coordinates },
    vehicle: plan.vehicle,
    conditions: { ambientC: plan.ambientC, startSoc, ...(initialBrakeTempC === undefined ? {} : { initialBrakeTempC }) },
    options: {
      spacingM: plan.spacingM,
      smoothingWindowM: plan.smoothingWindowM,
      ...(plan.descentSpeedCapKph === undefined ? {} : { descentSpeedCapKph: plan.descentSpeedCapKph }),
      speedLimitKph: speedLimitProfile(line.speedLimits, outbound.defaultSpeedLimitKph, outbound.lengthM),
      stops: plan.useStops
        ? line.stops.filter((stop) => stop.atM <= outbound.lengthM).map((stop) => ({ atM: stop.atM, dwellS: stop.dwellS, name: stop.name }))
        : [],
      ...(plan.safety === undefined ? {} : { safety: plan.safety }),
    },
  };
}

/** The inbound direction: positions reversed, stops and stretches mirrored (atM → L − atM). */
export function reverseTripLine<Stop extends { atM: number }, Limit extends { fromM: number; toM: number }>(line: {
  coordinates: LineString['coordinates'];
  stops: readonly Stop[];
  speedLimits: readonly Limit[];
  lengthM: number;
}): { coordinates: LineString['coordinates']; stops: Stop[]; speedLimits: Limit[]; lengthM: number } {
  return reverseRoute(line);
}

/**
 * The engine's speed limit along a line: one number when no stretch is set, otherwise the
 * stretches in order with the default limit filling the gaps between them and to the end (the
 * engine's own fallback outside stretches would be the largest limit).
 */
export function speedLimitProfile(
  limits: readonly TripSpeedLimit[],
  defaultSpeedLimitKph: number,
  lengthM: number,
): number | TripSpeedLimit[] {
  if (limits.length === 0) return defaultSpeedLimitKph;
  const sorted = [...limits].sort((a, b) => a.fromM - b.fromM);
  const out: TripSpeedLimit[] = [];
  let cursorM = 0;
  for (const stretch of sorted) {
    if (stretch.fromM > cursorM) out.push({ fromM: cursorM, toM: stretch.fromM, speedKph: defaultSpeedLimitKph });
    out.push({ fromM: stretch.fromM, toM: stretch.toM, speedKph: stretch.speedKph });
    cursorM = Math.max(cursorM, stretch.toM);
  }
  if (cursorM < lengthM) out.push({ fromM: cursorM, toM: lengthM, speedKph: defaultSpeedLimitKph });
  return out;
}
