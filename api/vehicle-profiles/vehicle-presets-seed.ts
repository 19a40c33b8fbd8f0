/**
 * The generic vehicle classes of shared/engine/vehicle-presets.ts as read-only vehicle profiles.
 * They must exist in every environment (not only the demo), so `ensureVehiclePresets` runs at API
 * start (main.ts), in the demo seed and in the specs that need them. It is idempotent: each
 * preset has a fixed id derived from its class id, and a row is rewritten only when the preset's
 * values changed in code (so scenarios are not marked stale by a mere restart).
 */
import { createHash } from 'node:crypto';
import { sql } from 'drizzle-orm';
import { vehicleSchema } from '@shared/domain/analysis';
import type { VehicleProfileDraft } from '@shared/domain/vehicle-profiles';
import { PASSENGER_MASS_KG, VEHICLE_PRESETS, type VehiclePreset } from '@shared/engine/vehicle-presets';
import type { Executor } from '../db/client';
import { vehicleProfiles } from '../db/schema/index';

/**
 * Ambient temperature per season for the presets, °C (from memory: a winter day in an alpine
 * valley around −5 °C, a mild spring/autumn day 10 °C, a summer afternoon 25 °C).
 */
export const PRESET_SEASON_AMBIENT_C = { winter: -5, mild: 10, summer: 25 } as const;

/** Deterministic UUID (version-5 layout over SHA-1) for a seeded row, the same in every environment. */
export function seededUuid(key: string): string {
  const hex = createHash('sha1').update(`descentry:${key}`).digest('hex');
  const variant = ((parseInt(hex.slice(16, 18), 16) & 0x3f) | 0x80).toString(16).padStart(2, '0');
  return `${hex.slice(0, 8)}-${hex.slice(8, 12)}-5${hex.slice(13, 16)}-${variant}${hex.slice(18, 20)}-${hex.slice(20, 32)}`;
}

export function presetProfileId(presetId: string): string {
  return seededUuid(`vehicle-preset:${presetId}`);
}

export function presetDraft(preset: VehiclePreset): VehicleProfileDraft {
  return {
    name: preset.name,
    description: `Generic ${preset.name.toLowerCase()} class: ${preset.seats} seats, ${preset.standingPlaces} standing places. Starting values for the class, not for a particular make or model: copy it and enter your own vehicles’ figures from the maker’s data sheets.`,
    vehicleClass: preset.id,
    vehicle: vehicleSchema.parse(preset.vehicle),
    loadsKg: { empty: preset.payloadKg.empty, seated: preset.payloadKg.seated, 'full-standing': preset.payloadKg.full },
    passengerMassKg: PASSENGER_MASS_KG,
    seasons: {
      winter: { ambientC: PRESET_SEASON_AMBIENT_C.winter, auxPowerW: preset.auxPowerW.winter },
      mild: { ambientC: PRESET_SEASON_AMBIENT_C.mild, auxPowerW: preset.auxPowerW.mild },
      summer: { ambientC: PRESET_SEASON_AMBIENT_C.summer, auxPowerW: preset.auxPowerW.summer },
    },
  };
}

export async function ensureVehiclePresets(db: Executor): Promise<void> {
  const rows = VEHICLE_PRESETS.map((preset) => ({
    id: presetProfileId(preset.id),
    seedKey: `vehicle-preset:${preset.id}`,
    isPreset: true,
    ...presetDraft(preset),
  }));
  await db
    .insert(vehicleProfiles)
    .values(rows)
    .onConflictDoUpdate({
      target: vehicleProfiles.id,
      set: {
        name: sql`excluded.name`,
        description: sql`excluded.description`,
        vehicleClass: sql`excluded.vehicle_class`,
        vehicle: sql`excluded.vehicle`,
        loadsKg: sql`excluded.loads_kg`,
        passengerMassKg: sql`excluded.passenger_mass_kg`,
        seasons: sql`excluded.seasons`,
        isPreset: sql`true`,
        updatedAt: sql`now()`,
      },
      setWhere: sql`(${vehicleProfiles.vehicle}, ${vehicleProfiles.loadsKg}, ${vehicleProfiles.seasons}, ${vehicleProfiles.name}, ${vehicleProfiles.description}, ${vehicleProfiles.passengerMassKg})
        is distinct from (excluded.vehicle, excluded.loads_kg, excluded.seasons, excluded.name, excluded.description, excluded.passenger_mass_kg)`,
    });
}
