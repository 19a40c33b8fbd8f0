/**
 * Builds the engine inputs of a scenario and runs them.
 *
 * - vehicle: the profile's parameters with payloadKg from the load case (or passengers ×
 *   passengerMassKg) and auxPowerW from the season;
 * - conditions: the season's ambient temperature, the start SOC;
 * - options: spacing, smoothing window and descent speed cap from the scenario; speed limits from
 *   the route (its stretches, the default limit between them); the route's stops with their dwell
 *   when `useStops`;
 * - inbound: the outbound line reversed, stops and stretches mirrored (atM → length − atM);
 * - round trip: outbound, then a layover at the far terminal, then inbound. The inbound run starts
 *   with the outbound end SOC and with the brake temperature the layover leaves: the lumped brake
 *   model cooling at standstill (no heat in, still-air convection and radiation) for `layoverS`.
 *   Totals combine both directions with the engine's `combineDirections`.
 *
 * A run never throws for terrain or engine-input problems: it answers a plain failure reason
 * (e.g. "no terrain covers 3.2–4.5 km of the outbound direction") for the scenario to record.
 */
import type { PreviewRequestInput, Summary } from '@shared/domain/analysis';
import type { DirectionResult, ScenarioDraft } from '@shared/domain/scenarios';
import type { VehicleProfile } from '@shared/domain/vehicle-profiles';
import { advanceBrakeTemperatureC, brakeConvectionWPerM2K } from '@shared/engine/brake-thermal';
import { ENGINE_VERSION } from '@shared/engine/constants';
import { combineDirections } from '@shared/engine/summary';
import { EngineInputError, UncoveredTerrainError } from '@shared/engine/validation';
import type { RouteAnalyser } from '../analysis/analysis-pool';
import type { NetworkSafetySettings } from '../board/network-settings';
import type { RouteVersion } from '../road-routes/road-routes-repository';
import { engineSpeedLimits, mirrorRoute } from '../road-routes/route-geometry';

export type ScenarioSettings = Pick<ScenarioDraft, 'direction' | 'load' | 'season' | 'startSoc' | 'options'>;

export interface RunInputs {
  directions: { direction: 'outbound' | 'inbound'; request: PreviewRequestInput }[];
  layover?: { durationS: number; brakeTempBeforeC: number; brakeTempAfterC: number; ambientC: number };
}

export type RunOutcome =
  | { ok: true; summary: Summary; directions: DirectionResult[]; inputs: RunInputs; engineVersion: string }
  | { ok: false; failureReason: string; inputs: RunInputs; engineVersion: string };

/** Payload and conditions a scenario's load and season resolve to. */
export function resolveLoadAndSeason(profile: VehicleProfile, settings: ScenarioSettings) {
  const payloadKg = settings.load.kind === 'case' ? profile.loadsKg[settings.load.case] : settings.load.passengers * profile.passengerMassKg;
  const season = settings.season.kind === 'season' ? profile.seasons[settings.season.season] : settings.season;
  return { payloadKg, ambientC: season.ambientC, auxPowerW: season.auxPowerW };
}

type RouteForRun = Pick<RouteVersion, 'coordinates' | 'stops' | 'speedLimits' | 'defaultSpeedLimitKph' | 'lengthM'>;

/**
 * A route version prepared for the engine in one direction: the line in the direction of travel
 * and the route's options (spacing, smoothing, descent speed cap, speed limits, stops with dwell,
 * safety settings with the profile's heaviest mass). Scenario runs and service-day runs both
 * prepare their trips here.
 */
export function directionRoute(
  route: RouteForRun,
  direction: 'outbound' | 'inbound',
  profile: VehicleProfile,
  options: Pick<ScenarioDraft['options'], 'spacingM' | 'smoothingWindowM' | 'descentSpeedCapKph' | 'useStops'>,
  safety?: NetworkSafetySettings,
): { route: PreviewRequestInput['route']; options: NonNullable<PreviewRequestInput['options']> } {
  const line = direction === 'outbound' ? route : mirrorRoute(route);
  return {
    route: { type: 'LineString', coordinates: line.coordinates },
    options: {
      spacingM: options.spacingM,
      smoothingWindowM: options.smoothingWindowM,
      ...(options.descentSpeedCapKph === undefined ? {} : { descentSpeedCapKph: options.descentSpeedCapKph }),
      speedLimitKph: engineSpeedLimits(line.speedLimits, route.defaultSpeedLimitKph, route.lengthM),
      stops: options.useStops
        ? line.stops.filter((stop) => stop.atM <= route.lengthM).map((stop) => ({ atM: stop.atM, dwellS: stop.dwellS, name: stop.name }))
        : [],
      safety: { ...(safety ?? {}), worstCaseMassKg: heaviestMassKg(profile) },
    },
  };
}

/** The engine request for one direction. */
export function directionRequest(
  route: RouteForRun,
  direction: 'outbound' | 'inbound',
  profile: VehicleProfile,
  settings: ScenarioSettings,
  startSoc: number,
  initialBrakeTempC?: number,
  safety?: NetworkSafetySettings,
): PreviewRequestInput {
  const { payloadKg, ambientC, auxPowerW } = resolveLoadAndSeason(profile, settings);
  const prepared = directionRoute(route, direction, profile, settings.options, safety);
  return {
    route: prepared.route,
    vehicle: { ...profile.vehicle, payloadKg, auxPowerW },
    conditions: { ambientC, startSoc, ...(initialBrakeTempC === undefined ? {} : { initialBrakeTempC }) },
    options: prepared.options,
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
  const inputs: RunInputs = { directions: [] };
  const order: ('outbound' | 'inbound')[] =
    settings.direction === 'round-trip' ? ['outbound', 'inbound'] : [settings.direction];
  const results: DirectionResult[] = [];
  let startSoc = settings.startSoc;
  let initialBrakeTempC: number | undefined;
  for (const direction of order) {
    if (direction === 'inbound' && results.length > 0) {
      const previous = results[results.length - 1]!;
      startSoc = previous.summary.endSoc;
      const { ambientC } = resolveLoadAndSeason(profile, settings);
      const before = previous.profile.brakeTempC.at(-1)!;
      const after = advanceBrakeTemperatureC({
        temperatureC: before,
        ambientC,
        heatInW: 0,
        convectionWPerM2K: brakeConvectionWPerM2K(0),
        coolingAreaM2: profile.vehicle.brakeCoolingAreaM2 ?? 1.6,
        thermalMassJPerK: profile.vehicle.brakeThermalMassJPerK ?? 92_000,
        emissivity: profile.vehicle.brakeEmissivity ?? 0.6,
        durationS: settings.options.layoverS,
      });
      inputs.layover = { durationS: settings.options.layoverS, brakeTempBeforeC: before, brakeTempAfterC: after, ambientC };
      initialBrakeTempC = after;
    }
    const request = directionRequest(route, direction, profile, settings, startSoc, initialBrakeTempC, safety);
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
      // Terrain gaps and engine input limits are outcomes to record, not server faults.
      if (error instanceof EngineInputError) {
        return { ok: false, failureReason: failureReason(error, direction, order.length > 1), inputs, engineVersion: ENGINE_VERSION };
      }
      throw error;
    }
  }
  const summary = results.length === 2 ? combineDirections(results[0]!.summary, results[1]!.summary) : results[0]!.summary;
  return { ok: true, summary, directions: results, inputs, engineVersion: ENGINE_VERSION };
}

function failureReason(error: EngineInputError, direction: string, roundTrip: boolean): string {
  const where = roundTrip ? ` of the ${direction} direction` : '';
  if (error instanceof UncoveredTerrainError) {
    const refused = (error.stretches as { fromM: number; toM: number; filled?: boolean }[]).filter((stretch) => !stretch.filled);
    const list = refused.map((stretch) => `${km(stretch.fromM)}–${km(stretch.toM)} km`).join(', ');
    return `no terrain covers ${list}${where}; upload a terrain model that covers it, or give the route's positions elevations`;
  }
  if (/carry no elevation and no elevation source/.test(error.message)) {
    return `the route's positions carry no elevation and no terrain is available to sample${where}`;
  }
  return `the calculation refused an input${where}: ${error.message}`;
}

function km(metres: number): string {
  return (metres / 1_000).toFixed(1);
}
