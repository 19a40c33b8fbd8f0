import type { BatchRun } from '@shared/domain/board-summary';
import type { AuditEvent, ReviewItem } from '@shared/domain/reviews';

let counter = 0;

/** A valid v4-shaped UUID, different on every call. */
export function aUuid(): string {
  counter += 1;
  return `00000000-0000-4000-8000-${counter.toString(16).padStart(12, '0')}`;
}

export const ROUTE_PASS = { routeId: '10000000-0000-4000-8000-000000000001', routeName: 'Pass road' };
export const ROUTE_VALLEY = { routeId: '10000000-0000-4000-8000-000000000002', routeName: 'Valley line' };
export const BUS_12M = { vehicleProfileId: '20000000-0000-4000-8000-000000000001', vehicleProfileName: '12 m battery bus' };
export const TROLLEY = { vehicleProfileId: '20000000-0000-4000-8000-000000000002', vehicleProfileName: 'Articulated trolleybus' };

export function aReviewItem(overrides: Partial<ReviewItem> = {}): ReviewItem {
  return {
    id: aUuid(),
    state: 'raised',
    scenarioId: aUuid(),
    scenarioName: 'Winter, full standing',
    ...ROUTE_PASS,
    ...BUS_12M,
    direction: 'outbound',
    startM: 2_400,
    endM: 6_900,
    dropM: 410,
    meanGradePercent: -9.1,
    maxGradePercent: -12.4,
    risk: 'high',
    raisedRisk: 'high',
    peakBrakeTempC: 486,
    gsrsPeakBrakeTempC: 455,
    fadeThresholdC: 450,
    maxSafeSpeedKph: 27.5,
    speedAdvice: 'limit',
    maxTopSoc: 0.62,
    mitigation: null,
    mitigatedRisk: null,
    mitigatedPeakBrakeTempC: null,
    acceptanceReason: null,
    acceptanceProposedById: null,
    acceptanceProposedByName: null,
    acceptanceProposedAt: null,
    acceptanceSignedOffByName: null,
    acceptanceSignedOffAt: null,
    raisedAt: '2026-11-30T08:00:00.000Z',
    updatedAt: '2026-11-30T08:00:00.000Z',
    ...overrides,
  };
}

export function anAuditEvent(overrides: Partial<AuditEvent> = {}): AuditEvent {
  return {
    id: aUuid(),
    reviewId: aUuid(),
    actorName: 'Marta Oyelaran',
    at: '2026-11-30T09:00:00.000Z',
    fromState: 'raised',
    toState: 'in-review',
    note: null,
    details: null,
    ...overrides,
  };
}

export function aBatchRun(overrides: Partial<BatchRun> = {}): BatchRun {
  return {
    id: '30000000-0000-4000-8000-000000000001',
    status: 'running',
    total: 3,
    done: 1,
    failed: 0,
    startedBy: 'Ada Brennan',
    reason: null,
    createdAt: '2026-11-30T10:00:00.000Z',
    finishedAt: null,
    items: [
      { scenarioId: aUuid(), scenarioName: 'Pass road, winter', status: 'done', error: null },
      { scenarioId: aUuid(), scenarioName: 'Valley line, summer', status: 'running', error: null },
      { scenarioId: aUuid(), scenarioName: 'Ridge loop, winter', status: 'queued', error: null },
    ],
    ...overrides,
  };
}
