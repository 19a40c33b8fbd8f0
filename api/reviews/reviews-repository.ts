import { and, asc, desc, eq, type SQL } from 'drizzle-orm';
import type { AuditEvent, ReviewItem, ReviewListQuery } from '@shared/domain/reviews';
import type { Executor } from '../db/client';
import { reviewEvents, reviewItems, scenarios, type ReviewEventRow, type ReviewItemRow } from '../db/schema/index';
import { readStoredReviewItem } from '../results/stored-result';
import { readScenarioResult } from '../scenarios/scenarios-repository';

export async function listReviewItems(db: Executor, query: ReviewListQuery): Promise<ReviewItemRow[]> {
  const filters: SQL[] = [];
  if (query.risk) filters.push(eq(reviewItems.risk, query.risk));
  if (query.state) filters.push(eq(reviewItems.state, query.state));
  if (query.routeId) filters.push(eq(reviewItems.routeId, query.routeId));
  if (query.vehicleProfileId) filters.push(eq(reviewItems.vehicleProfileId, query.vehicleProfileId));
  const rows = await db
    .select()
    .from(reviewItems)
    .where(and(...filters))
    .orderBy(desc(reviewItems.riskRank), desc(reviewItems.peakBrakeTempC), asc(reviewItems.raisedAt));
  return rows.map(readStoredReviewItem);
}

export async function findReviewItem(db: Executor, reviewId: string, options: { lock?: boolean } = {}) {
  const query = db.select().from(reviewItems).where(eq(reviewItems.id, reviewId));
  const [row] = options.lock ? await query.for('update') : await query;
  return row && readStoredReviewItem(row);
}

export async function updateReviewItem(db: Executor, reviewId: string, values: Partial<typeof reviewItems.$inferInsert>) {
  const [row] = await db
    .update(reviewItems)
    .set({ ...values, updatedAt: new Date() })
    .where(eq(reviewItems.id, reviewId))
    .returning();
  return readStoredReviewItem(row!);
}

export async function insertReviewEvent(db: Executor, values: typeof reviewEvents.$inferInsert): Promise<ReviewEventRow> {
  const [row] = await db.insert(reviewEvents).values(values).returning();
  return row!;
}

export function listReviewEvents(db: Executor, reviewId: string): Promise<ReviewEventRow[]> {
  return db.select().from(reviewEvents).where(eq(reviewEvents.reviewId, reviewId)).orderBy(asc(reviewEvents.at), asc(reviewEvents.id));
}

/** The stored result of the scenario the item shows, for the chart and the map. */
export async function findScenarioResult(db: Executor, scenarioId: string) {
  const [row] = await db
    .select({
      id: scenarios.id,
      resultVersion: scenarios.resultVersion,
      summary: scenarios.summary,
      riskCounts: scenarios.riskCounts,
      directionResults: scenarios.directionResults,
    })
    .from(scenarios)
    .where(eq(scenarios.id, scenarioId));
  return (row && readScenarioResult(row)?.directions) ?? null;
}

export function toReviewItem(row: ReviewItemRow): ReviewItem {
  const { descent } = row;
  return {
    id: row.id,
    state: row.state,
    scenarioId: row.scenarioId,
    scenarioName: row.scenarioName,
    routeId: row.routeId,
    routeName: row.routeName,
    vehicleProfileId: row.vehicleProfileId,
    vehicleProfileName: row.vehicleProfileName,
    direction: row.direction,
    startM: descent.startM,
    endM: descent.endM,
    dropM: descent.dropM,
    meanGradePercent: descent.meanGradePercent,
    maxGradePercent: descent.maxGradePercent,
    risk: row.risk,
    raisedRisk: row.raisedRisk,
    peakBrakeTempC: descent.peakBrakeTempC,
    gsrsPeakBrakeTempC: descent.gsrsPeakBrakeTempC,
    fadeThresholdC: descent.fadeThresholdC,
    maxSafeSpeedKph: descent.maxSafeSpeedKph,
    speedAdvice: descent.speedAdvice,
    maxTopSoc: descent.maxTopSoc,
    mitigation: row.mitigation ?? null,
    mitigatedRisk: row.mitigatedRisk ?? null,
    mitigatedPeakBrakeTempC: row.mitigatedPeakBrakeTempC ?? null,
    acceptanceReason: row.acceptanceReason ?? null,
    acceptanceProposedById: row.acceptanceProposedById ?? null,
    acceptanceProposedByName: row.acceptanceProposedByName ?? null,
    acceptanceProposedAt: row.acceptanceProposedAt?.toISOString() ?? null,
    acceptanceSignedOffByName: row.acceptanceSignedOffByName ?? null,
    acceptanceSignedOffAt: row.acceptanceSignedOffAt?.toISOString() ?? null,
    raisedAt: row.raisedAt.toISOString(),
    updatedAt: row.updatedAt.toISOString(),
  };
}

export function toAuditEvent(row: ReviewEventRow): AuditEvent {
  return {
    id: row.id,
    reviewId: row.reviewId,
    actorName: row.actorName,
    at: row.at.toISOString(),
    fromState: row.fromState ?? null,
    toState: row.toState,
    note: row.note ?? null,
    details: row.details ?? null,
  };
}
