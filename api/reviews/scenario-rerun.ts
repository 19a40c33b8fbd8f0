/**
 * Re-runs a review item's scenario with a mitigation applied, to show its effect. The scenario
 * is run from its stored route version and current vehicle profile with the scenario engineer's
 * `runScenario`, on a copy of its settings; nothing is stored on the scenario (the planner's
 * scenario keeps its inputs and result), the outcome goes into the review item and its event.
 */
import type { DirectionResult } from '@shared/domain/scenarios';
import type { AppDeps } from '../app-deps';
import { analyserOf } from '../app-services';
import { ConflictError, NotFoundError } from '../http/http-error';
import * as routes from '../road-routes/road-routes-repository';
import { readSafetySettings } from '../board/network-settings';
import { runScenario } from '../scenarios/scenario-run';
import { findScenarioRow } from '../scenarios/scenarios-repository';
import * as profiles from '../vehicle-profiles/vehicle-profiles-repository';

/** What a mitigation changes in a re-run of its scenario. */
export interface MitigationOverrides {
  /** Applied as the scenario's descent speed cap, km/h (the lower of this and any existing cap). */
  descentSpeedCapKph?: number;
  /** The scenario's start SOC is lowered to this ceiling when above it, 0–1. */
  startSocCeiling?: number;
}

/** Re-runs a scenario with overrides and returns its direction results, storing nothing. */
export type MitigatedRerun = (deps: AppDeps, scenarioId: string, overrides: MitigationOverrides) => Promise<DirectionResult[]>;

export const rerunWithMitigation: MitigatedRerun = async (deps, scenarioId, overrides) => {
  const row = await findScenarioRow(deps.db, scenarioId);
  if (!row) throw new NotFoundError('The review item’s scenario');
  const routeVersion = await routes.findVersion(deps.db, row.routeId, row.routeVersion);
  const profileRow = await profiles.findProfile(deps.db, row.vehicleProfileId);
  if (!routeVersion || !profileRow) throw new NotFoundError('The scenario’s route version or vehicle profile');

  const existingCap = row.options.descentSpeedCapKph;
  const cap =
    overrides.descentSpeedCapKph === undefined
      ? existingCap
      : Math.min(overrides.descentSpeedCapKph, existingCap ?? Number.POSITIVE_INFINITY);
  const settings = {
    direction: row.direction,
    load: row.load,
    season: row.season,
    startSoc: overrides.startSocCeiling === undefined ? row.startSoc : Math.min(row.startSoc, overrides.startSocCeiling),
    options: { ...row.options, ...(cap === undefined ? {} : { descentSpeedCapKph: cap }) },
  };
  const outcome = await runScenario(
    routeVersion,
    profiles.toVehicleProfile(profileRow),
    settings,
    analyserOf(deps),
    await readSafetySettings(deps.db),
  );
  if (!outcome.ok) {
    throw new ConflictError(`The mitigated re-run could not be computed: ${outcome.failureReason}`, 'rerun_failed');
  }
  return outcome.directions;
};
