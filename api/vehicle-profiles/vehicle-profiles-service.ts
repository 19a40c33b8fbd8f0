import type { User } from '@shared/domain/auth';
import type {
  CapabilityCurvesResponse,
  CapabilityQuery,
  VehicleProfile,
  VehicleProfileDraft,
  VehicleProfileVersion,
} from '@shared/domain/vehicle-profiles';
import { capabilityCurves } from '@shared/engine/capability-curves';
import type { Database } from '../db/client';
import { ConflictError, NotFoundError } from '../http/http-error';
import { type Actor, recordAudit } from '../audit/audit-log';
import * as repository from './vehicle-profiles-repository';

export async function getProfile(db: Database, id: string): Promise<VehicleProfile> {
  const row = await repository.findProfile(db, id);
  if (!row) throw new NotFoundError('The vehicle profile');
  return repository.toVehicleProfile(row);
}

export async function createProfile(db: Database, user: User, draft: VehicleProfileDraft): Promise<VehicleProfile> {
  return db.transaction(async (tx) => {
    const row = await repository.insertProfile(tx, draft, { id: user.id, name: user.name });
    await recordAudit(tx, actorOf(user), { action: 'create', kind: 'vehicle-profile', entityId: row.id, entityName: row.name });
    return repository.toVehicleProfile(row);
  });
}

/** Saves a change as the profile's next version (scenarios using it become stale). */
export async function updateProfile(db: Database, user: User, id: string, draft: VehicleProfileDraft): Promise<VehicleProfile> {
  return db.transaction(async (tx) => {
    const row = await repository.lockProfile(tx, id);
    if (!row) throw new NotFoundError('The vehicle profile');
    if (row.isPreset) throw presetConflict();
    const updated = await repository.saveProfileVersion(tx, row, draft, { id: user.id, name: user.name });
    await recordAudit(tx, actorOf(user), { action: 'update', kind: 'vehicle-profile', entityId: id, entityName: updated.name });
    return repository.toVehicleProfile(updated);
  });
}

/** Every recorded version of a profile, newest first (presets have none). */
export async function listVersions(db: Database, id: string): Promise<VehicleProfileVersion[]> {
  await getProfile(db, id);
  return repository.listVersions(db, id);
}

/** Deletes a profile, restorably (hidden everywhere, removed for good after the retention period). */
export async function deleteProfile(db: Database, user: User, id: string): Promise<void> {
  await db.transaction(async (tx) => {
    const row = await repository.lockProfile(tx, id);
    if (!row) throw new NotFoundError('The vehicle profile');
    if (row.isPreset) throw presetConflict();
    const measured = await repository.countCalibrationData(tx, id);
    if (measured > 0) {
      throw new ConflictError(
        'The vehicle profile has logged trips or calibrations; delete its logged trips first (calibrations go with them)',
        'vehicle_profile_has_logged_trips',
        { count: measured },
      );
    }
    const used = await repository.countScenariosUsingProfile(tx, id);
    if (used > 0) {
      throw new ConflictError(
        `The vehicle profile is used by ${used} scenario${used === 1 ? '' : 's'}; delete them or give them another vehicle first`,
        'vehicle_profile_in_use',
        { scenarioCount: used },
      );
    }
    await repository.markProfileDeleted(tx, id, actorOf(user));
    await recordAudit(tx, actorOf(user), { action: 'delete', kind: 'vehicle-profile', entityId: id, entityName: row.name });
  });
}

/** Brings a deleted profile back as it was. */
export async function restoreProfile(db: Database, user: User, id: string): Promise<VehicleProfile> {
  return db.transaction(async (tx) => {
    const row = await repository.lockProfile(tx, id, true);
    if (!row?.deletedAt) throw new NotFoundError('A deleted vehicle profile with that id');
    await repository.markProfileRestored(tx, id);
    await recordAudit(tx, actorOf(user), { action: 'restore', kind: 'vehicle-profile', entityId: id, entityName: row.name });
    return repository.toVehicleProfile({ ...row, deletedAt: null, deletedById: null, deletedByName: null });
  });
}

function actorOf(user: User): Actor {
  return { id: user.id, name: user.name };
}

/** Capability chart for one load case, with the season's ambient temperature for the air density. */
export async function profileCapability(db: Database, id: string, query: CapabilityQuery): Promise<CapabilityCurvesResponse> {
  const profile = await getProfile(db, id);
  const vehicle = { ...profile.vehicle, payloadKg: profile.loadsKg[query.load] };
  const curves = capabilityCurves(vehicle, { altitudeM: query.altitudeM, ambientC: profile.seasons[query.season].ambientC });
  return { vehicleProfileId: id, load: query.load, massKg: vehicle.curbMassKg + vehicle.payloadKg, ...curves };
}

function presetConflict() {
  return new ConflictError('Presets are read-only; copy the preset into a profile of your own to change it', 'preset_read_only');
}
