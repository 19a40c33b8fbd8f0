import type { Routes } from '@angular/router';
import { rolesWith } from '@shared/domain/permissions';
import { allowRoles } from '../core/role-guard';
import { uuidParams } from '../core/uuid-params';

const EDITORS = rolesWith('service-days.edit');

/** Service days: everyone reads; analysts and administrators build, change and run them. */
export const SERVICE_DAYS_ROUTES: Routes = [
  { path: '', title: 'Service days · Descentry', loadComponent: () => import('./service-day-list') },
  {
    path: 'new',
    title: 'New service day · Descentry',
    canMatch: [allowRoles(EDITORS)],
    loadComponent: () => import('./service-day-editor'),
  },
  {
    // Every other role that bookmarked or typed the address: say who may build service days.
    path: 'new',
    title: 'New service day · Descentry',
    data: { title: 'New service day', action: 'build service days', roles: EDITORS, back: '/service-days', backLabel: 'Service days' },
    loadComponent: () => import('../shell/role-required'),
  },
  {
    path: ':serviceDayId/edit',
    title: 'Edit service day · Descentry',
    canMatch: [uuidParams, allowRoles(EDITORS)],
    loadComponent: () => import('./service-day-editor'),
  },
  {
    // Every other role that bookmarked or typed the address: say who may change service days.
    path: ':serviceDayId/edit',
    title: 'Edit service day · Descentry',
    canMatch: [uuidParams],
    data: { title: 'Edit service day', action: 'change service days', roles: EDITORS, back: '/service-days', backLabel: 'Service days' },
    loadComponent: () => import('../shell/role-required'),
  },
  {
    path: ':serviceDayId',
    title: 'Service day results · Descentry',
    canMatch: [uuidParams],
    loadComponent: () => import('./service-day-result'),
  },
];
export default SERVICE_DAYS_ROUTES;
