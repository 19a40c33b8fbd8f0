import { readMapCatalogues } from '../map/map-paths';
import { isUuid } from '../core/uuid-params';
import type { FirstReads } from '../core/early-reads';

/** Addresses of the route reads, shared by the API service and the editor's `firstReads`. */
export function routePath(routeId: string): string {
  return `/api/routes/${encodeURIComponent(routeId)}`;
}

export function routeVersionsPath(routeId: string): string {
  return `${routePath(routeId)}/versions`;
}

/** The elevation profile of a saved version (the editor's profile while the line is unedited). */
export function routeVersionProfilePath(routeId: string, version: number): string {
  return `${routeVersionsPath(routeId)}/${version}/profile`;
}

export const ROAD_NETWORK_PATH = '/api/road-network';

/**
 * What the route editor reads as it opens a saved route: the route, its versions, the road
 * network, the map's catalogues and, once the route names its current version, that version's
 * elevation profile.
 */
export const routeEditorFirstReads: FirstReads = async ({ routeId }, read) => {
  if (!routeId || !isUuid(routeId)) return;
  const route = read(routePath(routeId));
  void read(routeVersionsPath(routeId));
  void read(ROAD_NETWORK_PATH);
  readMapCatalogues(read);
  const answer = await route;
  const version = typeof answer === 'object' && answer !== null && 'version' in answer ? answer.version : null;
  if (typeof version === 'number') void read(routeVersionProfilePath(routeId, version));
};
