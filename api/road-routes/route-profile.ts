/**
 * The route editor's live elevation profile: the line resampled with the engine's resampler at a
 * spacing that keeps about a thousand points (never finer than 10 m, the engine's default
 * spacing), elevations from the positions when every one carries z, else from the terrain.
 * Total ascent and descent use the engine's hysteresis over the covered points.
 */
import type { LineString } from '@shared/domain/analysis';
import type { RouteProfile } from '@shared/domain/road-routes';
import type { ElevationSampler } from '@shared/engine/analyse-route';
import { DEFAULT_ASCENT_THRESHOLD_M, DEFAULT_SPACING_M } from '@shared/engine/constants';
import { resampleRoute } from '@shared/engine/resample-route';
import { ascentDescentM } from '@shared/engine/smoothing';

/** Points the profile aims for (common practice: enough for a chart a screen wide). */
const TARGET_POINTS = 1_000;

export async function routeProfile(geometry: LineString, sampleElevations?: ElevationSampler): Promise<RouteProfile> {
  const roughLengthM = resampleRoute(geometry.coordinates, 10_000).distanceM.at(-1) ?? 0;
  const spacingM = Math.min(200, Math.max(DEFAULT_SPACING_M, Math.ceil(roughLengthM / TARGET_POINTS)));
  const resampled = resampleRoute(geometry.coordinates, spacingM);
  let elevationM: (number | null)[];
  let elevationSource: RouteProfile['elevationSource'];
  if (resampled.elevationM) {
    elevationM = Array.from(resampled.elevationM);
    elevationSource = 'coordinates';
  } else if (sampleElevations) {
    const points: [number, number][] = Array.from(resampled.lon, (lon, i) => [lon, resampled.lat[i]!]);
    elevationM = (await sampleElevations(points)).map((z) => (typeof z === 'number' && Number.isFinite(z) ? z : null));
    elevationSource = 'terrain';
  } else {
    elevationM = Array.from(resampled.lon, () => null);
    elevationSource = 'none';
  }
  const covered = Float64Array.from(elevationM.filter((z): z is number => z !== null));
  const { ascentM, descentM } = covered.length > 1 ? ascentDescentM(covered, DEFAULT_ASCENT_THRESHOLD_M) : { ascentM: 0, descentM: 0 };
  return {
    spacingM,
    distanceM: Array.from(resampled.distanceM, (d) => Math.round(d * 100) / 100),
    elevationM: elevationM.map((z) => (z === null ? null : Math.round(z * 100) / 100)),
    lengthM: resampled.distanceM[resampled.distanceM.length - 1]!,
    ascentM,
    descentM,
    elevationSource: covered.length > 0 ? elevationSource : 'none',
  };
}
