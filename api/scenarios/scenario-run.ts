/**
 * Prepares a scenario's trip for the engine and turns the engine's outcome into what the
 * scenario records. The trip itself (directions, layover cooling, SOC carried over, reversal,
 * combined totals) is the engine's `runRoundTrip` (shared/engine/round-trip.ts).
 *
 * - vehicle: the profile's parameters with payloadKg from the load case (or passengers ×
 *   passengerMassKg) and auxPowerW from the season;
 * - conditions: the season's ambient temperature, the start SOC;
 * - options: spacing, smoothing window and descent speed cap from the scenario; speed limits from
 *   the route (its stretches, the default limit between them); the route's stops with their dwell
 *   when `useStops`; the network's safety settings with the profile's heaviest credible mass.
 *
 * A run never throws for terrain or engine-input problems: it answers a plain failure reason
 * (e.g. "no terrain covers 3.2–4.5 km of the outbound direction") for the scenario to record.
 */
import type { Summary } from '@shared/domain/analysis';
import type { DirectionResult, ScenarioDraft } from '@shared/domain/scenarios';
import type { VehicleProfile } from '@shared/domain/vehicle-profiles';
import { ENGINE_VERSION } from '@shared/engine/constants';
import { runRoundTrip, type TripInputs, type TripPlan } from '@shared/engine/round-trip';
import { EngineInputError, MissingElevationError, UncoveredTerrainError } from '@shared/engine/validation';
import type { RouteAnalyser } from '../analysis/analysis-pool';
import type { NetworkSafetySettings } from '../board/network-settings';
import type { RouteVersion } from '../road-routes/road-routes-repository';

export type ScenarioSettings = Pick<ScenarioDraft, 'direction' | 'load' | 'season' | 'startSoc' | 'options'>;

export type RunInputs = TripInputs;

export type RunOutcome =
  | { ok: true; summary: Summary; directions: DirectionResult[]; inputs: RunInputs; engineVersion: string }
  | { ok: false; failureReason: string; inputs: RunInputs; engineVersion: string };

/** Payload and conditions a scenario's load and season resolve to. */
export function resolveLoadAndSeason(profile: VehicleProfile, settings: ScenarioSettings) {
  const payloadKg =
    settings.load.kind === 'case' ? profile.loadsKg[settings.load.case] : settings.load.passengers * profile.passengerMassKg;
  const season = settings.season.kind === 'season' ? profile.seasons[settings.season.season] : settings.season;
  return { payloadKg, ambientC: season.ambientC, auxPowerW: season.auxPowerW };
}

/** The engine's trip plan for a scenario on one route version. */
export function scenarioTripPlan(
  route: Pick<RouteVersion, 'coordinates' | 'stops' | 'speedLimits' | 'defaultSpeedLimitKph' | 'lengthM'>,
  profile: VehicleProfile,
  settings: ScenarioSettings,
  safety?: NetworkSafetySettings,
): TripPlan {
  const { payloadKg, ambientC, auxPowerW } = resolveLoadAndSeason(profile, settings);
  const { options } = settings;
  return {
    line: route,
    direction: settings.direction,
    vehicle: { ...profile.vehicle, payloadKg, auxPowerW },
    ambientC,
    startSoc: settings.startSoc,
    layoverS: options.layoverS,
    spacingM: options.spacingM,
    smoothingWindowM: options.smoothingWindowM,
    ...(options.descentSpeedCapKph === undefined ? {} : { descentSpeedCapKph: options.descentSpeedCapKph }),
    useStops: options.useStops,
    safety: { ...(safety ?? {}), worstCaseMassKg: heaviestMassKg(profile) },
  };
}

/**
 * Heaviest mass of a profile's worst credible case, kg: its permissible gross mass when stated,
 * and never less than its own heaviest load case.
 */
export function heaviestMassKg(profile: VehicleProfile): number {
  const heaviestLoad = Math.max(profile.loadsKg.empty, profile.loadsKg.seated, profile.loadsKg['full-standing']);
  return Math.max(profile.vehicle.permissibleGrossMassKg ?? 0, profile.vehicle.curbMassKg + heaviestLoad);
}

export async function runScenario(
  route: RouteVersion,
  profile: VehicleProfile,
  settings: ScenarioSettings,
  analyse: RouteAnalyser,
  safety?: NetworkSafetySettings,
): Promise<RunOutcome> {
  const outcome = await runRoundTrip(scenarioTripPlan(route, profile, settings, safety), analyse);
  if (!outcome.ok) {
    // Terrain gaps and engine input limits are outcomes to record, not server faults.
    const failure = failureReason(outcome.error, outcome.direction, outcome.legCount > 1);
    return { ok: false, failureReason: failure, inputs: outcome.inputs, engineVersion: ENGINE_VERSION };
  }
  return { ok: true, summary: outcome.summary, directions: outcome.directions, inputs: outcome.inputs, engineVersion: ENGINE_VERSION };
}

function failureReason(error: EngineInputError, direction: string, roundTrip: boolean): string {
  const where = roundTrip ? ` of the ${direction} direction` : '';
  if (error instanceof UncoveredTerrainError) {
    const refused = (error.stretches as { fromM: number; toM: number; filled?: boolean }[]).filter((stretch) => !stretch.filled);
    const list = refused.map((stretch) => `${km(stretch.fromM)}–${km(stretch.toM)} km`).join(', ');
    return `no terrain covers ${list}${where}; upload a terrain model that covers it, or give the route's positions elevations`;
  }
  if (error instanceof MissingElevationError) {
    return `the route's positions carry no elevation and no terrain is available to sample${where}`;
  }
  return `the calculation refused an input${where}: ${error.message}`;
}

function km(metres: number): string {
  return (metres / 1_000).toFixed(1);
}
