import type { Routes } from '@angular/router';
import { allowRoles } from '../core/role-guard';

/** Scenarios area: everyone reads; planners and analysts create, edit and run. */
export const SCENARIOS_ROUTES: Routes = [
  { path: '', title: 'Scenarios · Descentry', loadComponent: () => import('./scenario-list') },
  { path: 'compare', title: 'Compare scenarios · Descentry', loadComponent: () => import('./scenario-compare') },
  {
    path: 'new',
    title: 'New scenario · Descentry',
    canMatch: [allowRoles(['planner', 'analyst'])],
    loadComponent: () => import('./scenario-form'),
  },
  {
    path: ':scenarioId/edit',
    title: 'Edit scenario · Descentry',
    canMatch: [allowRoles(['planner', 'analyst'])],
    loadComponent: () => import('./scenario-form'),
  },
  { path: ':scenarioId', title: 'Scenario results · Descentry', loadComponent: () => import('./scenario-result') },
];
export default SCENARIOS_ROUTES;
