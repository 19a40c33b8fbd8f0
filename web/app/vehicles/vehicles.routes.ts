import type { Routes } from '@angular/router';
import { allowRoles } from '../core/role-guard';

/** Vehicle profiles: everyone reads; analysts create, copy and edit; analysts and administrators upload logged trips and fit profiles. */
export const VEHICLES_ROUTES: Routes = [
  { path: '', title: 'Vehicle profiles · Descentry', loadComponent: () => import('./vehicle-library') },
  {
    path: 'new',
    title: 'New vehicle profile · Descentry',
    canMatch: [allowRoles(['analyst'])],
    loadComponent: () => import('./vehicle-profile-editor'),
  },
  { path: ':vehicleProfileId', title: 'Vehicle profile · Descentry', loadComponent: () => import('./vehicle-profile-editor') },
  {
    path: ':vehicleProfileId/logged-trips',
    title: 'Measured runs · Descentry',
    loadComponent: () => import('../calibration/logged-trips'),
  },
  {
    path: ':vehicleProfileId/logged-trips/:loggedTripId',
    title: 'Logged trip against the model · Descentry',
    loadComponent: () => import('../calibration/trip-comparison'),
  },
  {
    path: ':vehicleProfileId/calibrations/:calibrationId',
    title: 'Calibration · Descentry',
    loadComponent: () => import('../calibration/calibration-detail'),
  },
];
export default VEHICLES_ROUTES;
