import {
  NO_REVIEW_FILTER,
  countByState,
  filterFromQuery,
  matchesReviewFilter,
  routeOptions,
  vehicleOptions,
} from '../../../web/app/reviews/review-filter';
import { BUS_12M, ROUTE_PASS, ROUTE_VALLEY, TROLLEY, aReviewItem } from '../support/review-builders';

describe('review filter', () => {
  const items = [
    aReviewItem({ risk: 'high', state: 'raised', ...ROUTE_PASS, ...BUS_12M }),
    aReviewItem({ risk: 'critical', state: 'in-review', ...ROUTE_PASS, ...TROLLEY }),
    aReviewItem({ risk: 'elevated', state: 'mitigated', ...ROUTE_VALLEY, ...BUS_12M }),
    aReviewItem({ risk: 'high', state: 'accepted', ...ROUTE_VALLEY, ...TROLLEY }),
  ];

  it('keeps every item when no filter is set', () => {
    expect(items.filter((item) => matchesReviewFilter(item, NO_REVIEW_FILTER))).toHaveLength(4);
  });

  it('keeps only items matching risk, state, route and vehicle together', () => {
    const byRisk = items.filter((item) => matchesReviewFilter(item, { ...NO_REVIEW_FILTER, risk: 'high' }));
    const byRiskAndRoute = items.filter((item) =>
      matchesReviewFilter(item, { ...NO_REVIEW_FILTER, risk: 'high', routeId: ROUTE_VALLEY.routeId }),
    );
    const byVehicleAndState = items.filter((item) =>
      matchesReviewFilter(item, { ...NO_REVIEW_FILTER, vehicleProfileId: TROLLEY.vehicleProfileId, state: 'in-review' }),
    );

    expect(byRisk.map((item) => item.state)).toEqual(['raised', 'accepted']);
    expect(byRiskAndRoute.map((item) => item.state)).toEqual(['accepted']);
    expect(byVehicleAndState.map((item) => item.risk)).toEqual(['critical']);
  });

  it('counts every state, zero included, over the items matching the other filters', () => {
    expect(countByState(items)).toEqual({ raised: 1, 'in-review': 1, mitigated: 1, 'awaiting-sign-off': 0, accepted: 1, reopened: 0 });
    expect(countByState(items, { ...NO_REVIEW_FILTER, routeId: ROUTE_PASS.routeId, state: 'accepted' })).toEqual({
      raised: 1,
      'in-review': 1,
      mitigated: 0,
      'awaiting-sign-off': 0,
      accepted: 0,
      reopened: 0,
    });
  });

  it('offers each route and vehicle once, by name', () => {
    expect(routeOptions(items).map((option) => option.name)).toEqual(['Pass road', 'Valley line']);
    expect(vehicleOptions(items).map((option) => option.name)).toEqual(['12 m battery bus', 'Articulated trolleybus']);
  });

  it('reads a filter from the address and ignores values that are not ours', () => {
    expect(filterFromQuery({ risk: 'critical', state: 'reopened', routeId: ROUTE_PASS.routeId })).toEqual({
      risk: 'critical',
      state: 'reopened',
      routeId: ROUTE_PASS.routeId,
      vehicleProfileId: '',
    });
    expect(filterFromQuery({ risk: 'catastrophic', state: 'closed' })).toEqual(NO_REVIEW_FILTER);
  });
});
