import type { Routes } from '@angular/router';
import { allowRoles } from '../core/role-guard';
import { uuidParams } from '../core/uuid-params';

/** Vehicle profiles: everyone reads; analysts create, copy and edit; analysts and administrators upload logged trips and fit profiles. */
export const VEHICLES_ROUTES: Routes = [
  { path: '', title: 'Vehicle profiles · Descentry', loadComponent: () => import('./vehicle-library') },
  {
    path: 'new',
    title: 'New vehicle profile · Descentry',
    canMatch: [allowRoles(['analyst'])],
    loadComponent: () => import('./vehicle-profile-editor'),
  },
  {
    // Every other role that bookmarked or typed the address: say who may create profiles.
    path: 'new',
    title: 'New vehicle profile · Descentry',
    data: {
      title: 'New vehicle profile',
      action: 'create vehicle profiles',
      roles: ['analyst'],
      back: '/vehicles',
      backLabel: 'Vehicle profiles',
    },
    loadComponent: () => import('../shell/role-required'),
  },
  {
    path: ':vehicleProfileId',
    title: 'Vehicle profile · Descentry',
    canMatch: [uuidParams],
    loadComponent: () => import('./vehicle-profile-editor'),
  },
  {
    path: ':vehicleProfileId/logged-trips',
    title: 'Measured runs · Descentry',
    canMatch: [uuidParams],
    loadComponent: () => import('../calibration/logged-trips'),
  },
  {
    path: ':vehicleProfileId/logged-trips/:loggedTripId',
    title: 'Logged trip against the model · Descentry',
    canMatch: [uuidParams],
    loadComponent: () => import('../calibration/trip-comparison'),
  },
  {
    path: ':vehicleProfileId/calibrations/:calibrationId',
    title: 'Calibration · Descentry',
    canMatch: [uuidParams],
    loadComponent: () => import('../calibration/calibration-detail'),
  },
];
export default VEHICLES_ROUTES;
