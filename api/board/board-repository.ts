/** Queries behind the board summary: the scenarios in service with their routes' schedules, and review-item counts and stretches. */
import { and, desc, eq, inArray, isNotNull, isNull, sql } from 'drizzle-orm';
import { OPEN_REVIEW_STATES } from '@shared/domain/reviews';
import type { Executor } from '../db/client';
import { isCurrentVersionOfRoute } from '../road-routes/road-routes-repository';
import { reviewItems, roadRouteVersions, roadRoutes, scenarios, vehicleProfiles } from '../db/schema/index';

/**
 * Per route, the scenario in service (not deleted) with a stored result computed last (ties: the
 * one saved last), with its route's current name and schedule and its vehicle profile's name.
 */
export function findLatestInServiceScenarioPerRoute(db: Executor) {
  return db
    .selectDistinctOn([scenarios.routeId], {
      scenarioId: scenarios.id,
      scenarioName: scenarios.name,
      routeId: scenarios.routeId,
      vehicleProfileId: scenarios.vehicleProfileId,
      direction: scenarios.direction,
      computedAt: scenarios.computedAt,
      summary: scenarios.summary,
      riskCounts: scenarios.riskCounts,
      directionResults: scenarios.directionResults,
      resultVersion: scenarios.resultVersion,
      vehicleProfileName: vehicleProfiles.name,
      routeName: roadRouteVersions.name,
      // The route's current schedule: trips per day change without changing the physics.
      tripsPerDay: roadRouteVersions.tripsPerDay,
      serviceDaysPerYear: roadRouteVersions.serviceDaysPerYear,
    })
    .from(scenarios)
    .innerJoin(roadRoutes, eq(roadRoutes.id, scenarios.routeId))
    .innerJoin(roadRouteVersions, isCurrentVersionOfRoute)
    .innerJoin(vehicleProfiles, eq(vehicleProfiles.id, scenarios.vehicleProfileId))
    .where(and(eq(scenarios.inService, true), isNull(scenarios.deletedAt), isNotNull(scenarios.summary), isNotNull(scenarios.computedAt)))
    .orderBy(scenarios.routeId, desc(scenarios.computedAt), desc(scenarios.updatedAt));
}

/** How many review items are open (not closed by a decision), per risk level. */
export function countOpenReviewItemsByRisk(db: Executor) {
  return db
    .select({ risk: reviewItems.risk, count: sql<number>`count(*)::int` })
    .from(reviewItems)
    .where(inArray(reviewItems.state, [...OPEN_REVIEW_STATES]))
    .groupBy(reviewItems.risk);
}

/** How many high and critical review items were closed by an accepted risk, per risk level. */
export function countAcceptedHighRiskItems(db: Executor) {
  return db
    .select({ risk: reviewItems.risk, count: sql<number>`count(*)::int` })
    .from(reviewItems)
    .where(and(eq(reviewItems.state, 'accepted'), inArray(reviewItems.risk, ['high', 'critical'])))
    .groupBy(reviewItems.risk);
}

/** The stretch and key of every review item on these routes, to link a descent to its item. */
export function findReviewStretchesOfRoutes(db: Executor, routeIds: string[]) {
  return db
    .select({
      id: reviewItems.id,
      routeId: reviewItems.routeId,
      vehicleProfileId: reviewItems.vehicleProfileId,
      direction: reviewItems.direction,
      startM: reviewItems.startM,
      endM: reviewItems.endM,
    })
    .from(reviewItems)
    .where(inArray(reviewItems.routeId, routeIds));
}
