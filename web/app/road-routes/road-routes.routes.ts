import type { Routes } from '@angular/router';
import { allowRoles } from '../core/role-guard';
import { uuidParams } from '../core/uuid-params';
import { routeEditorFirstReads } from './route-paths';

/**
 * The editor's map is most of what it shows and is made with the editor's first render: its code
 * (Leaflet and the base-map renderer, a chunk of its own that the editor imports) starts loading
 * with the editor's own instead of only once the browser has read the editor's chunk and found
 * the import (the browser loads the module once; a failure is left to the editor's import).
 */
function loadRouteEditor() {
  import('../map/terrain-map').catch(() => undefined);
  return import('./route-editor');
}

/** Routes area: the list, a new route (planners) and one route (everyone reads). */
export const ROAD_ROUTES_ROUTES: Routes = [
  { path: '', title: 'Routes · Descentry', loadComponent: () => import('./route-list') },
  {
    path: 'new',
    title: 'New route · Descentry',
    canMatch: [allowRoles(['planner'])],
    loadComponent: loadRouteEditor,
  },
  {
    // Every other role that bookmarked or typed the address: say who may draw routes.
    path: 'new',
    title: 'New route · Descentry',
    data: { title: 'New route', action: 'draw new routes', roles: ['planner'], back: '/routes', backLabel: 'Routes' },
    loadComponent: () => import('../shell/role-required'),
  },
  {
    path: ':routeId',
    title: 'Route · Descentry',
    canMatch: [uuidParams],
    data: { firstReads: routeEditorFirstReads },
    loadComponent: loadRouteEditor,
  },
];
export default ROAD_ROUTES_ROUTES;
