/**
 * The rules of descent review, free of HTTP and SQL: which descents need review, how a rerun's
 * descent finds its existing item, when a rerun counts as worse, and which moves are allowed.
 */
import type { RiskLevel } from '@shared/domain/analysis';
import { REVIEW_TRANSITIONS, governingRisk, type ReviewAction, type ReviewState } from '@shared/domain/reviews';
import { isHighRisk, needsCaution, riskRank } from '@shared/presentation/risk-styles';
import { ConflictError } from '../http/http-error';

export { isHighRisk, riskRank };

/** Whether a descent becomes a review item: "elevated" or worse (its governing risk), the levels that carry a caution. */
export function needsReview(descent: Parameters<typeof governingRisk>[0]): boolean {
  return needsCaution(governingRisk(descent));
}

/**
 * Two stretches are the same descent when their overlap covers at least this share of the
 * shorter one. Our own choice: reruns move a descent's ends by a few resampling steps (spacing,
 * smoothing, terrain updates), while distinct descents on one route rarely overlap at all.
 */
export const SAME_STRETCH_MIN_OVERLAP_SHARE = 0.5;

/**
 * A rerun whose peak brake temperature is this much hotter than the reviewed figures counts as
 * worse even at the same risk level. Our own choice: small input changes move peaks by a few
 * degrees, which should not reopen a decision.
 */
export const REOPEN_PEAK_MARGIN_C = 10;

export interface Stretch {
  startM: number;
  endM: number;
}

/** Overlap of two stretches as a share of the shorter one (0 when they do not touch). */
export function overlapShare(a: Stretch, b: Stretch): number {
  const overlapM = Math.min(a.endM, b.endM) - Math.max(a.startM, b.startM);
  const shorterM = Math.min(a.endM - a.startM, b.endM - b.startM);
  if (overlapM <= 0 || shorterM <= 0) return 0;
  return overlapM / shorterM;
}

/**
 * Pairs each descent with the existing item of the best overlap (at least
 * SAME_STRETCH_MIN_OVERLAP_SHARE), each item taken at most once; the best overlaps are paired
 * first. Returns the item index per descent, or -1 for a new stretch.
 */
export function matchStretches(descents: readonly Stretch[], items: readonly Stretch[]): number[] {
  const candidates: Array<{ descent: number; item: number; share: number }> = [];
  descents.forEach((descent, d) =>
    items.forEach((item, i) => {
      const share = overlapShare(descent, item);
      if (share >= SAME_STRETCH_MIN_OVERLAP_SHARE) candidates.push({ descent: d, item: i, share });
    }),
  );
  candidates.sort((a, b) => b.share - a.share);
  const matched = descents.map(() => -1);
  const takenItems = new Set<number>();
  for (const candidate of candidates) {
    if (matched[candidate.descent] !== -1 || takenItems.has(candidate.item)) continue;
    matched[candidate.descent] = candidate.item;
    takenItems.add(candidate.item);
  }
  return matched;
}

export interface DescentFigures {
  risk: RiskLevel;
  peakBrakeTempC: number;
}

/** Whether `next` is worse than `previous`: a higher risk, or a peak hotter beyond the margin. */
export function isWorse(next: DescentFigures, previous: DescentFigures): boolean {
  if (riskRank(next.risk) > riskRank(previous.risk)) return true;
  if (riskRank(next.risk) < riskRank(previous.risk)) return false;
  return next.peakBrakeTempC > previous.peakBrakeTempC + REOPEN_PEAK_MARGIN_C;
}

/** Orders figures worst first: risk, then peak temperature. */
export function compareWorstFirst(a: DescentFigures, b: DescentFigures): number {
  return riskRank(b.risk) - riskRank(a.risk) || b.peakBrakeTempC - a.peakBrakeTempC;
}

/** The state an action leads to from `state`; 409 naming the current state when not allowed. */
export function nextState(state: ReviewState, action: ReviewAction): ReviewState {
  const rule = REVIEW_TRANSITIONS[action];
  if (!rule.from.includes(state)) {
    throw new ConflictError(
      `Cannot ${action} a review item that is ${state}; ${action} applies to items that are ${rule.from.join(' or ')}`,
      'invalid_transition',
      { currentState: state, action, allowedFrom: rule.from },
    );
  }
  return rule.to;
}
