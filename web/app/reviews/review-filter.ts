import type { RiskLevel } from '@shared/domain/analysis';
import { REVIEW_STATES, type ReviewItem, type ReviewState } from '@shared/domain/reviews';

/** What the review queue is narrowed to; an empty string means "any". */
export interface ReviewFilter {
  risk: RiskLevel | '';
  state: ReviewState | '';
  routeId: string;
  vehicleProfileId: string;
}

export const NO_REVIEW_FILTER: Readonly<ReviewFilter> = { risk: '', state: '', routeId: '', vehicleProfileId: '' };

export function matchesReviewFilter(item: ReviewItem, filter: ReviewFilter): boolean {
  return (
    (!filter.risk || item.risk === filter.risk) &&
    (!filter.state || item.state === filter.state) &&
    (!filter.routeId || item.routeId === filter.routeId) &&
    (!filter.vehicleProfileId || item.vehicleProfileId === filter.vehicleProfileId)
  );
}

/**
 * Items per state, every state present (0 when none). Counted over the items matching the other
 * filters, so the counts answer "how many would I see if I picked this state".
 */
export function countByState(items: readonly ReviewItem[], filter: ReviewFilter = NO_REVIEW_FILTER): Record<ReviewState, number> {
  const counts = Object.fromEntries(REVIEW_STATES.map((state) => [state, 0])) as Record<ReviewState, number>;
  const others = { ...filter, state: '' as const };
  for (const item of items) {
    if (matchesReviewFilter(item, others)) counts[item.state] += 1;
  }
  return counts;
}

export interface NamedOption {
  id: string;
  name: string;
}

/** The routes that have review items, by name. */
export function routeOptions(items: readonly ReviewItem[]): NamedOption[] {
  return uniqueByName(items.map((item) => ({ id: item.routeId, name: item.routeName })));
}

/** The vehicle profiles that have review items, by name. */
export function vehicleOptions(items: readonly ReviewItem[]): NamedOption[] {
  return uniqueByName(items.map((item) => ({ id: item.vehicleProfileId, name: item.vehicleProfileName })));
}

/** Reads a filter from URL query parameters, ignoring values that are not ours. */
export function filterFromQuery(params: Readonly<Record<string, string | undefined>>): ReviewFilter {
  const risk = params['risk'];
  const state = params['state'];
  return {
    risk: risk === 'low' || risk === 'elevated' || risk === 'high' || risk === 'critical' ? risk : '',
    state: REVIEW_STATES.find((candidate) => candidate === state) ?? '',
    routeId: params['routeId'] ?? '',
    vehicleProfileId: params['vehicleProfileId'] ?? '',
  };
}

function uniqueByName(options: NamedOption[]): NamedOption[] {
  const byId = new Map(options.map((option) => [option.id, option]));
  return [...byId.values()].sort((a, b) => a.name.localeCompare(b.name, 'en'));
}
