import type { Block, ServiceDayResult } from '@shared/domain/service-days';
import { chargingPurposeLabel, formatServiceTime } from '@shared/presentation/index';

/**
 * Commercial speed used to estimate when a trip arrives on the editor's timeline, km/h: stops,
 * dwell and traffic included. Mountain and regional bus services typically run at 15–25 km/h
 * including stops (common practice for timetable planning); the lower end keeps the estimate of
 * the layover short rather than generous. The run itself uses the engine's own running time.
 */
export const PLANNING_SPEED_KPH = 18;

export type TimelineBarKind = 'trip' | 'charge';

export interface TimelineBar {
  kind: TimelineBarKind;
  startS: number;
  endS: number;
  /** What the bar is, in words (tooltip and accessible name). */
  label: string;
  /** For a trip: its index in the block. */
  tripIndex?: number;
}

export interface TimelineRow {
  blockId: string;
  pullOutS: number;
  pullInS: number;
  bars: TimelineBar[];
  /** Stands between one trip's (estimated) arrival and the next departure. */
  layovers: { startS: number; endS: number }[];
  /** From the run, when there is one: whether the block can be worked. */
  feasible: boolean | null;
  /** What does not add up in the block as drawn. */
  warnings: string[];
}

/** Names of the routes and their lengths, by route id. */
export type RouteLookup = (routeId: string) => { name: string; lengthM: number } | undefined;

/** Estimated arrival of a trip: departure plus the route's length at the planning speed. */
export function estimatedArrivalS(departureS: number, lengthM: number): number {
  return departureS + Math.round((lengthM / 1000 / PLANNING_SPEED_KPH) * 3600);
}

/**
 * One timeline row per block: trips as bars from departure to estimated arrival, the gaps
 * between them as layovers, and (after a run) the charging stops as bars of their own.
 */
export function timelineRows(blocks: readonly Block[], routes: RouteLookup, result?: ServiceDayResult | null): TimelineRow[] {
  return blocks.map((block) => {
    const warnings: string[] = [];
    const trips = block.trips.map((trip, index) => {
      const route = routes(trip.routeId);
      const endS = route ? estimatedArrivalS(trip.departureS, route.lengthM) : trip.departureS;
      if (!route) warnings.push(`Trip ${index + 1} uses a route that is not in the route list.`);
      const direction = trip.direction === 'outbound' ? 'outbound' : 'inbound';
      return {
        kind: 'trip' as const,
        startS: trip.departureS,
        endS,
        tripIndex: index,
        label: `Trip ${index + 1}: ${route?.name ?? 'unknown route'} ${direction}, ${formatServiceTime(trip.departureS)}–${formatServiceTime(endS)}`,
      };
    });
    const layovers: TimelineRow['layovers'] = [];
    trips.forEach((trip, index) => {
      const next = trips[index + 1];
      if (!next) return;
      if (next.startS < trip.startS) warnings.push(`Trip ${index + 2} leaves before trip ${index + 1}: put the trips in time order.`);
      else if (next.startS < trip.endS) {
        warnings.push(
          `Trip ${index + 1} arrives about ${formatServiceTime(trip.endS)}, after trip ${index + 2} leaves at ${formatServiceTime(next.startS)}.`,
        );
      } else layovers.push({ startS: trip.endS, endS: next.startS });
    });
    const first = trips[0];
    const last = trips.at(-1);
    if (first && block.pullOutS > first.startS)
      warnings.push(`Pull-out at ${formatServiceTime(block.pullOutS)} is after the first departure.`);
    if (last && block.pullInS < last.endS)
      warnings.push(
        `Pull-in at ${formatServiceTime(block.pullInS)} is before the last trip arrives (about ${formatServiceTime(last.endS)}).`,
      );
    const blockResult = result?.blocks.find((candidate) => candidate.blockId === block.blockId);
    const charges: TimelineBar[] = (blockResult?.chargingEvents ?? []).map((event) => ({
      kind: 'charge',
      startS: event.startS,
      endS: event.endS,
      label: `${chargingPurposeLabel(event.purpose)} at ${event.chargerKey}, ${formatServiceTime(event.startS)}–${formatServiceTime(event.endS)}`,
    }));
    return {
      blockId: block.blockId,
      pullOutS: block.pullOutS,
      pullInS: block.pullInS,
      bars: [...trips, ...charges],
      layovers,
      feasible: blockResult ? blockResult.feasible : null,
      warnings,
    };
  });
}

/** Whole hours covering every row, at least 06:00–22:00 wide enough to read. */
export function timelineSpan(rows: readonly TimelineRow[]): { fromS: number; toS: number } {
  const times = rows.flatMap((row) => [row.pullOutS, row.pullInS, ...row.bars.flatMap((bar) => [bar.startS, bar.endS])]);
  if (times.length === 0) return { fromS: 6 * 3600, toS: 22 * 3600 };
  const fromS = Math.floor(Math.min(...times) / 3600) * 3600;
  const toS = Math.max(fromS + 3600, Math.ceil(Math.max(...times) / 3600) * 3600);
  return { fromS, toS };
}

/** Position of a time on the timeline, percent of its width. */
export function timelinePercent(timeS: number, span: { fromS: number; toS: number }): number {
  return ((timeS - span.fromS) / (span.toS - span.fromS)) * 100;
}
