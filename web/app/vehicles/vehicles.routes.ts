import type { Routes } from '@angular/router';
import { allowRoles } from '../core/role-guard';

/** Vehicle profiles: everyone reads; analysts create, copy and edit. */
export const VEHICLES_ROUTES: Routes = [
  { path: '', title: 'Vehicle profiles · Descentry', loadComponent: () => import('./vehicle-library') },
  {
    path: 'new',
    title: 'New vehicle profile · Descentry',
    canMatch: [allowRoles(['analyst'])],
    loadComponent: () => import('./vehicle-profile-editor'),
  },
  { path: ':vehicleProfileId', title: 'Vehicle profile · Descentry', loadComponent: () => import('./vehicle-profile-editor') },
];
export default VEHICLES_ROUTES;
