/**
 * Logged trips: upload (read, check, match to a route, lay on a replay line, store), list,
 * delete, and the replay that sets the model against the measurements.
 *
 * Matching: with a `routeId` the trip must follow that route (its current version); without one
 * the saved routes passing near both ends of the track are tried and the best fit that follows
 * the track is taken; when none does, a new route is made from the filtered track (simplified by
 * the Ramer–Douglas–Peucker algorithm, turf's `simplify`, to within `NEW_ROUTE_TOLERANCE_M`).
 *
 * Elevations (`elevationSource`): `route` takes the route's own elevations, or the terrain
 * models where its positions carry none; `file` the logged `elevation_m`; `auto` (the default)
 * prefers the route and terrain, because a logger's GPS altitude scatters by metres and makes
 * the grade, and so the power, noisy. Nothing is stored from a refused file.
 */
import { simplify } from '@turf/turf';
import type { LoggedTrip, LoggedTripAlignment, LoggedTripUploadFields, ReplayComparison } from '@shared/domain/logged-trips';
import type { VehicleProfile } from '@shared/domain/vehicle-profiles';
import { fillElevationGaps } from '@shared/engine/analyse-route';
import { vehicleWithParameters } from '@shared/engine/calibration-fit';
import { ENGINEERING_CAUTION, DEFAULT_MAX_GAP_FILL_M } from '@shared/engine/constants';
import { GPS_OUTLIER_ALLOWANCE_M, GPS_SMOOTHING_WINDOW_M, fromPlane, localPlane, toPlane } from '@shared/engine/gps-track';
import { comparePointValues, comparePower, replaySeries, replaySteps } from '@shared/engine/replay-comparison';
import { alignTrip, describeMatch, matchTrackToLine, prepareTrack, type LineMatch } from '@shared/engine/trip-alignment';
import { EngineInputError } from '@shared/engine/validation';
import type { AppDeps } from '../app-deps';
import { findCalibration } from '../calibrations/calibrations-repository';
import { BadRequestError, ConflictError, NotFoundError } from '../http/http-error';
import { createRoute } from '../road-routes/road-routes-service';
import * as routes from '../road-routes/road-routes-repository';
import * as profiles from '../vehicle-profiles/vehicle-profiles-repository';
import { LoggedTripFileError, parseLoggedTripCsv, type ParsedTrip } from './logged-trip-csv';
import * as repository from './logged-trips-repository';
import { alignedTrip, replayTrip, tripVehicle } from './trip-replay';
import { SPEED_LIMIT_KPH } from '@shared/domain/limits';
import { mpsToKph } from '@shared/engine/unit-conversions';

/** Largest logged-trip file, bytes (a day of 10 Hz logging with every channel is about 15 MB). */
export const LOGGED_TRIP_MAX_BYTES = 20 * 1024 * 1024;
/** Most samples one trip may have (28 h at 1 Hz, 2.8 h at 10 Hz). */
export const LOGGED_TRIP_MAX_ROWS = 100_000;
/**
 * A trip follows a route when 95 % of its filtered fixes lie within this distance of the line, m
 * (common practice: a few metres of GNSS scatter plus a lane's offset from a line drawn down the
 * road's middle).
 */
export const ROUTE_MATCH_P95_M = 40;
/** The distance the logged speed gives may differ from the matched stretch by this share at most. */
export const ROUTE_MATCH_SCALE_TOLERANCE = 0.15;
/** Tolerance of the simplification of a track made into a new route, m. */
export const NEW_ROUTE_TOLERANCE_M = 2;

export const GPS_FILTER_METHOD = `outlier rejection by implied speed (a fix farther from the last kept one than the logged speed allows, plus ${GPS_OUTLIER_ALLOWANCE_M} m), then Savitzky–Golay smoothing of the positions over distance travelled (${GPS_SMOOTHING_WINDOW_M} m window)`;

export interface UploadedFile {
  buffer: Buffer;
  originalname: string;
}

export async function uploadLoggedTrip(
  deps: Pick<AppDeps, 'db' | 'sampleElevations'>,
  author: { id: string | null; name: string },
  vehicleProfileId: string,
  file: UploadedFile,
  fields: LoggedTripUploadFields,
  seedKey?: string,
): Promise<LoggedTrip> {
  const { db } = deps;
  const profileRow = await profiles.findProfile(db, vehicleProfileId);
  if (!profileRow) throw new NotFoundError('The vehicle profile');
  if (profileRow.isPreset) {
    throw new ConflictError(
      'Presets are generic classes and read-only; copy the preset into a profile of your own and log trips against that',
      'preset_read_only',
    );
  }
  const profile = profiles.toVehicleProfile(profileRow);
  const fileName = file.originalname || 'logged-trip.csv';
  const parsed = await parseLoggedTripCsv(file.buffer, fileName, LOGGED_TRIP_MAX_ROWS);
  const track = prepareTrack(parsed.samples);
  const travelledM = track.odometer[track.odometer.length - 1]!;
  if (travelledM < 100) {
    throw new LoggedTripFileError(
      'trip_too_short',
      { file: fileName, column: 'speed_mps' },
      `the vehicle travels only ${travelledM.toFixed(0)} m by its logged speed; a trip must cover at least 100 m`,
    );
  }

  // The route: given, matched among the saved ones, or made from the track.
  let route: {
    routeId: string | null;
    version: number | null;
    name: string;
    coordinates: number[][];
    how: 'given' | 'matched' | 'created';
  };
  let match: LineMatch;
  if (fields.routeId) {
    const row = await routes.findRoute(db, fields.routeId);
    const version = row ? await routes.findVersion(db, row.id, row.currentVersion) : undefined;
    if (!row || !version) throw new BadRequestError(`routeId: no route ${fields.routeId}`, { field: 'routeId' });
    match = matchTrackToLine(track, version.coordinates);
    if (!follows(match)) {
      throw new LoggedTripFileError(
        'trip_off_route',
        { file: fileName, row: match.maxOffsetIndex + 2, column: 'lat, lon' },
        `the trip does not follow the route “${version.name}”: ${describeMatch(match)} (a trip follows a route when 95 % of its fixes lie within ${ROUTE_MATCH_P95_M} m and the distances agree within ${ROUTE_MATCH_SCALE_TOLERANCE * 100} %); leave the route out to match another or make a new one`,
      );
    }
    route = { routeId: row.id, version: version.version, name: version.name, coordinates: version.coordinates, how: 'given' };
  } else {
    const first: [number, number] = [track.filteredLon[0]!, track.filteredLat[0]!];
    const last: [number, number] = [track.filteredLon.at(-1)!, track.filteredLat.at(-1)!];
    const candidates = await repository.routesNear(db, first, last, 2 * ROUTE_MATCH_P95_M);
    let best: { candidate: (typeof candidates)[number]; match: LineMatch } | null = null;
    for (const candidate of candidates) {
      const candidateMatch = matchTrackToLine(track, candidate.coordinates);
      if (follows(candidateMatch) && (!best || candidateMatch.p95OffsetM < best.match.p95OffsetM))
        best = { candidate, match: candidateMatch };
    }
    if (best) {
      match = best.match;
      route = {
        routeId: best.candidate.routeId,
        version: best.candidate.version,
        name: best.candidate.name,
        coordinates: best.candidate.coordinates,
        how: 'matched',
      };
    } else {
      const coordinates = routeFromTrack(track.filteredLon, track.filteredLat);
      match = matchTrackToLine(track, coordinates);
      route = {
        routeId: null,
        version: null,
        name: `Logged route: ${fields.name ?? stripExtension(fileName)}`.slice(0, 120),
        coordinates,
        how: 'created',
      };
    }
  }

  let aligned;
  try {
    aligned = alignTrip(parsed.samples, track, route.coordinates, match);
  } catch (error) {
    // The engine refuses a trip that does not move along the line; that is the file's fault.
    if (error instanceof EngineInputError) throw new LoggedTripFileError('trip_not_on_route', { file: fileName }, error.message);
    throw error;
  }
  const { elevationM, elevationSource } = await chooseElevations(deps, aligned, fields.elevationSource, fileName);

  const payload = tripPayload(parsed, fields, profile);
  const ambientC = fields.ambientC ?? mean(parsed.ambientC);
  const alignment: LoggedTripAlignment = {
    positions: aligned.positions,
    elevationM,
    distanceM: aligned.distanceM,
    arriveS: aligned.arriveS,
    dwellS: aligned.dwellS,
    speedMps: aligned.speedMps,
    energyJ: aligned.energyJ,
    dwellEnergyJ: aligned.dwellEnergyJ,
    soc: aligned.soc,
    brakeTempC: aligned.brakeTempC,
  };
  const name = fields.name ?? stripExtension(fileName);
  const row = await db.transaction(async (tx) => {
    let routeId = route.routeId;
    let routeVersion = route.version;
    if (route.how === 'created') {
      const maxKph = mpsToKph(Math.max(...parsed.samples.speedMps));
      const created = await createRoute(tx, author, {
        name: route.name,
        description: `Made from the GPS track of the logged trip “${name}” (${fileName}); check it and add stops and speed limits before planning with it.`,
        mode:
          profile.vehicleClass.includes('tram') || profile.vehicleClass.includes('rail')
            ? 'tram'
            : profile.vehicle.powerSource === 'overhead-line'
              ? 'trolleybus'
              : 'bus',
        geometry: { type: 'LineString', coordinates: route.coordinates as [number, number][] },
        stops: [],
        speedLimits: [],
        defaultSpeedLimitKph: Math.min(SPEED_LIMIT_KPH.max, Math.max(20, Math.ceil(maxKph / 10) * 10)),
        tripsPerDay: 0,
        serviceDaysPerYear: 360,
      });
      routeId = created.id;
      routeVersion = created.version;
    }
    return repository.insertTrip(tx, {
      vehicleProfileId,
      name,
      fileName,
      startedAt: parsed.startedAt ? new Date(parsed.startedAt) : null,
      samples: parsed.rows,
      durationS: parsed.samples.timeS.at(-1)!,
      lengthM: match.toM - match.fromM,
      routeId,
      routeVersion,
      routeName: route.name,
      routeCreated: route.how,
      direction: match.direction,
      fromM: match.fromM,
      toM: match.toM,
      payloadKg: payload.payloadKg,
      payloadSource: payload.source,
      ambientC,
      elevationSource,
      startSoc: aligned.soc?.find((value) => value !== null) ?? null,
      channels: {
        batteryPower: parsed.samples.batteryPowerW !== null,
        soc: parsed.samples.soc !== null,
        brakeTemperature: parsed.samples.brakeTempC !== null,
        elevation: parsed.samples.elevationM !== null,
        ambient: parsed.ambientC !== null,
        passengers: parsed.passengers !== null,
      },
      columns: parsed.columns,
      ignoredColumns: parsed.ignoredColumns,
      gps: {
        method: GPS_FILTER_METHOD,
        outliersRemoved: track.outliers,
        p95OffsetM: match.p95OffsetM,
        maxOffsetM: match.maxOffsetM,
        distanceScale: match.scale,
      },
      alignment,
      uploadedById: author.id,
      uploadedByName: author.name,
      seedKey: seedKey ?? null,
    });
  });
  return repository.toLoggedTrip(row);
}

function follows(match: LineMatch): boolean {
  return match.p95OffsetM <= ROUTE_MATCH_P95_M && Math.abs(match.scale - 1) <= ROUTE_MATCH_SCALE_TOLERANCE;
}

/** A route line from a filtered track: standstills collapsed, simplified (module comment). */
function routeFromTrack(lon: Float64Array, lat: Float64Array): number[][] {
  const plane = localPlane(lon[0]!, lat[0]!);
  const points: [number, number][] = [];
  for (let i = 0; i < lon.length; i++) {
    const point = toPlane(plane, lon[i]!, lat[i]!);
    const previous = points.at(-1);
    if (!previous || Math.hypot(point[0] - previous[0], point[1] - previous[1]) > 0.5) points.push(point);
  }
  const simplified = simplify({ type: 'LineString', coordinates: points }, { tolerance: NEW_ROUTE_TOLERANCE_M, highQuality: true });
  return simplified.coordinates.map(([east, north]) => fromPlane(plane, east!, north!).map((v) => Math.round(v * 1e7) / 1e7));
}

async function chooseElevations(
  deps: Pick<AppDeps, 'sampleElevations'>,
  aligned: ReturnType<typeof alignTrip>,
  requested: LoggedTripUploadFields['elevationSource'],
  fileName: string,
): Promise<{ elevationM: number[]; elevationSource: 'route' | 'terrain' | 'file' }> {
  const fromFile = () => {
    if (!aligned.fileElevationM) {
      throw new LoggedTripFileError(
        'missing_column',
        { file: fileName, row: 1, column: 'elevation_m' },
        'elevations from the file were asked for, but the file logs no elevation_m',
      );
    }
    return { elevationM: aligned.fileElevationM, elevationSource: 'file' as const };
  };
  if (requested === 'file') return fromFile();
  if (aligned.lineElevationM) return { elevationM: aligned.lineElevationM, elevationSource: 'route' };
  const sampler = deps.sampleElevations;
  if (sampler) {
    try {
      const sampled = await sampler(aligned.positions);
      const filled = fillElevationGaps(Float64Array.from(aligned.distanceM), sampled, DEFAULT_MAX_GAP_FILL_M);
      return { elevationM: Array.from(filled.elevationM), elevationSource: 'terrain' };
    } catch (error) {
      // The terrain does not cover the trip: fall back to the logged elevations when allowed.
      if (!(error instanceof EngineInputError)) throw error;
      if (requested === 'auto' && aligned.fileElevationM) return fromFile();
      throw new BadRequestError(
        `No terrain model covers the trip's route and ${requested === 'auto' ? 'the file logs no elevation_m' : 'the route carries no elevations'}: ${error.message}`,
        { field: 'elevationSource' },
        'no_elevations',
      );
    }
  }
  if (requested === 'auto' && aligned.fileElevationM) return fromFile();
  throw new BadRequestError(
    'The route carries no elevations, no terrain is available, and the file logs no elevation_m',
    { field: 'elevationSource' },
    'no_elevations',
  );
}

function tripPayload(parsed: ParsedTrip, fields: LoggedTripUploadFields, profile: VehicleProfile) {
  if (fields.payloadKg !== undefined) return { payloadKg: fields.payloadKg, source: 'given' as const };
  if (parsed.passengers) {
    // Time-weighted mean load over the trip: the engine carries one mass per run.
    const passengers = timeWeightedMean(parsed.samples.timeS, parsed.passengers);
    if (passengers !== null) return { payloadKg: passengers * profile.passengerMassKg, source: 'passengers' as const };
  }
  return { payloadKg: null, source: 'unknown' as const };
}

function timeWeightedMean(timeS: Float64Array, values: Float64Array): number | null {
  let sum = 0;
  let weight = 0;
  for (let i = 1; i < values.length; i++) {
    const a = values[i - 1]!;
    const b = values[i]!;
    if (!Number.isFinite(a) || !Number.isFinite(b)) continue;
    const dt = timeS[i]! - timeS[i - 1]!;
    sum += 0.5 * (a + b) * dt;
    weight += dt;
  }
  return weight > 0 ? sum / weight : null;
}

function mean(values: Float64Array | null): number | null {
  if (!values) return null;
  const finite = Array.from(values).filter(Number.isFinite);
  return finite.length > 0 ? finite.reduce((a, b) => a + b, 0) / finite.length : null;
}

function stripExtension(fileName: string): string {
  return fileName.replace(/\.(csv|txt)$/i, '').slice(0, 200) || 'Logged trip';
}

export async function listLoggedTrips(deps: Pick<AppDeps, 'db'>, vehicleProfileId: string): Promise<LoggedTrip[]> {
  if (!(await profiles.findProfile(deps.db, vehicleProfileId))) throw new NotFoundError('The vehicle profile');
  return (await repository.listTrips(deps.db, vehicleProfileId)).map(repository.toLoggedTrip);
}

export async function getLoggedTrip(deps: Pick<AppDeps, 'db'>, id: string): Promise<LoggedTrip> {
  const row = await repository.findTrip(deps.db, id);
  if (!row) throw new NotFoundError('The logged trip');
  return repository.toLoggedTrip(row);
}

/** Deletes a trip; 409 while an accepted profile version names it as fitted on it. */
export async function deleteLoggedTrip(deps: Pick<AppDeps, 'db'>, id: string): Promise<void> {
  const row = await repository.findTrip(deps.db, id);
  if (!row) throw new NotFoundError('The logged trip');
  const accepted = await repository.countAcceptedCalibrationsUsing(deps.db, id);
  if (accepted > 0) {
    throw new ConflictError(
      `The trip was fitted on by ${accepted} accepted calibration${accepted === 1 ? '' : 's'}; a profile version names it as its evidence, so it is kept`,
      'logged_trip_in_use',
      { acceptedCalibrations: accepted },
    );
  }
  await repository.deleteTrip(deps.db, id);
}

/**
 * Measured against modelled for one trip: the engine replays it with the profile's current
 * parameters, or with a finished calibration's fitted ones (`calibrationId`).
 */
export async function compareLoggedTrip(deps: Pick<AppDeps, 'db'>, id: string, calibrationId?: string): Promise<ReplayComparison> {
  const row = await repository.findTrip(deps.db, id);
  if (!row) throw new NotFoundError('The logged trip');
  const profileRow = await profiles.findProfile(deps.db, row.vehicleProfileId);
  if (!profileRow) throw new NotFoundError('The trip’s vehicle profile');
  const profile = profiles.toVehicleProfile(profileRow);
  let vehicle = tripVehicle(profile, row);
  let basis: ReplayComparison['basis'] = { kind: 'profile', profileVersion: profile.version, calibrationId: null };
  if (calibrationId) {
    const calibration = await findCalibration(deps.db, calibrationId);
    if (!calibration || calibration.vehicleProfileId !== row.vehicleProfileId) throw new NotFoundError('The calibration');
    if (!calibration.result) throw new ConflictError('The calibration has no result yet', 'calibration_not_done');
    const fitted = Object.fromEntries(
      [...calibration.result.parameters, ...(calibration.result.brake?.parameters ?? [])].map((p) => [p.key, p.fitted]),
    );
    vehicle = vehicleWithParameters(vehicle as Parameters<typeof vehicleWithParameters>[0], fitted, row.payloadKg !== null);
    basis = { kind: 'calibration', profileVersion: calibration.profileVersion, calibrationId };
  }
  const detail = await replayTrip(row, vehicle);
  const trip = alignedTrip(row.alignment);
  const steps = replaySteps(detail.model, detail.run, trip);
  return {
    loggedTripId: row.id,
    vehicleProfileId: row.vehicleProfileId,
    basis,
    series: replaySeries(detail.model, detail.run, trip),
    power: steps ? comparePower([steps]) : null,
    soc: trip.soc ? comparePointValues(trip.soc, detail.run.soc) : null,
    brakeTemperature: trip.brakeTempC ? comparePointValues(trip.brakeTempC, detail.run.brakeTempC) : null,
    caution: ENGINEERING_CAUTION,
  };
}
