import type { Direction } from '@shared/domain/scenarios';

/** Plain words for the direction of travel of a scenario. */
export const DIRECTION_LABELS: Readonly<Record<Direction, string>> = {
  outbound: 'Outbound',
  inbound: 'Inbound',
  'round-trip': 'Round trip',
};
