import type { Routes } from '@angular/router';
import { rolesWith } from '@shared/domain/permissions';
import { ROLES } from '@shared/domain/roles';
import { areaData } from './core/areas';
import { allowRoles, areaRoleGuard, signedInGuard } from './core/role-guard';
import { uuidParams } from './core/uuid-params';
import { ROAD_ROUTES_ROUTES } from './road-routes/road-routes.routes';
import { SCENARIOS_ROUTES } from './scenarios/scenarios.routes';
import { SERVICE_DAYS_ROUTES } from './service-days/service-days.routes';
import { VEHICLES_ROUTES } from './vehicles/vehicles.routes';

/**
 * The router table. Pages outside the shell are public (sign-in and the e-mailed links).
 * Inside the shell, each area declares itself with `data: areaData({...})` and guards itself with
 * `canMatch: [areaRoleGuard]`: the side navigation and the home page cards are built from these
 * declarations, so a new feature adds one route here and appears for its roles.
 */
export const routes: Routes = [
  {
    path: 'sign-in',
    title: 'Sign in · Descentry',
    loadComponent: () => import('./sign-in/sign-in'),
  },
  {
    path: 'forgot-password',
    title: 'Forgot password · Descentry',
    loadComponent: () => import('./sign-in/forgot-password'),
  },
  {
    path: 'accept-invite',
    title: 'Accept invitation · Descentry',
    data: { kind: 'invite' },
    loadComponent: () => import('./account/set-password'),
  },
  {
    path: 'reset-password',
    title: 'Reset password · Descentry',
    data: { kind: 'reset' },
    loadComponent: () => import('./account/set-password'),
  },
  {
    path: '',
    loadComponent: () => import('./shell/shell'),
    canMatch: [signedInGuard],
    children: [
      {
        path: '',
        pathMatch: 'full',
        title: 'Home · Descentry',
        loadComponent: () => import('./home/home'),
      },
      {
        path: 'routes',
        canMatch: [areaRoleGuard],
        data: areaData({
          label: 'Routes',
          icon: 'route',
          summary: 'Draw and edit routes on the terrain map, with stops, speed limits and versions; import and export them.',
          roles: ROLES,
        }),
        children: ROAD_ROUTES_ROUTES,
      },
      {
        path: 'reviews',
        title: 'Descent review · Descentry',
        canMatch: [areaRoleGuard],
        data: areaData({
          label: 'Descent review',
          icon: 'fact_check',
          summary: 'Long, steep descents where the brakes may fade: acknowledge, mitigate or accept each one.',
          roles: ['safety', 'planner', 'analyst', 'board', 'admin'],
        }),
        loadComponent: () => import('./reviews/review-queue'),
      },
      {
        path: 'reviews/:reviewId',
        title: 'Descent review item · Descentry',
        canMatch: [uuidParams],
        loadComponent: () => import('./reviews/review-detail'),
      },
      {
        path: 'board',
        title: 'Network summary · Descentry',
        canMatch: [areaRoleGuard],
        data: areaData({
          label: 'Network summary',
          icon: 'summarize',
          summary: 'One page on the whole network: energy recovered per year, its value and CO₂, open safety items. Printable.',
          roles: ['board', 'planner', 'analyst', 'safety', 'admin'],
        }),
        loadComponent: () => import('./board/board-summary'),
      },
      {
        path: 'batch-runs',
        title: 'Network runs · Descentry',
        canMatch: [areaRoleGuard],
        data: areaData({
          label: 'Network runs',
          icon: 'model_training',
          summary: 'Re-run every in-service scenario at once and follow each one to the end.',
          roles: rolesWith('batch-runs.start'),
        }),
        loadComponent: () => import('./batch-runs/batch-runs'),
      },
      {
        path: 'batch-runs/:batchRunId',
        title: 'Network run · Descentry',
        canMatch: [uuidParams, allowRoles(['analyst'])],
        loadComponent: () => import('./batch-runs/batch-run-detail'),
      },
      {
        path: 'scenarios',
        canMatch: [areaRoleGuard],
        data: areaData({
          label: 'Scenarios',
          icon: 'analytics',
          summary:
            'Run a route with a vehicle, load and season; see energy, regeneration, brake heat and risky descents; compare variants.',
          roles: ROLES,
        }),
        children: SCENARIOS_ROUTES,
      },
      {
        path: 'service-days',
        canMatch: [areaRoleGuard],
        data: areaData({
          label: 'Service days',
          icon: 'calendar_view_day',
          summary:
            'A vehicle’s whole day: blocks of trips with layovers, chargers at the depot and route ends, SOC through the day and which blocks cannot be worked.',
          roles: ROLES,
        }),
        children: SERVICE_DAYS_ROUTES,
      },
      {
        path: 'vehicles',
        canMatch: [areaRoleGuard],
        data: areaData({
          label: 'Vehicle profiles',
          icon: 'directions_bus',
          summary: 'The vehicle classes and the authority’s own profiles, with every engine parameter and the capability chart.',
          roles: ROLES,
        }),
        children: VEHICLES_ROUTES,
      },
      {
        // Everyone signed in may open the catalogue; the navigation lists it for the roles that
        // manage terrain.
        path: 'terrain',
        title: 'Terrain · Descentry',
        canMatch: [signedInGuard],
        data: areaData({
          label: 'Terrain',
          icon: 'landscape',
          summary: 'Upload elevation models, check where they cover and how good they are, and see the terrain map.',
          roles: rolesWith('terrain.manage'),
        }),
        loadComponent: () => import('./terrain/terrain-catalogue'),
      },
      {
        // Everyone signed in sees the base map on every map; analysts and administrators import it.
        path: 'base-map',
        title: 'Base map · Descentry',
        canMatch: [signedInGuard],
        data: areaData({
          label: 'Base map',
          icon: 'map',
          summary:
            'Import the region’s OpenStreetMap extract: the streets, water and place names under the terrain, and the roads routes snap to.',
          roles: rolesWith('basemap.manage'),
        }),
        loadComponent: () => import('./basemap/basemap-catalogue'),
      },
      {
        path: 'deleted',
        title: 'Recently deleted · Descentry',
        canMatch: [areaRoleGuard],
        data: areaData({
          label: 'Recently deleted',
          icon: 'restore_from_trash',
          summary: 'Routes, scenarios, vehicle profiles and terrain deleted in the last 30 days: who deleted them, and restore them.',
          roles: rolesWith('deleted-items.list'),
        }),
        loadComponent: () => import('./deleted-items/recently-deleted'),
      },
      {
        path: 'admin/people',
        title: 'People · Descentry',
        canMatch: [areaRoleGuard],
        data: areaData({
          label: 'People',
          icon: 'group',
          summary: 'Invite people, set their roles, disable accounts and send password resets.',
          roles: rolesWith('people.manage'),
          group: 'Administration',
        }),
        loadComponent: () => import('./admin/people/people'),
      },
      {
        path: 'admin/mail',
        title: 'Outgoing mail · Descentry',
        canMatch: [areaRoleGuard],
        data: areaData({
          label: 'Outgoing mail',
          icon: 'outgoing_mail',
          summary: 'Check what Descentry has sent or is about to send, and what the local mail catcher received.',
          roles: rolesWith('mail.read'),
          group: 'Administration',
        }),
        loadComponent: () => import('./admin/mail/outgoing-mail'),
      },
      {
        path: 'admin/audit',
        title: 'Audit log · Descentry',
        canMatch: [areaRoleGuard],
        data: areaData({
          label: 'Audit log',
          icon: 'history',
          summary: 'Who created, changed, deleted or restored routes, scenarios, vehicle profiles and terrain, and when.',
          roles: rolesWith('audit.read'),
          group: 'Administration',
        }),
        loadComponent: () => import('./admin/audit/audit-log'),
      },
      {
        path: 'admin/network',
        title: 'Network settings · Descentry',
        canMatch: [areaRoleGuard],
        data: areaData({
          label: 'Network settings',
          icon: 'tune',
          summary: 'Set the energy tariff, currency and grid emission factor the board summary uses, with their sources.',
          roles: rolesWith('network-settings.edit'),
          group: 'Administration',
        }),
        loadComponent: () => import('./admin/network/network-settings'),
      },
      {
        path: '**',
        title: 'Page not found · Descentry',
        loadComponent: () => import('./shell/not-found'),
      },
    ],
  },
  // Reached only when nobody is signed in (the shell did not match): sign in first.
  { path: '**', redirectTo: 'sign-in' },
];
