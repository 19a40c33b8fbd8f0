import type { Routes } from '@angular/router';
import { allowRoles } from '../core/role-guard';

/** Routes area: the list, a new route (planners) and one route (everyone reads). */
export const ROAD_ROUTES_ROUTES: Routes = [
  { path: '', title: 'Routes · Descentry', loadComponent: () => import('./route-list') },
  {
    path: 'new',
    title: 'New route · Descentry',
    canMatch: [allowRoles(['planner'])],
    loadComponent: () => import('./route-editor'),
  },
  { path: ':routeId', title: 'Route · Descentry', loadComponent: () => import('./route-editor') },
];
export default ROAD_ROUTES_ROUTES;
