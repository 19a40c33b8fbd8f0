/**
 * Replays a stored logged trip through the engine: its own replay line (with the elevations
 * chosen at upload), its standstills as stops with their measured dwell, and its measured speed
 * in place of the minimum-time speed profile (shared/engine/analyse-route.ts, `SpeedTrace`).
 */
import type { Vehicle, VehicleInput } from '@shared/domain/analysis';
import type { LoggedTripAlignment } from '@shared/domain/logged-trips';
import { SEASONS, type Season, type VehicleProfile } from '@shared/domain/vehicle-profiles';
import { analyseRouteDetailed, type DetailedAnalysis } from '@shared/engine/analyse-route';
import { REPLAY_SPACING_M, type AlignedTrip } from '@shared/engine/trip-alignment';
import type { LoggedTripRow } from '../db/schema/index';

/** Brake temperature logged at the start: the mean of the first few logged values (one reading is noisy). */
const START_BRAKE_READINGS = 5;

/** The season whose ambient temperature is nearest the trip's (mild when the trip gives none). */
export function nearestSeason(profile: Pick<VehicleProfile, 'seasons'>, ambientC: number | null): Season {
  if (ambientC === null) return 'mild';
  return SEASONS.reduce((best, season) =>
    Math.abs(profile.seasons[season].ambientC - ambientC) < Math.abs(profile.seasons[best].ambientC - ambientC) ? season : best,
  );
}

/**
 * The vehicle of a trip: the profile's parameters with the trip's payload (the profile's seated
 * load when the payload is unknown) and the auxiliary power of the season nearest its ambient.
 */
export function tripVehicle(
  profile: Pick<VehicleProfile, 'vehicle' | 'loadsKg' | 'seasons'>,
  trip: Pick<LoggedTripRow, 'payloadKg' | 'ambientC'>,
): VehicleInput {
  return {
    ...profile.vehicle,
    payloadKg: trip.payloadKg ?? profile.loadsKg.seated,
    auxPowerW: profile.seasons[nearestSeason(profile, trip.ambientC)].auxPowerW,
  };
}

/** The stored alignment in the engine's form. */
export function alignedTrip(alignment: LoggedTripAlignment): AlignedTrip {
  return { ...alignment, lineElevationM: null, fileElevationM: null };
}

export function startBrakeTempC(alignment: LoggedTripAlignment): number | undefined {
  const readings = (alignment.brakeTempC ?? []).filter((value): value is number => value !== null).slice(0, START_BRAKE_READINGS);
  return readings.length > 0 ? readings.reduce((a, b) => a + b, 0) / readings.length : undefined;
}

/** Runs the engine on the trip with `vehicle`. */
export async function replayTrip(
  trip: Pick<LoggedTripRow, 'alignment' | 'ambientC' | 'startSoc'>,
  vehicle: VehicleInput | Vehicle,
): Promise<DetailedAnalysis> {
  const { alignment } = trip;
  const initialBrakeTempC = startBrakeTempC(alignment);
  return analyseRouteDetailed(
    {
      route: {
        type: 'LineString',
        coordinates: alignment.positions.map(([lon, lat], i) => [lon, lat, alignment.elevationM[i]!] as [number, number, number]),
      },
      vehicle,
      conditions: {
        ...(trip.ambientC === null ? {} : { ambientC: trip.ambientC }),
        startSoc: trip.startSoc ?? 0.8,
        ...(initialBrakeTempC === undefined ? {} : { initialBrakeTempC }),
      },
      options: {
        spacingM: REPLAY_SPACING_M,
        stops: alignment.distanceM.map((atM, i) => ({ atM, dwellS: alignment.dwellS[i]! })).filter((stop) => stop.dwellS > 0),
        startAtRest: false,
        endAtRest: false,
      },
    },
    {},
    { distanceM: alignment.distanceM, speedMps: alignment.speedMps },
  );
}
