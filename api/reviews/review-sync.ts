/**
 * Keeps review items in step with stored scenario results. Called by the scenario run right
 * after it stores a result, inside the same transaction, so items, audit events and e-mails
 * exist exactly when the result does.
 */
import { and, desc, eq, sql } from 'drizzle-orm';
import type { Descent } from '@shared/domain/analysis';
import type { ReviewState } from '@shared/domain/reviews';
import type { DirectionResult } from '@shared/domain/scenarios';
import type { Executor } from '../db/client';
import { reviewEvents, reviewItems, roadRouteVersions, vehicleProfiles, type ReviewItemRow, type ReviewSource } from '../db/schema/index';
import { readStoredReviewItem, STORED_RESULT_VERSION } from '../results/stored-result';
import { notifyHighRiskDescent } from './review-notifications';
import { isHighRisk, riskRank } from '@shared/presentation/risk-styles';
import { compareWorstFirst, isWorse, matchStretches, needsReview } from './review-workflow';

/** The scenario fields the sync needs (a scenarios row fits). */
export interface ReviewSyncScenario {
  id: string;
  name: string;
  routeId: string;
  vehicleProfileId: string;
  createdById: string | null;
}

/** The stored result the sync reads (a scenario result, or a row's `directionResults`). */
export interface ReviewSyncResult {
  computedAt: string | Date;
  directions: ReadonlyArray<Pick<DirectionResult, 'direction' | 'descents'>>;
}

export interface ReviewSyncOptions {
  /** Base of the links in e-mails (config PUBLIC_URL). */
  publicUrl?: string;
}

export interface ReviewSyncReport {
  raised: string[];
  updated: string[];
  reopened: string[];
}

/** Actor name of events written by reruns rather than by a person. */
export const RERUN_ACTOR = 'Descentry (scenario run)';
/** States a worse rerun reopens: decided ones, and an acceptance still waiting for its sign-off. */
const RESOLVED: readonly ReviewState[] = ['mitigated', 'awaiting-sign-off', 'accepted'];

/**
 * Raises, updates or reopens the review items of one scenario's result:
 *
 * - each descent at "elevated" risk or worse finds the item of its route, direction, vehicle
 *   profile and overlapping stretch, or raises a new one (e-mailing safety officers when high
 *   or critical);
 * - an item shows the worst figures among the scenarios that see its stretch, so a milder
 *   scenario on the same stretch never hides a harsher one;
 * - a mitigated or accepted item whose figures get worse (higher risk, or a peak hotter beyond
 *   the margin) is reopened;
 * - a scenario whose rerun no longer finds the descent stops counting as a source; the item and
 *   its state stay for the safety officers to close.
 */
export async function syncReviewItems(
  tx: Executor,
  scenario: ReviewSyncScenario,
  result: ReviewSyncResult,
  options: ReviewSyncOptions = {},
): Promise<ReviewSyncReport> {
  const publicUrl = options.publicUrl ?? process.env['PUBLIC_URL'] ?? 'http://127.0.0.1:4300';
  const report: ReviewSyncReport = { raised: [], updated: [], reopened: [] };
  const computedAt = new Date(result.computedAt).toISOString();

  // Two scenarios of one route and vehicle synced at once (batch runs) must not both raise the
  // same new stretch: serialise syncs per route and vehicle profile until commit.
  await tx.execute(sql`select pg_advisory_xact_lock(hashtext(${`review:${scenario.routeId}:${scenario.vehicleProfileId}`}))`);
  const names = await currentNames(tx, scenario);

  for (const direction of ['outbound', 'inbound'] as const) {
    const directionResult = result.directions.find((candidate) => candidate.direction === direction);
    const descents = (directionResult?.descents ?? []).filter(needsReview);
    const existing = await tx
      .select()
      .from(reviewItems)
      .where(
        and(
          eq(reviewItems.routeId, scenario.routeId),
          eq(reviewItems.vehicleProfileId, scenario.vehicleProfileId),
          eq(reviewItems.direction, direction),
        ),
      )
      .orderBy(reviewItems.startM)
      .for('update')
      .then((rows) => rows.map(readStoredReviewItem));
    const matches = matchStretches(descents, existing);
    const touched = new Set<string>();

    for (const [index, descent] of descents.entries()) {
      const source: ReviewSource = {
        scenarioId: scenario.id,
        scenarioName: scenario.name,
        createdById: scenario.createdById,
        computedAt,
        descent,
      };
      const item = existing[matches[index]!];
      if (!item) {
        const raised = await raiseItem(tx, scenario, names, direction, source);
        report.raised.push(raised.id);
        if (isHighRisk(raised.risk)) await notifyHighRiskDescent(tx, publicUrl, raised, 'new');
        continue;
      }
      touched.add(item.id);
      const outcome = await updateItem(tx, item, { ...item.sources, [scenario.id]: source }, names);
      if (outcome.reopened) {
        report.reopened.push(item.id);
        if (isHighRisk(outcome.row.risk)) await notifyHighRiskDescent(tx, publicUrl, outcome.row, 'reopened');
      } else {
        report.updated.push(item.id);
      }
    }

    // This scenario no longer sees these stretches at "elevated" or worse.
    for (const item of existing) {
      if (touched.has(item.id) || !(scenario.id in item.sources)) continue;
      const { [scenario.id]: _gone, ...remaining } = item.sources;
      await updateItem(tx, item, remaining, names);
      report.updated.push(item.id);
    }
  }
  return report;
}

interface CurrentNames {
  routeName: string;
  vehicleProfileName: string;
}

async function currentNames(tx: Executor, scenario: ReviewSyncScenario): Promise<CurrentNames> {
  const [route] = await tx
    .select({ name: roadRouteVersions.name })
    .from(roadRouteVersions)
    .where(eq(roadRouteVersions.routeId, scenario.routeId))
    .orderBy(desc(roadRouteVersions.version))
    .limit(1);
  const [profile] = await tx
    .select({ name: vehicleProfiles.name })
    .from(vehicleProfiles)
    .where(eq(vehicleProfiles.id, scenario.vehicleProfileId));
  return { routeName: route?.name ?? 'Unnamed route', vehicleProfileName: profile?.name ?? 'Unnamed vehicle profile' };
}

function figuresColumns(descent: Descent) {
  return {
    startM: descent.startM,
    endM: descent.endM,
    meanGradePercent: descent.meanGradePercent,
    risk: descent.risk,
    riskRank: riskRank(descent.risk),
    peakBrakeTempC: descent.peakBrakeTempC,
    descent,
    resultVersion: STORED_RESULT_VERSION,
  };
}

async function raiseItem(
  tx: Executor,
  scenario: ReviewSyncScenario,
  names: CurrentNames,
  direction: 'outbound' | 'inbound',
  source: ReviewSource,
): Promise<ReviewItemRow> {
  const [row] = await tx
    .insert(reviewItems)
    .values({
      state: 'raised',
      routeId: scenario.routeId,
      vehicleProfileId: scenario.vehicleProfileId,
      direction,
      ...names,
      scenarioId: scenario.id,
      scenarioName: scenario.name,
      ...figuresColumns(source.descent),
      raisedRisk: source.descent.risk,
      sources: { [scenario.id]: source },
    })
    .returning();
  await tx.insert(reviewEvents).values({
    reviewId: row!.id,
    actorName: RERUN_ACTOR,
    fromState: null,
    toState: 'raised',
    note: `Raised by a run of scenario “${scenario.name}”`,
    details: { kind: 'raised', scenarioId: scenario.id, risk: source.descent.risk, peakBrakeTempC: source.descent.peakBrakeTempC },
  });
  return row!;
}

/** Stores new sources; shows the worst; reopens a resolved item that got worse. */
async function updateItem(
  tx: Executor,
  item: ReviewItemRow,
  sources: Record<string, ReviewSource>,
  names: CurrentNames,
): Promise<{ row: ReviewItemRow; reopened: boolean }> {
  const worst = Object.values(sources).sort((a, b) => compareWorstFirst(a.descent, b.descent))[0];
  if (!worst) {
    // No scenario sees the stretch any more: keep the last figures for the record.
    const [row] = await tx
      .update(reviewItems)
      .set({ sources, resultVersion: item.resultVersion, updatedAt: new Date() })
      .where(eq(reviewItems.id, item.id))
      .returning();
    return { row: row!, reopened: false };
  }
  const previous = { risk: item.risk, peakBrakeTempC: item.peakBrakeTempC };
  const reopened = RESOLVED.includes(item.state) && isWorse(worst.descent, previous);
  const [row] = await tx
    .update(reviewItems)
    .set({
      ...names,
      scenarioId: worst.scenarioId,
      scenarioName: worst.scenarioName,
      ...figuresColumns(worst.descent),
      sources,
      state: reopened ? 'reopened' : item.state,
      updatedAt: new Date(),
    })
    .where(eq(reviewItems.id, item.id))
    .returning();
  const details = {
    scenarioId: worst.scenarioId,
    previousRisk: previous.risk,
    risk: worst.descent.risk,
    previousPeakBrakeTempC: previous.peakBrakeTempC,
    peakBrakeTempC: worst.descent.peakBrakeTempC,
  };
  if (reopened) {
    await tx.insert(reviewEvents).values({
      reviewId: item.id,
      actorName: RERUN_ACTOR,
      fromState: item.state,
      toState: 'reopened',
      note: `Reopened: a rerun of scenario “${worst.scenarioName}” made the descent worse`,
      details: { kind: 'reopened-by-rerun', ...details },
    });
  } else if (worst.descent.risk !== previous.risk) {
    // The state stays; the trail still shows that the figures behind it moved.
    await tx.insert(reviewEvents).values({
      reviewId: item.id,
      actorName: RERUN_ACTOR,
      fromState: item.state,
      toState: item.state,
      note: `A rerun changed the risk from ${previous.risk} to ${worst.descent.risk}`,
      details: { kind: 'figures-changed', ...details },
    });
  }
  return { row: row!, reopened };
}
