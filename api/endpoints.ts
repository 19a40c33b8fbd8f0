import { analysisEndpoints } from './analysis/analysis-endpoints';
import type { AppDeps } from './app-deps';
import { auditEndpoints } from './audit/audit-endpoints';
import { basemapEndpoints } from './basemap/basemap-endpoints';
import { batchRunsEndpoints } from './batch-runs/batch-runs-endpoints';
import { deletedItemsEndpoints } from './deleted-items/deleted-items-endpoints';
import { boardEndpoints } from './board/board-endpoints';
import { calibrationEndpoints } from './calibrations/calibrations-endpoints';
import { authEndpoints } from './auth/auth-endpoints';
import { healthEndpoints } from './health/health-endpoints';
import type { AnyEndpoint } from './http/endpoint';
import { loggedTripEndpoints } from './logged-trips/logged-trips-endpoints';
import { mailEndpoints } from './mail/mail-endpoints';
import { notificationSettingsEndpoints } from './notifications/notification-settings-endpoints';
import { peopleEndpoints } from './people/people-endpoints';
import { reviewsEndpoints } from './reviews/reviews-endpoints';
import { roadRouteEndpoints } from './road-routes/road-routes-endpoints';
import { scenarioEndpoints } from './scenarios/scenarios-endpoints';
import { serviceDayEndpoints } from './service-days/service-days-endpoints';
import { serviceDayReportEndpoints } from './service-days/service-day-report-endpoints';
import { terrainEndpoints } from './terrain/terrain-endpoints';
import { vehicleProfileEndpoints } from './vehicle-profiles/vehicle-profiles-endpoints';

/**
 * Every endpoint of the API. A feature adds its list here; `createApp` mounts them behind
 * `requireRole`, the OpenAPI document describes them, and the authorization matrix test checks
 * each one.
 */
export function allEndpoints(deps: AppDeps): AnyEndpoint[] {
  return [
    ...healthEndpoints(deps),
    ...authEndpoints(deps),
    ...peopleEndpoints(deps),
    ...mailEndpoints(deps),
    ...analysisEndpoints(deps),
    ...reviewsEndpoints(deps),
    ...notificationSettingsEndpoints(deps),
    ...boardEndpoints(deps),
    ...batchRunsEndpoints(deps),
    ...roadRouteEndpoints(deps),
    ...vehicleProfileEndpoints(deps),
    ...loggedTripEndpoints(deps),
    ...calibrationEndpoints(deps),
    ...scenarioEndpoints(deps),
    ...serviceDayEndpoints(deps),
    ...serviceDayReportEndpoints(deps),
    ...terrainEndpoints(deps),
    ...deletedItemsEndpoints(deps),
    ...auditEndpoints(deps),
    ...basemapEndpoints(deps),
  ];
}
