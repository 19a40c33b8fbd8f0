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

export const ROAD_NETWORK_PATH = '/api/road-network';

/** What the route editor reads as it opens a saved route: the route, its versions, the road network, the map's catalogues. */
export const routeEditorFirstReads: FirstReads = ({ routeId }, read) => {
  if (!routeId || !isUuid(routeId)) return;
  void read(routePath(routeId));
  void read(routeVersionsPath(routeId));
  void read(ROAD_NETWORK_PATH);
  readMapCatalogues(read);
};
