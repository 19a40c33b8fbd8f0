/**
 * The words every output uses for the values Descentry stores as codes: directions, loads,
 * seasons, risk levels, review states. A stored code (`outbound`, `full-standing`) is never
 * printed as it is.
 */
import type { RiskLevel } from '../domain/analysis';
import { REVIEW_STATE_LABELS } from '../domain/reviews';
import type { RoadRouteDraft } from '../domain/road-routes';
import type { Direction, Scenario } from '../domain/scenarios';
import type { LoadCase, Season } from '../domain/vehicle-profiles';
import { formatNumber } from './units';

export { REVIEW_STATE_LABELS };

export const DIRECTION_LABELS: Readonly<Record<Direction, string>> = {
  outbound: 'Outbound',
  inbound: 'Inbound',
  'round-trip': 'Round trip',
};

export const LOAD_LABELS: Readonly<Record<LoadCase, string>> = {
  empty: 'Empty',
  seated: 'Seated load',
  'full-standing': 'Full standing load',
};

export const SEASON_LABELS: Readonly<Record<Season, string>> = {
  winter: 'Winter',
  mild: 'Mild',
  summer: 'Summer',
};

export const MODE_LABELS: Readonly<Record<RoadRouteDraft['mode'], string>> = {
  bus: 'Bus',
  trolleybus: 'Trolleybus',
  tram: 'Tram',
};

export const RISK_LABELS: Readonly<Record<RiskLevel, string>> = {
  low: 'Low',
  elevated: 'Elevated',
  high: 'High',
  critical: 'Critical',
};

/** One sentence per risk level a non-engineer understands. */
export const RISK_MEANINGS: Readonly<Record<RiskLevel, string>> = {
  low: 'The brakes stay well below the temperature at which they start to lose grip.',
  elevated: 'The brakes get hot; worth watching, especially with a full vehicle or a full battery.',
  high: 'The brakes reach the temperature at which they start to fade (lose stopping power).',
  critical: 'The brakes go well past the fade temperature; the descent needs a measure before service.',
};

/** Lowest to highest. */
export const RISK_ORDER: readonly RiskLevel[] = ['low', 'elevated', 'high', 'critical'];

/** Where a scenario's run stands. */
export const SCENARIO_STATUS_LABELS: Readonly<Record<Scenario['status'], string>> = {
  queued: 'Waiting to run',
  running: 'Running',
  done: 'Done',
  failed: 'Failed',
};

/** "Seated load", "45 passengers". */
export function describeLoad(load: Scenario['load']): string {
  return load.kind === 'case' ? LOAD_LABELS[load.case] : `${formatNumber(load.passengers)} passengers`;
}

/** "Winter", "Custom: −5 °C, 18 kW auxiliary". */
export function describeSeason(season: Scenario['season']): string {
  return season.kind === 'season'
    ? SEASON_LABELS[season.season]
    : `Custom: ${formatNumber(season.ambientC)} °C, ${formatNumber(season.auxPowerW / 1000)} kW auxiliary`;
}
