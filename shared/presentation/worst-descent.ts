/**
 * The worst descent of a result, as the compare screen and the board name it: the highest risk,
 * then the hottest brakes. One rule, so every place that says "worst" means the same descent.
 */
import type { Descent, RiskLevel } from '../domain/analysis';
import type { Direction } from '../domain/scenarios';
import { riskRank } from './risk-styles';

export interface DescentInDirection {
  direction: Direction;
  descent: Descent;
}

export function worstDescent(directions: readonly { direction: Direction; descents: readonly Descent[] }[]): DescentInDirection | null {
  let worst: DescentInDirection | null = null;
  for (const { direction, descents } of directions) {
    for (const descent of descents) {
      if (
        !worst ||
        riskRank(descent.risk) > riskRank(worst.descent.risk) ||
        (descent.risk === worst.descent.risk && descent.peakBrakeTempC > worst.descent.peakBrakeTempC)
      ) {
        worst = { direction, descent };
      }
    }
  }
  return worst;
}

/** How many descents of each risk level a result has. */
export function countByRisk(directions: readonly { descents: readonly Descent[] }[]): Record<RiskLevel, number> {
  const counts: Record<RiskLevel, number> = { low: 0, elevated: 0, high: 0, critical: 0 };
  for (const { descents } of directions) for (const descent of descents) counts[descent.risk]++;
  return counts;
}
