import type { Direction, Scenario } from '@shared/domain/scenarios';
import type { LoadCase, Season } from '@shared/domain/vehicle-profiles';

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

export const STATUS_LABELS: Readonly<Record<Scenario['status'], string>> = {
  queued: 'Waiting to run',
  running: 'Running',
  done: 'Done',
  failed: 'Failed',
};

/** "Seated load", "45 passengers". */
export function describeLoad(load: Scenario['load']): string {
  return load.kind === 'case' ? LOAD_LABELS[load.case] : `${load.passengers} passengers`;
}

/** "Winter", "Custom: −5 °C, 18 kW auxiliary" (metric; the form shows the chosen units). */
export function describeSeason(season: Scenario['season']): string {
  return season.kind === 'season'
    ? SEASON_LABELS[season.season]
    : `Custom: ${season.ambientC} °C, ${Math.round(season.auxPowerW / 1000)} kW auxiliary`;
}
