/**
 * Calibrations: fitting a vehicle profile to its logged trips (shared/engine/calibration-fit.ts)
 * as a job on the shared PostgreSQL queue, and the analyst's decision on the result.
 *
 * A fit never changes the profile by itself. Accepting it saves the fitted values as the
 * profile's next version (with the logged trips it was fitted on), which marks every scenario
 * using the profile stale; those scenarios are then re-run as one network run. Rejecting keeps
 * the fit on record and the profile as it was.
 */
import type { User } from '@shared/domain/auth';
import type { Calibration, CalibrationRequest, CalibrationResult } from '@shared/domain/calibrations';
import { vehicleSchema, type Vehicle } from '@shared/domain/analysis';
import type { VehicleProfile, VehicleProfileDraft } from '@shared/domain/vehicle-profiles';
import { BRAKE_FIT_PARAMETERS, fitCalibration, type CalibrationTrip, type FitParameter } from '@shared/engine/calibration-fit';
import type { AppDeps } from '../app-deps';
import type { CalibrationRow } from '../db/schema/index';
import { startScenarioReruns } from '../batch-runs/batch-runs-service';
import { BadRequestError, ConflictError, NotFoundError } from '../http/http-error';
import { jobQueueOf, runtimeOf } from '../app-runtime';
import { type JobQueue } from '../jobs/job-queue';
import * as trips from '../logged-trips/logged-trips-repository';
import { listScenarioNamesOfProfile } from '../scenarios/scenarios-repository';
import { alignedTrip, nearestSeason, replayTrip, startBrakeTempC, tripVehicle } from '../logged-trips/trip-replay';
import * as profiles from '../vehicle-profiles/vehicle-profiles-repository';
import * as repository from './calibrations-repository';

export const CALIBRATION_JOB = 'vehicle-calibration-fit';
/** The parameters fitted when the request names none (payload and brakes added where the trips call for them). */
export const DEFAULT_FIT: FitParameter[] = [
  'rollingResistanceCoefficient',
  'dragAreaM2',
  'auxPowerW',
  'drivetrainEfficiency',
  'regenEfficiency',
];

export const FIT_METHOD =
  'Bounded Levenberg–Marquardt least squares (ml-levenberg-marquardt) on battery power over the replay steps of all trips, weighted by step duration; ' +
  '95 % intervals from the Jacobian at the solution, σ̂²·(JᵀWJ)⁻¹, inflated by (1 + ρ₁)/(1 − ρ₁) for the lag-1 autocorrelation ρ₁ of the residuals, with Student-t quantiles; ' +
  'brake thermal parameters fitted on logged brake temperatures, then jointly with the powertrain, each residual scaled by its own scatter.';

export async function requestCalibration(
  deps: AppDeps,
  user: User,
  vehicleProfileId: string,
  request: CalibrationRequest,
): Promise<Calibration> {
  const profileRow = await profiles.findProfile(deps.db, vehicleProfileId);
  if (!profileRow) throw new NotFoundError('The vehicle profile');
  if (profileRow.isPreset)
    throw new ConflictError('Presets are read-only; copy the preset into a profile of your own to calibrate it', 'preset_read_only');
  const ids = [...new Set(request.loggedTripIds)];
  const rows = await trips.findTripsForProfile(deps.db, vehicleProfileId, ids);
  const missing = ids.filter((id) => !rows.some((row) => row.id === id));
  if (missing.length > 0) {
    throw new BadRequestError(`loggedTripIds: no logged trip ${missing.join(', ')} of this vehicle profile`, {
      field: 'loggedTripIds',
      missing,
    });
  }
  const withoutPower = rows.filter((row) => !row.channels.batteryPower);
  if (withoutPower.length > 0) {
    throw new BadRequestError(
      `loggedTripIds: ${withoutPower.map((row) => `“${row.name}”`).join(', ')} logged no battery power (battery_power_w, or battery_voltage_v with battery_current_a), which the fit needs`,
      { field: 'loggedTripIds', withoutBatteryPower: withoutPower.map((row) => row.id) },
    );
  }
  const anyUnknownPayload = rows.some((row) => row.payloadKg === null);
  const anyBrake = rows.some((row) => row.channels.brakeTemperature);
  let fit: FitParameter[];
  if (request.fit) {
    fit = [...new Set(request.fit)];
    if (fit.includes('payloadKg') && !anyUnknownPayload) {
      throw new BadRequestError('fit: every chosen trip has a known payload, so there is no payload to fit', { field: 'fit' });
    }
    const brakeKeys = fit.filter((key) => (BRAKE_FIT_PARAMETERS as readonly string[]).includes(key));
    if (brakeKeys.length > 0 && !anyBrake) {
      throw new BadRequestError(`fit: ${brakeKeys.join(', ')} need logged brake temperatures (brake_temp_c), and no chosen trip has them`, {
        field: 'fit',
      });
    }
  } else {
    fit = [...DEFAULT_FIT, ...(anyUnknownPayload ? (['payloadKg'] as const) : []), ...(anyBrake ? BRAKE_FIT_PARAMETERS : [])];
  }
  const row = await repository.insertCalibration(deps.db, {
    vehicleProfileId,
    profileVersion: profileRow.version,
    loggedTrips: ids.map((id) => ({ id, name: rows.find((trip) => trip.id === id)!.name })),
    parameters: fit,
    createdById: user.id,
    createdByName: user.name,
  });
  const queue = await calibrationJobs(deps);
  await queue.send(CALIBRATION_JOB, { calibrationId: row.id }, { retryLimit: 1, expireInSeconds: 15 * 60 });
  return toCalibration(row, profileRow.name);
}

/** Runs one fit. Idempotent: a calibration another worker took or finished is left alone. */
export async function runCalibrationJob(deps: AppDeps, calibrationId: string): Promise<void> {
  const claimed = await repository.claimQueuedCalibration(deps.db, calibrationId);
  if (!claimed) return;
  let result: CalibrationResult | null = null;
  let failureReason: string | null = null;
  try {
    result = await fitFor(deps, claimed);
  } catch (error) {
    // A fit that cannot run (a trip deleted meanwhile, an engine input refused) is an outcome to
    // record on the calibration; anything else is logged as well.
    console.error(`[calibrations] fit ${calibrationId} failed:`, error);
    failureReason = error instanceof Error ? error.message : String(error);
  }
  await repository.finishCalibration(deps.db, calibrationId, { result, failureReason });
}

async function fitFor(deps: AppDeps, calibration: CalibrationRow): Promise<CalibrationResult> {
  const profileRow = await profiles.findProfile(deps.db, calibration.vehicleProfileId);
  if (!profileRow) throw new Error('the vehicle profile was deleted');
  const profile = profiles.toVehicleProfile(profileRow);
  const ids = calibration.loggedTrips.map((trip) => trip.id);
  const rows = await trips.findTripsForProfile(deps.db, calibration.vehicleProfileId, ids);
  if (rows.length !== ids.length) throw new Error('a chosen logged trip was deleted before the fit ran');
  const fitTrips: CalibrationTrip[] = [];
  for (const id of ids) {
    const row = rows.find((candidate) => candidate.id === id)!;
    const detail = await replayTrip(row, tripVehicle(profile, row));
    fitTrips.push({
      id: row.id,
      name: row.name,
      model: detail.model,
      speedMps: detail.run.speedMps,
      startSoc: detail.conditions.startSoc,
      initialBrakeTempC: startBrakeTempC(row.alignment) ?? detail.model.ambientC[0]!,
      trip: alignedTrip(row.alignment),
      payloadKnown: row.payloadKg !== null,
    });
  }
  const outcome = await fitCalibration(
    { trips: fitTrips, parameters: calibration.parameters as FitParameter[] },
    { pause: () => new Promise((resolve) => setImmediate(resolve)) },
  );
  const ambient = rows.map((row) => row.ambientC).filter((value): value is number => value !== null);
  const meanAmbient = ambient.length > 0 ? ambient.reduce((a, b) => a + b, 0) / ambient.length : null;
  return {
    ...outcome,
    auxSeason: calibration.parameters.includes('auxPowerW') ? nearestSeason(profile, meanAmbient) : null,
    method: FIT_METHOD,
  };
}

export async function getCalibration(deps: Pick<AppDeps, 'db'>, id: string): Promise<Calibration> {
  const row = await repository.findCalibration(deps.db, id);
  if (!row) throw new NotFoundError('The calibration');
  const profile = await profiles.findProfile(deps.db, row.vehicleProfileId);
  return toCalibration(row, profile?.name ?? '');
}

export async function listCalibrations(deps: Pick<AppDeps, 'db'>, vehicleProfileId: string) {
  const profile = await profiles.findProfile(deps.db, vehicleProfileId);
  if (!profile) throw new NotFoundError('The vehicle profile');
  const rows = await repository.listCalibrationsOfProfile(deps.db, vehicleProfileId);
  return rows.map((row) => {
    const { residuals: _residuals, result: _result, ...rest } = toCalibration(row, profile.name);
    return rest;
  });
}

/** The profile content a fit turns into: fitted values in, everything else as it was. */
export function calibratedDraft(profile: VehicleProfile, result: CalibrationResult): VehicleProfileDraft {
  const vehicle: Record<string, unknown> = { ...profile.vehicle };
  const seasons = structuredClone(profile.seasons);
  for (const parameter of [...result.parameters, ...(result.brake?.parameters ?? [])]) {
    switch (parameter.key) {
      case 'payloadKg':
        // The trips' payload, not the vehicle's: shown, never written to the profile.
        break;
      case 'dragAreaM2':
        vehicle['dragCoefficient'] = parameter.fitted / profile.vehicle.frontalAreaM2;
        break;
      case 'auxPowerW':
        vehicle['auxPowerW'] = parameter.fitted;
        if (result.auxSeason) seasons[result.auxSeason].auxPowerW = parameter.fitted;
        break;
      default:
        vehicle[parameter.key] = parameter.fitted;
    }
  }
  return {
    name: profile.name,
    description: profile.description,
    vehicleClass: profile.vehicleClass,
    vehicle: vehicleSchema.parse(vehicle) as Vehicle,
    loadsKg: profile.loadsKg,
    passengerMassKg: profile.passengerMassKg,
    seasons,
    climate: profile.climate ?? null,
  };
}

/**
 * Accepts a finished fit: the profile's next version holds the fitted values and names the
 * logged trips; the scenarios using the profile are re-run as one network run.
 */
export async function acceptCalibration(deps: AppDeps, user: User, id: string): Promise<Calibration> {
  const author = { id: user.id, name: user.name };
  const { row, profileName } = await deps.db.transaction(async (tx) => {
    const calibration = await repository.lockCalibration(tx, id);
    if (!calibration) throw new NotFoundError('The calibration');
    assertUndecided(calibration);
    if (calibration.status !== 'done' || !calibration.result) {
      throw new ConflictError(`Only a finished fit can be accepted; this one is ${calibration.status}`, 'calibration_not_done');
    }
    const profileRow = await profiles.lockProfile(tx, calibration.vehicleProfileId);
    if (!profileRow) throw new NotFoundError('The vehicle profile');
    if (profileRow.version !== calibration.profileVersion) {
      throw new ConflictError(
        `The profile changed after this fit (it is at version ${profileRow.version}, the fit started from version ${calibration.profileVersion}); fit again on the current version`,
        'profile_changed',
      );
    }
    const profile = profiles.toVehicleProfile(profileRow);
    const decidedAt = new Date();
    const saved = await profiles.saveProfileVersion(tx, profileRow, calibratedDraft(profile, calibration.result), author, {
      calibrationId: calibration.id,
      acceptedAt: decidedAt.toISOString(),
      acceptedBy: user.name,
      loggedTrips: calibration.loggedTrips,
    });
    const updated = await repository.markCalibrationAccepted(tx, id, {
      decidedAt,
      decidedByName: user.name,
      acceptedVersion: saved.version,
    });
    return { row: updated, profileName: saved.name };
  });

  // Every scenario of the profile is stale now: re-run them all as one network run.
  const using = await listScenarioNamesOfProfile(deps.db, row.vehicleProfileId);
  if (using.length === 0) return toCalibration(row, profileName);
  const batch = await startScenarioReruns(
    deps,
    author,
    using,
    `Vehicle profile “${profileName}” version ${row.acceptedVersion} accepted from a calibration`,
  );
  const withRerun = await repository.setCalibrationRerun(deps.db, id, batch.id);
  return toCalibration(withRerun ?? row, profileName);
}

export async function rejectCalibration(deps: Pick<AppDeps, 'db'>, user: User, id: string): Promise<Calibration> {
  const calibration = await repository.findCalibration(deps.db, id);
  if (!calibration) throw new NotFoundError('The calibration');
  assertUndecided(calibration);
  if (calibration.status === 'queued' || calibration.status === 'running') {
    throw new ConflictError('The fit is still running; wait for it to finish before rejecting it', 'calibration_not_done');
  }
  const row = await repository.markCalibrationRejected(deps.db, id, user.name);
  if (!row) throw new ConflictError('The calibration was decided meanwhile', 'calibration_decided');
  const profile = await profiles.findProfile(deps.db, row.vehicleProfileId);
  return toCalibration(row, profile?.name ?? '');
}

function assertUndecided(calibration: CalibrationRow): void {
  if (calibration.decision) {
    throw new ConflictError(
      `The calibration was already ${calibration.decision} by ${calibration.decidedByName ?? 'someone'}`,
      'calibration_decided',
    );
  }
}

export function toCalibration(row: CalibrationRow, profileName: string): Calibration {
  const result = row.result ?? null;
  const all = result ? [...result.parameters, ...(result.brake?.parameters ?? [])] : [];
  return {
    id: row.id,
    vehicleProfileId: row.vehicleProfileId,
    vehicleProfileName: profileName,
    profileVersion: row.profileVersion,
    status: row.status,
    failureReason: row.failureReason,
    loggedTrips: row.loggedTrips,
    fit: row.parameters as FitParameter[],
    fitted: result ? Object.fromEntries(all.map((p) => [p.key, p.fitted])) : null,
    intervals: result ? Object.fromEntries(all.map((p) => [p.key, p.low === null || p.high === null ? null : [p.low, p.high]])) : null,
    rmsErrorW: result?.after.rmsErrorW ?? null,
    energyErrorPercent: result?.after.energyErrorPercent ?? null,
    residuals: result ? result.trips.map((trip) => ({ loggedTripId: trip.loggedTripId, name: trip.name, ...trip.residuals })) : null,
    result,
    decision: row.decision ?? null,
    decidedAt: row.decidedAt?.toISOString() ?? null,
    decidedBy: row.decidedByName ?? null,
    acceptedVersion: row.acceptedVersion ?? null,
    rerunBatchId: row.rerunBatchId ?? null,
    createdBy: row.createdByName,
    createdAt: row.createdAt.toISOString(),
    finishedAt: row.finishedAt?.toISOString() ?? null,
  };
}

export async function registerCalibrationWorkers(deps: AppDeps, queue: JobQueue): Promise<void> {
  await queue.registerWorker<{ calibrationId: string }>(CALIBRATION_JOB, (job) => runCalibrationJob(deps, job.calibrationId), {
    retryLimit: 1,
    // A fit of many long trips takes a minute or two; fifteen before a lost job is handed out again.
    expireInSeconds: 15 * 60,
  });
}

/** The app's job queue, or (tests, the demo seed) an in-process queue with the calibration worker on it. */
function calibrationJobs(deps: AppDeps): Promise<JobQueue> {
  return runtimeOf(deps).jobsFor('calibrations', (queue) => registerCalibrationWorkers(deps, queue));
}

/** Resolves when in-process calibration jobs have finished (tests and the demo seed). */
export async function waitForInlineCalibrationJobs(deps: AppDeps): Promise<void> {
  await runtimeOf(deps).inlineJobsIdle('calibrations');
}

/** Puts the calibration worker on the process's job queue when this process runs workers. */
export async function startCalibrationWorkers(deps: AppDeps): Promise<void> {
  const queue = jobQueueOf(deps);
  if (!queue) throw new Error('Attach the job queue (startTerrain) before starting the calibration workers');
  if (deps.config.RUN_WORKERS) await registerCalibrationWorkers(deps, queue);
}
