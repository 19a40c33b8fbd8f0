import type { Routes } from '@angular/router';
import { allowRoles } from '../core/role-guard';
import { uuidParams } from '../core/uuid-params';
import { scenarioResultFirstReads } from './scenario-paths';

const EDITORS = ['planner', 'analyst'] as const;

/** Scenarios area: everyone reads; planners and analysts create, edit and run. */
export const SCENARIOS_ROUTES: Routes = [
  { path: '', title: 'Scenarios · Descentry', loadComponent: () => import('./scenario-list') },
  { path: 'compare', title: 'Compare scenarios · Descentry', loadComponent: () => import('./scenario-compare') },
  {
    path: 'new',
    title: 'New scenario · Descentry',
    canMatch: [allowRoles(EDITORS)],
    loadComponent: () => import('./scenario-form'),
  },
  {
    // Every other role that bookmarked or typed the address: say who may create scenarios.
    path: 'new',
    title: 'New scenario · Descentry',
    data: { title: 'New scenario', action: 'create scenarios', roles: EDITORS, back: '/scenarios', backLabel: 'Scenarios' },
    loadComponent: () => import('../shell/role-required'),
  },
  {
    path: ':scenarioId/edit',
    title: 'Edit scenario · Descentry',
    canMatch: [uuidParams, allowRoles(EDITORS)],
    loadComponent: () => import('./scenario-form'),
  },
  {
    // Every other role that bookmarked or typed the address: say who may change scenarios.
    path: ':scenarioId/edit',
    title: 'Edit scenario · Descentry',
    canMatch: [uuidParams],
    data: { title: 'Edit scenario', action: 'change scenarios', roles: EDITORS, back: '/scenarios', backLabel: 'Scenarios' },
    loadComponent: () => import('../shell/role-required'),
  },
  {
    path: ':scenarioId',
    title: 'Scenario results · Descentry',
    canMatch: [uuidParams],
    data: { firstReads: scenarioResultFirstReads },
    loadComponent: () => import('./scenario-result'),
  },
];
export default SCENARIOS_ROUTES;
