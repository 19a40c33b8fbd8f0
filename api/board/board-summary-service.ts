/**
 * The board's network summary: a year of regeneration, braking and net energy over the routes in
 * service, what it is worth and what CO₂ it avoids, and the open safety items.
 *
 * Which result counts for a route: among the route's scenarios marked in service that have a
 * stored result, the one computed last (ties: the one saved last). One scenario per route, so a
 * route with a summer and a winter variant in service is not counted twice.
 *
 * `annual` puts the year on one stated basis: the in-service service days weighted by the
 * network's day counts when there are any, else these scenario totals (api/board/annual-basis.ts).
 */
import type { BoardSummary, RouteYear } from '@shared/domain/board-summary';
import type { Descent } from '@shared/domain/analysis';
import { ENGINEERING_CAUTION } from '@shared/engine/constants';
import { annualise } from '@shared/engine/summary';
import type { Executor } from '../db/client';
import { matchStretches } from '../reviews/review-workflow';
import { readScenarioResult } from '../scenarios/scenarios-repository';
import { readNetworkSettings } from './network-settings';
import { annualBasis } from './annual-basis';
import {
  countAcceptedHighRiskItems,
  countOpenReviewItemsByRisk,
  findLatestInServiceScenarioPerRoute,
  findReviewStretchesOfRoutes,
} from './board-repository';

/** How many descents the summary lists, steepest mean grade first. */
export const STEEPEST_DESCENT_COUNT = 5;

export async function boardSummary(db: Executor, now: Date = new Date()): Promise<BoardSummary> {
  const settings = await readNetworkSettings(db);
  const chosen = await inServiceScenarios(db);

  const routes: RouteYear[] = chosen.map((row) => {
    const year = annualise(row.summary, { tripsPerDay: row.tripsPerDay, serviceDaysPerYear: row.serviceDaysPerYear });
    return {
      routeId: row.routeId,
      routeName: row.routeName,
      scenarioId: row.scenarioId,
      scenarioName: row.scenarioName,
      vehicleProfileName: row.vehicleProfileName,
      direction: row.direction,
      computedAt: row.computedAt.toISOString(),
      tripsPerDay: row.tripsPerDay,
      serviceDaysPerYear: row.serviceDaysPerYear,
      annualKm: year.lengthKm,
      annualRegenKWh: year.regenEnergyKWh,
      annualFrictionBrakeKWh: year.frictionBrakeEnergyKWh,
      annualNetKWh: year.batteryNetEnergyKWh,
      kWhPerKm: row.summary.kWhPerKm,
    };
  });
  const sum = (pick: (route: RouteYear) => number) => routes.reduce((total, route) => total + pick(route), 0);
  const annualRegenKWh = sum((route) => route.annualRegenKWh);

  const totals = {
    annualKm: sum((route) => route.annualKm),
    annualRegenKWh,
    annualFrictionBrakeKWh: sum((route) => route.annualFrictionBrakeKWh),
    annualNetKWh: sum((route) => route.annualNetKWh),
    regenValue: annualRegenKWh * settings.energyTariffPerKWh,
    co2AvoidedKg: annualRegenKWh * settings.gridEmissionFactorKgPerKWh,
  };
  return {
    generatedAt: now.toISOString(),
    settings: {
      energyTariffPerKWh: settings.energyTariffPerKWh,
      currency: settings.currency,
      tariffSource: settings.tariffSource,
      gridEmissionFactorKgPerKWh: settings.gridEmissionFactorKgPerKWh,
      emissionFactorSource: settings.emissionFactorSource,
      isPlaceholder: settings.isPlaceholder,
    },
    routes,
    totals,
    openSafetyItems: await openItemCounts(db),
    acceptedRisks: await acceptedRiskCounts(db),
    steepestDescents: await steepestDescents(db, chosen),
    caution: ENGINEERING_CAUTION,
    annual: await annualBasis(db, settings, totals),
  };
}

type ChosenScenario = Awaited<ReturnType<typeof inServiceScenarios>>[number];

async function inServiceScenarios(db: Executor) {
  const rows = await findLatestInServiceScenarioPerRoute(db);
  return rows
    .map((row) => {
      const stored = readScenarioResult({ ...row, id: row.scenarioId });
      return { ...row, summary: stored?.summary ?? row.summary!, computedAt: row.computedAt!, directionResults: stored?.directions ?? [] };
    })
    .sort((a, b) => a.routeName.localeCompare(b.routeName));
}

async function openItemCounts(db: Executor): Promise<BoardSummary['openSafetyItems']> {
  const rows = await countOpenReviewItemsByRisk(db);
  const counts = { elevated: 0, high: 0, critical: 0 };
  for (const row of rows) if (row.risk !== 'low') counts[row.risk] = row.count;
  return counts;
}

async function acceptedRiskCounts(db: Executor): Promise<BoardSummary['acceptedRisks']> {
  const rows = await countAcceptedHighRiskItems(db);
  const counts = { high: 0, critical: 0 };
  for (const row of rows) if (row.risk === 'high' || row.risk === 'critical') counts[row.risk] = row.count;
  return counts;
}

async function steepestDescents(db: Executor, chosen: ChosenScenario[]): Promise<BoardSummary['steepestDescents']> {
  const candidates = chosen.flatMap((row) =>
    row.directionResults.flatMap((direction) => direction.descents.map((descent) => ({ row, direction: direction.direction, descent }))),
  );
  // Grades are negative downhill: the steepest mean grade is the most negative. A stretch of the
  // same route in the same direction is listed once (its steepest reading), so two overlapping
  // ranges never read as two descents.
  const steepest: typeof candidates = [];
  for (const candidate of candidates.sort((a, b) => a.descent.meanGradePercent - b.descent.meanGradePercent)) {
    const overlapping = steepest.some(
      (kept) =>
        kept.row.routeId === candidate.row.routeId &&
        kept.direction === candidate.direction &&
        kept.descent.startM < candidate.descent.endM &&
        candidate.descent.startM < kept.descent.endM,
    );
    if (!overlapping) steepest.push(candidate);
    if (steepest.length === STEEPEST_DESCENT_COUNT) break;
  }
  const items =
    steepest.length === 0 ? [] : await findReviewStretchesOfRoutes(db, [...new Set(steepest.map((entry) => entry.row.routeId))]);
  return steepest.map(({ row, direction, descent }) => ({
    reviewId: reviewIdFor(items, row, direction, descent),
    routeName: row.routeName,
    direction: direction as BoardSummary['steepestDescents'][number]['direction'],
    startM: descent.startM,
    endM: descent.endM,
    dropM: descent.dropM,
    meanGradePercent: descent.meanGradePercent,
    risk: descent.risk,
  }));
}

function reviewIdFor(
  items: Array<{ id: string; routeId: string; vehicleProfileId: string; direction: string; startM: number; endM: number }>,
  row: ChosenScenario,
  direction: string,
  descent: Descent,
): string | null {
  const sameKey = items.filter(
    (item) => item.routeId === row.routeId && item.vehicleProfileId === row.vehicleProfileId && item.direction === direction,
  );
  const [index] = matchStretches([descent], sameKey);
  return index !== undefined && index >= 0 ? sameKey[index]!.id : null;
}
