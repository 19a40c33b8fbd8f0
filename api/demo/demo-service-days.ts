import { and, eq } from 'drizzle-orm';
import { serviceDayDraftSchema, type BlockTrip, type ServiceDayDraftInput } from '@shared/domain/service-days';
import type { AppDeps } from '../app-deps';
import { roadRoutes, roadRouteVersions, serviceDays, users } from '../db/schema/index';
import { createServiceDay, requestRun, waitForInlineServiceDayRuns } from '../service-days/service-days-service';
import { presetProfileId } from '../vehicle-profiles/vehicle-presets-seed';
import { demoProfileId } from './demo-network';

/**
 * The invented Highpass Valley authority's service days: a weekday and a Sunday for winter and
 * for summer (in service, so the board's annual figures come from them), and a winter weekday
 * checked at the end of the batteries' life (not in service: a planning check). Blocks of several
 * round trips on the Valley line and the Pass line; a depot charger at Westgate, where the Valley
 * line starts, and a terminus charger at Lindmoor, where it ends. Every vehicle models its cabin
 * climate, so winter days draw the heating the cold and the open doors call for. Block P2 (the
 * 2019 standard bus: a 350 kWh pack and resistive heating only, working two Pass-line round trips
 * with no charger on that line) falls below the reserve in winter at end of life, while P1 (the
 * 2025 mountain bus: 450 kWh and a CO₂ heat pump) holds on the same line. Each day is run once
 * when it is first loaded.
 */
const H = 3600;
const M = 60;

type Route = 'valley' | 'pass';
const trips = (routeId: string, firstDepartureS: number, roundTrips: number, headwayS: number, load: BlockTrip['load']): BlockTrip[] =>
  Array.from({ length: roundTrips * 2 }, (_, i) => ({
    routeId,
    direction: i % 2 === 0 ? ('outbound' as const) : ('inbound' as const),
    departureS: firstDepartureS + i * headwayS,
    load,
  }));

export interface DemoBlock {
  blockId: string;
  vehicle: string;
  route: Route;
  pullOutS: number;
  roundTrips: number;
  headwayS: number;
  startSoc: number;
}

export const WEEKDAY_BLOCKS: DemoBlock[] = [
  {
    blockId: 'V1',
    vehicle: 'demo-vehicle:mountain-bus-12m',
    route: 'valley',
    pullOutS: 5 * H + 30 * M,
    roundTrips: 4,
    headwayS: 75 * M,
    startSoc: 0.95,
  },
  {
    blockId: 'V2',
    vehicle: 'demo-vehicle:standard-bus-12m',
    route: 'valley',
    pullOutS: 6 * H + 15 * M,
    roundTrips: 4,
    headwayS: 75 * M,
    startSoc: 0.95,
  },
  {
    blockId: 'V3',
    vehicle: 'demo-vehicle:standard-bus-12m',
    route: 'valley',
    pullOutS: 14 * H,
    roundTrips: 3,
    headwayS: 75 * M,
    startSoc: 0.9,
  },
  {
    blockId: 'P1',
    vehicle: 'demo-vehicle:mountain-bus-12m',
    route: 'pass',
    pullOutS: 6 * H,
    roundTrips: 2,
    headwayS: 60 * M,
    startSoc: 0.95,
  },
  {
    blockId: 'P2',
    vehicle: 'demo-vehicle:standard-bus-12m',
    route: 'pass',
    pullOutS: 11 * H,
    roundTrips: 2,
    headwayS: 60 * M,
    startSoc: 0.95,
  },
];
export const SUNDAY_BLOCKS: DemoBlock[] = [
  {
    blockId: 'V1',
    vehicle: 'demo-vehicle:mountain-bus-12m',
    route: 'valley',
    pullOutS: 7 * H + 30 * M,
    roundTrips: 4,
    headwayS: 90 * M,
    startSoc: 0.95,
  },
  {
    blockId: 'P1',
    vehicle: 'demo-vehicle:mountain-bus-12m',
    route: 'pass',
    pullOutS: 8 * H,
    roundTrips: 2,
    headwayS: 60 * M,
    startSoc: 0.95,
  },
];

const DAYS: {
  key: string;
  name: string;
  dayType: ServiceDayDraftInput['dayType'];
  season: 'winter' | 'summer';
  batteryAge: ServiceDayDraftInput['batteryAge'];
  inService: boolean;
  blocks: DemoBlock[];
}[] = [
  {
    key: 'demo-service-day:weekday-winter',
    name: 'Weekday, winter',
    dayType: 'weekday',
    season: 'winter',
    batteryAge: 'beginning-of-life',
    inService: true,
    blocks: WEEKDAY_BLOCKS,
  },
  {
    key: 'demo-service-day:weekday-summer',
    name: 'Weekday, summer',
    dayType: 'weekday',
    season: 'summer',
    batteryAge: 'beginning-of-life',
    inService: true,
    blocks: WEEKDAY_BLOCKS,
  },
  {
    key: 'demo-service-day:sunday-winter',
    name: 'Sunday and holiday, winter',
    dayType: 'sunday-holiday',
    season: 'winter',
    batteryAge: 'beginning-of-life',
    inService: true,
    blocks: SUNDAY_BLOCKS,
  },
  {
    key: 'demo-service-day:sunday-summer',
    name: 'Sunday and holiday, summer',
    dayType: 'sunday-holiday',
    season: 'summer',
    batteryAge: 'beginning-of-life',
    inService: true,
    blocks: SUNDAY_BLOCKS,
  },
  {
    key: 'demo-service-day:weekday-winter-end-of-life',
    name: 'Weekday, winter, batteries at end of life (check)',
    dayType: 'weekday',
    season: 'winter',
    batteryAge: 'end-of-life',
    inService: false,
    blocks: WEEKDAY_BLOCKS,
  },
];

/** Loads the demo service days (once) and runs each new one; needs the demo network. */
export async function seedDemoServiceDays(deps: AppDeps): Promise<void> {
  const { db } = deps;
  const routeIds = { valley: await routeId(deps, 'demo-route:valley-line'), pass: await routeId(deps, 'demo-route:pass-line') };
  if (!routeIds.valley || !routeIds.pass) return;
  const valleyLine = await firstAndLast(deps, routeIds.valley);
  const [analyst] = await db.select({ id: users.id, name: users.name }).from(users).where(eq(users.email, 'analyst@descentry.example'));
  const author = analyst ?? { id: null, name: 'Highpass Valley Transit Authority (demo)' };
  const created: string[] = [];
  for (const day of DAYS) {
    const [existing] = await db.select({ id: serviceDays.id }).from(serviceDays).where(eq(serviceDays.seedKey, day.key));
    if (existing) continue;
    const draft = serviceDayDraftSchema.parse({
      name: day.name,
      dayType: day.dayType,
      season: day.season,
      batteryAge: day.batteryAge,
      reserveSoc: 0.15,
      inService: day.inService,
      chargers: [
        {
          key: 'westgate-depot',
          name: 'Westgate depot',
          kind: 'depot',
          position: valleyLine.first,
          powerW: 150_000,
          efficiency: 0.93,
          targetSoc: 0.95,
        },
        {
          key: 'lindmoor-terminus',
          name: 'Lindmoor terminus',
          kind: 'terminus',
          position: valleyLine.last,
          powerW: 300_000,
          efficiency: 0.92,
          targetSoc: 0.9,
          connectS: 45,
        },
      ],
      blocks: day.blocks.map((block) => ({
        blockId: block.blockId,
        vehicleProfileId: block.vehicle.startsWith('preset:')
          ? presetProfileId(block.vehicle.slice('preset:'.length))
          : demoProfileId(block.vehicle),
        depotChargerKey: 'westgate-depot',
        pullOutS: block.pullOutS,
        pullInS: block.pullOutS + (block.roundTrips * 2 + 1) * block.headwayS,
        startSoc: block.startSoc,
        trips: trips(routeIds[block.route]!, block.pullOutS + 15 * M, block.roundTrips, block.headwayS, {
          kind: 'case',
          case: day.dayType === 'weekday' ? 'seated' : 'full-standing',
        }),
      })),
    });
    created.push((await createServiceDay(db, author, draft, day.key)).id);
  }
  for (const id of created) await requestRun(deps, id);
  await waitForInlineServiceDayRuns(deps);
}

async function routeId(deps: AppDeps, seedKey: string): Promise<string | undefined> {
  const [row] = await deps.db.select({ id: roadRoutes.id }).from(roadRoutes).where(eq(roadRoutes.seedKey, seedKey));
  return row?.id;
}

async function firstAndLast(deps: AppDeps, id: string): Promise<{ first: [number, number]; last: [number, number] }> {
  const [row] = await deps.db
    .select({ coordinates: roadRouteVersions.coordinates })
    .from(roadRouteVersions)
    .innerJoin(roadRoutes, and(eq(roadRoutes.id, roadRouteVersions.routeId), eq(roadRoutes.currentVersion, roadRouteVersions.version)))
    .where(eq(roadRoutes.id, id));
  const coordinates = row!.coordinates;
  const at = (position: number[]) => [position[0]!, position[1]!] as [number, number];
  return { first: at(coordinates[0]!), last: at(coordinates.at(-1)!) };
}
