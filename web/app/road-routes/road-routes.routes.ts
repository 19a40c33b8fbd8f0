import type { Routes } from '@angular/router';
import { allowRoles } from '../core/role-guard';
import { uuidParams } from '../core/uuid-params';
import { routeEditorFirstReads } from './route-paths';

/** Routes area: the list, a new route (planners) and one route (everyone reads). */
export const ROAD_ROUTES_ROUTES: Routes = [
  { path: '', title: 'Routes · Descentry', loadComponent: () => import('./route-list') },
  {
    path: 'new',
    title: 'New route · Descentry',
    canMatch: [allowRoles(['planner'])],
    loadComponent: () => import('./route-editor'),
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
    loadComponent: () => import('./route-editor'),
  },
];
export default ROAD_ROUTES_ROUTES;
