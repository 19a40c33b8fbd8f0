import { readMapCatalogues } from '../map/map-paths';
import { isUuid } from '../core/uuid-params';
import type { FirstReads } from '../core/early-reads';

/**
 * The per-point series the result screen draws (its charts and the route on the map) and the
 * step it asks for them at: one point per 25 m, with each step's hottest and fastest points kept,
 * is finer than a chart a screen wide can show. The summary and the descents come whole; the
 * exports (CSV, GeoJSON, PDF) still carry every point.
 */
export const RESULT_SCREEN_SERIES = [
  'lon',
  'lat',
  'elevationM',
  'gradePercent',
  'speedMps',
  'rollingN',
  'aeroN',
  'gradeN',
  'inertiaN',
  'batteryPowerW',
  'soc',
  'brakeTempC',
] as const;
export const RESULT_SCREEN_STEP_M = 25;

/** Addresses of the scenario reads, shared by the API service and the result page's `firstReads`. */
export function scenarioPath(scenarioId: string): string {
  return `/api/scenarios/${encodeURIComponent(scenarioId)}`;
}

/** The stored result as the result screen asks for it: the series it draws, at its step. */
export function scenarioResultScreenPath(scenarioId: string): string {
  return `${scenarioPath(scenarioId)}/result?profileStepM=${RESULT_SCREEN_STEP_M}&series=${RESULT_SCREEN_SERIES.join(',')}`;
}

/**
 * What the result page reads as it opens: the scenario, the map's catalogues and — once the
 * scenario says it has been computed, as the page itself decides — its stored result.
 */
export const scenarioResultFirstReads: FirstReads = async ({ scenarioId }, read) => {
  if (!scenarioId || !isUuid(scenarioId)) return;
  const scenario = read(scenarioPath(scenarioId));
  readMapCatalogues(read);
  const answer = await scenario;
  const computedAt = typeof answer === 'object' && answer !== null && 'computedAt' in answer ? answer.computedAt : null;
  if (typeof computedAt === 'string') void read(scenarioResultScreenPath(scenarioId));
};
