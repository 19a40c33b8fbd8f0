/**
 * The invented Highpass Valley Transit Authority's network on the invented Korvel valley demo
 * region (api/demo/demo-terrain-model.ts): five routes, two vehicle profiles of its own next to the
 * class presets, and saved, computed scenarios across seasons and loads, so every screen shows
 * real results on a fresh start. All names and places are made up.
 *
 * Routes are drawn in the demo grid's local metres (east, north of its south-west corner) and
 * converted to WGS 84 through the grid's UTM zone 32N definition. The pass-road routes follow the
 * pass road's design vertices (designPassRoad); their elevations are the road's design elevations,
 * which the demo terrain is built to match. When the app has a terrain sampler (deps.sampleElevations)
 * their positions are stored without elevation and the terrain supplies it; otherwise they carry the
 * design elevations, so the demo works with or without the terrain. Valley routes always carry
 * their designed profile (see `onPassRoad`).
 *
 * Idempotent: every row has a seed key; what exists is left as it is (a second start leaves one copy).
 */
import { eq } from 'drizzle-orm';
import { roadRouteDraftSchema, type RoadRouteDraftInput } from '@shared/domain/road-routes';
import { scenarioDraftSchema, type ScenarioDraftInput } from '@shared/domain/scenarios';
import { vehicleProfileDraftSchema, type VehicleProfileDraftInput } from '@shared/domain/vehicle-profiles';
import { presetVehicle } from '@shared/engine/vehicle-presets';
import type { AppDeps } from '../app-deps';
import { roadNetworkLines, roadRoutes, scenarios, users, vehicleProfiles } from '../db/schema/index';
import { createRoute } from '../road-routes/road-routes-service';
import { replaceRoadNetwork } from '../road-routes/road-network-service';
import { createScenario } from '../scenarios/scenarios-service';
import { insertProfile } from '../vehicle-profiles/vehicle-profiles-repository';
import { ensureVehiclePresets, presetProfileId, seededUuid } from '../vehicle-profiles/vehicle-presets-seed';
import { lonLat, southFloorM, southValleyNorth } from './demo-geography';
import { designPassRoad } from './demo-terrain-model';

import type { Local } from './demo-geography';
interface Waypoint {
  at: Local;
  elevationM: number;
  /** A stop here, with its name and dwell (s). */
  stop?: { name: string; dwellS?: number };
}

const pass = designPassRoad().vertices;
const P = (index: number) => ({ at: pass[index]!.at, elevationM: pass[index]!.elevationM });

/**
 * `onPassRoad`: the route follows the pass road's design vertices, which the demo terrain is built
 * to match, so its elevations may come from the terrain. The valley routes cut straight across
 * the invented relief between their few vertices; they keep their designed (engineered) profile.
 */
const ROUTES: { key: string; onPassRoad: boolean; draft: Omit<RoadRouteDraftInput, 'geometry' | 'stops'>; waypoints: Waypoint[] }[] = [
  {
    key: 'demo-route:valley-line',
    onPassRoad: false,
    draft: {
      name: '1 Valley line: Westgate – Korvel – Lindmoor',
      description: 'All-day trunk line along the floor of the Korvel valley; gentle grades.',
      mode: 'bus',
      defaultSpeedLimitKph: 50,
      speedLimits: [{ fromM: 1_500, toM: 3_600, speedKph: 30 }],
      tripsPerDay: 40,
      serviceDaysPerYear: 360,
    },
    waypoints: [
      { at: [500, southValleyNorth(500)], elevationM: southFloorM(500), stop: { name: 'Westgate' } },
      { ...P(0), stop: { name: 'Korvel, Town Square', dwellS: 40 } },
      { ...P(1), stop: { name: 'Mill Lane' } },
      { ...P(2), stop: { name: 'Brenn Road' } },
      { at: [8_000, southValleyNorth(8_000)], elevationM: southFloorM(8_000) + 20, stop: { name: 'Lindmoor Halt' } },
      { at: [11_000, southValleyNorth(11_000)], elevationM: southFloorM(11_000) + 20 },
      { at: [14_500, southValleyNorth(14_500)], elevationM: southFloorM(14_500) + 20, stop: { name: 'Lindmoor' } },
    ],
  },
  {
    key: 'demo-route:pass-line',
    onPassRoad: true,
    draft: {
      name: '4 Pass line: Korvel – Korvel Pass – Orren',
      description: 'Over the Korvel pass (1 900 m): four switchback legs of 6–8 % on the south face, 7–8 % down to Orren.',
      mode: 'bus',
      defaultSpeedLimitKph: 60,
      speedLimits: [{ fromM: 0, toM: 1_500, speedKph: 30 }],
      tripsPerDay: 12,
      serviceDaysPerYear: 360,
    },
    waypoints: [
      { ...P(0), stop: { name: 'Korvel, Town Square', dwellS: 40 } },
      P(1),
      { ...P(2), stop: { name: 'Brenn Road' } },
      { ...P(3), stop: { name: 'First Hairpin' } },
      P(4),
      P(5),
      P(6),
      { ...P(7), stop: { name: 'Korvel Pass', dwellS: 60 } },
      { ...P(8), stop: { name: 'Skarnfeld Turn' } },
      P(9),
      { ...P(10), stop: { name: 'Orren, Village Green', dwellS: 40 } },
    ],
  },
  {
    key: 'demo-route:ski-shuttle',
    onPassRoad: true,
    draft: {
      name: 'S Ski shuttle: Korvel Pass (Skarnfeld lifts) – Orren',
      description: 'Winter shuttle from the Skarnfeld lifts at the pass down 700 m to Orren; buses charge at the pass terminus.',
      mode: 'bus',
      defaultSpeedLimitKph: 50,
      tripsPerDay: 16,
      serviceDaysPerYear: 140,
    },
    waypoints: [
      { ...P(7), stop: { name: 'Korvel Pass, Skarnfeld Lifts', dwellS: 60 } },
      { ...P(8), stop: { name: 'Skarnfeld Turn' } },
      P(9),
      { ...P(10), stop: { name: 'Orren, Village Green', dwellS: 40 } },
    ],
  },
  {
    key: 'demo-route:trolleybus-line',
    onPassRoad: true,
    draft: {
      name: 'T2 Trolleybus: Korvel – Upper Brenn',
      description: 'Trolleybus from the town square up the first switchback leg (7.5 %) to Upper Brenn.',
      mode: 'trolleybus',
      defaultSpeedLimitKph: 50,
      speedLimits: [{ fromM: 0, toM: 1_200, speedKph: 30 }],
      tripsPerDay: 30,
      serviceDaysPerYear: 360,
    },
    waypoints: [
      { ...P(0), stop: { name: 'Korvel, Town Square', dwellS: 40 } },
      { ...P(1), stop: { name: 'Mill Lane' } },
      { ...P(2), stop: { name: 'Brenn Road' } },
      { ...P(3), stop: { name: 'Upper Brenn' } },
    ],
  },
  {
    key: 'demo-route:tram-line',
    onPassRoad: false,
    draft: {
      name: 'A Valley tram: Korvel Station – Lindmoor Upper',
      description: 'Tram along the south bank of the valley, ending with a 4 % ramp up to Lindmoor Upper.',
      mode: 'tram',
      defaultSpeedLimitKph: 50,
      tripsPerDay: 48,
      serviceDaysPerYear: 360,
    },
    waypoints: [
      { at: [2_500, southValleyNorth(2_500) - 150], elevationM: southFloorM(2_500) + 2, stop: { name: 'Korvel Station', dwellS: 30 } },
      { at: [6_000, southValleyNorth(6_000) - 150], elevationM: southFloorM(6_000) + 2, stop: { name: 'Riverside' } },
      { at: [10_000, southValleyNorth(10_000) - 150], elevationM: southFloorM(10_000) + 2, stop: { name: 'Lindmoor Bridge' } },
      { at: [13_500, southValleyNorth(13_500) - 150], elevationM: southFloorM(13_500) + 2, stop: { name: 'Lindmoor Market' } },
      {
        at: [13_900, southValleyNorth(13_900) + 1_150],
        elevationM: southFloorM(13_500) + 2 + 0.04 * 1_362,
        stop: { name: 'Lindmoor Upper' },
      },
    ],
  },
];

/** The authority's own vehicle profiles (typical values from memory, like the presets they start from). */
const OWN_PROFILES: { key: string; draft: VehicleProfileDraftInput }[] = [
  {
    key: 'demo-vehicle:mountain-bus-12m',
    draft: {
      name: 'Highpass 12 m mountain bus (2025 order)',
      description: 'The authority’s 12 m battery bus with the larger 450 kWh pack and 200 kW regeneration ordered for the pass routes.',
      vehicleClass: 'battery-bus-12m',
      vehicle: {
        ...presetVehicle('battery-bus-12m'),
        curbMassKg: 14_100,
        batteryCapacityWh: 450_000,
        maxChargePowerW: 225_000,
        regenPowerW: 200_000,
        regenContinuousPowerW: 140_000,
      },
      // 19.5 t permissible (two-axle bus) − 14.1 t curb leaves 5.4 t: 77 passengers at 70 kg.
      loadsKg: { empty: 0, seated: 32 * 70, 'full-standing': 77 * 70 },
      passengerMassKg: 70,
      // Korvel valley seasons (invented; from memory for an alpine valley at 700–1 900 m).
      seasons: {
        winter: { ambientC: -8, auxPowerW: 24_000 },
        mild: { ambientC: 8, auxPowerW: 6_000 },
        summer: { ambientC: 24, auxPowerW: 13_000 },
      },
      // Service days model its cabin: a CO₂ heat pump ordered for the pass, which keeps heating
      // down to −20 °C (CO₂ bus heat pumps are published as working down to −20 °C, engine README
      // source 22), with a 24 kW heat output (from memory: the larger units sold for 12 m buses).
      // The body, ventilation and base load are the 12 m bus defaults (DEFAULT_CLIMATE).
      climate: { heatPumpHeatW: 24_000, heatPumpMinAmbientC: -20 },
    },
  },
  {
    key: 'demo-vehicle:standard-bus-12m',
    draft: {
      name: 'Highpass 12 m standard bus (2019 order)',
      description:
        'The authority’s first battery buses: the 12 m class with the standard 350 kWh pack, heated by resistive heaters only (no heat pump).',
      vehicleClass: 'battery-bus-12m',
      vehicle: presetVehicle('battery-bus-12m'),
      loadsKg: { empty: 0, seated: 30 * 70, 'full-standing': 85 * 70 },
      passengerMassKg: 70,
      seasons: {
        winter: { ambientC: -8, auxPowerW: 22_000 },
        mild: { ambientC: 8, auxPowerW: 6_000 },
        summer: { ambientC: 24, auxPowerW: 14_000 },
      },
      // Resistive heating only (heat pump output 0), the usual fit of the first battery buses
      // (common practice); heated to 20 °C rather than 18 °C (the authority's older comfort
      // setting, invented). Everything else: the 12 m bus defaults.
      climate: { heatPumpHeatW: 0, heatingSetpointC: 20 },
    },
  },
  {
    key: 'demo-vehicle:midibus-resistor',
    draft: {
      name: 'Highpass midibus with braking resistor',
      description: 'Battery midibus retrofitted with a 90 kW braking resistor for the Skarnfeld shuttle.',
      vehicleClass: 'battery-midibus',
      vehicle: { ...presetVehicle('battery-midibus'), retarderPowerW: 90_000, retarderType: 'braking-resistor' },
      loadsKg: { empty: 0, seated: 22 * 70, 'full-standing': 52 * 70 },
      passengerMassKg: 70,
      seasons: {
        winter: { ambientC: -8, auxPowerW: 13_000 },
        mild: { ambientC: 8, auxPowerW: 3_500 },
        summer: { ambientC: 24, auxPowerW: 8_000 },
      },
      // A smaller body than the 12 m bus: heat loss, fresh air and base load scaled by about the
      // ratio of cabin size (from memory: a midibus of 8–9 m against a 12 m bus), a 12 kW heat
      // pump with the default curve.
      climate: {
        bodyUaWPerK: 240,
        freshAirM3PerH: 500,
        doorAirExchangeM3: 4,
        baseLoadW: 2_000,
        heatPumpHeatW: 12_000,
        cabinHeatCapacityJPerK: 550_000,
      },
    },
  },
];

type ScenarioSeed = { key: string; route: string; vehicle: string; draft: Omit<ScenarioDraftInput, 'routeId' | 'vehicleProfileId'> };
const SCENARIOS: ScenarioSeed[] = [
  {
    key: 'demo-scenario:valley-mild-seated',
    route: 'demo-route:valley-line',
    vehicle: 'preset:battery-bus-12m',
    draft: {
      name: 'Valley line, 12 m bus, seated, mild day',
      direction: 'round-trip',
      load: { kind: 'case', case: 'seated' },
      season: { kind: 'season', season: 'mild' },
      startSoc: 0.8,
      inService: true,
    },
  },
  {
    key: 'demo-scenario:valley-winter-full',
    route: 'demo-route:valley-line',
    vehicle: 'demo-vehicle:mountain-bus-12m',
    draft: {
      name: 'Valley line, mountain bus, full, winter',
      direction: 'round-trip',
      load: { kind: 'case', case: 'full-standing' },
      season: { kind: 'season', season: 'winter' },
      startSoc: 0.9,
    },
  },
  {
    key: 'demo-scenario:pass-winter-full',
    route: 'demo-route:pass-line',
    vehicle: 'demo-vehicle:mountain-bus-12m',
    draft: {
      name: 'Pass line, mountain bus, full, winter',
      direction: 'round-trip',
      load: { kind: 'case', case: 'full-standing' },
      season: { kind: 'season', season: 'winter' },
      startSoc: 0.9,
      inService: true,
    },
  },
  {
    key: 'demo-scenario:pass-summer-seated-articulated',
    route: 'demo-route:pass-line',
    vehicle: 'preset:battery-bus-18m-articulated',
    draft: {
      name: 'Pass line, 18 m articulated, seated, summer',
      direction: 'round-trip',
      load: { kind: 'case', case: 'seated' },
      season: { kind: 'season', season: 'summer' },
      startSoc: 0.8,
    },
  },
  {
    key: 'demo-scenario:ski-full-battery',
    route: 'demo-route:ski-shuttle',
    vehicle: 'preset:battery-midibus',
    draft: {
      name: 'Ski shuttle downhill, charged to 97 % at the pass, full, winter',
      direction: 'outbound',
      load: { kind: 'case', case: 'full-standing' },
      season: { kind: 'season', season: 'winter' },
      startSoc: 0.97,
      inService: true,
    },
  },
  {
    key: 'demo-scenario:ski-resistor-capped',
    route: 'demo-route:ski-shuttle',
    vehicle: 'demo-vehicle:midibus-resistor',
    draft: {
      name: 'Ski shuttle downhill with braking resistor and a 30 km/h descent cap',
      direction: 'outbound',
      load: { kind: 'case', case: 'full-standing' },
      season: { kind: 'season', season: 'winter' },
      startSoc: 0.97,
      options: { descentSpeedCapKph: 30 },
    },
  },
  {
    key: 'demo-scenario:trolleybus-winter-full',
    route: 'demo-route:trolleybus-line',
    vehicle: 'preset:trolleybus-12m',
    draft: {
      name: 'Trolleybus T2, full, winter',
      direction: 'round-trip',
      load: { kind: 'case', case: 'full-standing' },
      season: { kind: 'season', season: 'winter' },
      startSoc: 0.8,
      inService: true,
    },
  },
  {
    key: 'demo-scenario:tram-mild-seated',
    route: 'demo-route:tram-line',
    vehicle: 'preset:light-rail-vehicle',
    draft: {
      name: 'Valley tram, seated, mild day',
      direction: 'round-trip',
      load: { kind: 'case', case: 'seated' },
      season: { kind: 'season', season: 'mild' },
      startSoc: 0.8,
      inService: true,
    },
  },
];

/**
 * A demo route's designed line with elevations, its stops (distance along the line, dwell) and
 * its speed limits, for the invented logged trips (scripts/make-demo-logged-trips.ts).
 */
export function demoRouteDesign(key: string) {
  const route = ROUTES.find((candidate) => candidate.key === key);
  if (!route) throw new Error(`No demo route ${key}`);
  return {
    coordinates: route.waypoints.map((point) => [...lonLat(point.at), round(point.elevationM, 1)] as [number, number, number]),
    stopsAtWaypoints: route.waypoints.map((point) => (point.stop ? (point.stop.dwellS ?? 20) : null)),
    stopNames: route.waypoints.map((point) => point.stop?.name ?? null),
    name: route.draft.name,
    speedLimits: route.draft.speedLimits ?? [],
    defaultSpeedLimitKph: route.draft.defaultSpeedLimitKph ?? 50,
  };
}

/** The draft of one of the authority's own demo profiles. */
export function demoProfileDraft(key: string): VehicleProfileDraftInput {
  const profile = OWN_PROFILES.find((candidate) => candidate.key === key);
  if (!profile) throw new Error(`No demo vehicle profile ${key}`);
  return profile.draft;
}

/** Id of a demo profile (seeded with a fixed id). */
export function demoProfileId(key: string): string {
  return seededUuid(key);
}

/** Loads the demo network; needs the demo people (the planner and analyst are the authors). */
export async function seedDemoNetwork(deps: AppDeps): Promise<void> {
  const { db } = deps;
  await ensureVehiclePresets(db);
  const planner = await personWithRole(deps, 'planner');
  const analyst = await personWithRole(deps, 'analyst');

  const routeIds = new Map<string, string>();
  for (const route of ROUTES) {
    const withElevation = !deps.sampleElevations || !route.onPassRoad;
    const coordinates = route.waypoints.map((point) =>
      withElevation ? [...lonLat(point.at), round(point.elevationM, 1)] : lonLat(point.at),
    ) as [number, number][] | [number, number, number][];
    const [existing] = await db.select({ id: roadRoutes.id }).from(roadRoutes).where(eq(roadRoutes.seedKey, route.key));
    if (existing) {
      routeIds.set(route.key, existing.id);
      continue;
    }
    const stops = route.waypoints
      .filter((point) => point.stop)
      .map((point) => {
        const [lon, lat] = lonLat(point.at);
        return { name: point.stop!.name, lon, lat, dwellS: point.stop!.dwellS ?? 20 };
      });
    const draft = roadRouteDraftSchema.parse({ ...route.draft, geometry: { type: 'LineString', coordinates }, stops });
    const saved = await createRoute(db, planner, draft, route.key);
    routeIds.set(route.key, saved.id);
  }

  const profileIds = new Map<string, string>();
  for (const profile of OWN_PROFILES) {
    const id = seededUuid(profile.key);
    const [existing] = await db.select({ id: vehicleProfiles.id }).from(vehicleProfiles).where(eq(vehicleProfiles.seedKey, profile.key));
    if (!existing) await insertProfile(db, vehicleProfileDraftSchema.parse(profile.draft), analyst, profile.key, id);
    profileIds.set(profile.key, existing?.id ?? id);
  }

  for (const scenario of SCENARIOS) {
    const [existing] = await db.select({ id: scenarios.id }).from(scenarios).where(eq(scenarios.seedKey, scenario.key));
    if (existing) continue;
    const vehicleProfileId = scenario.vehicle.startsWith('preset:')
      ? presetProfileId(scenario.vehicle.slice('preset:'.length))
      : profileIds.get(scenario.vehicle)!;
    const draft = scenarioDraftSchema.parse({ ...scenario.draft, routeId: routeIds.get(scenario.route)!, vehicleProfileId });
    await createScenario(deps, scenario.vehicle.startsWith('demo-vehicle') ? analyst : planner, draft, scenario.key);
  }

  // The reference road network: a bypass the authority is studying, which the imported extract
  // does not have; its ends join the valley road, so routes may be snapped along it.
  const [anyLine] = await db.select({ id: roadNetworkLines.id }).from(roadNetworkLines).limit(1);
  if (!anyLine) {
    await replaceRoadNetwork(deps, analyst.id, [
      {
        featureIndex: 0,
        partIndex: 0,
        properties: { name: 'Korvel south bypass (planned)', status: 'planned' },
        coordinates: KORVEL_BYPASS.map(lonLat),
      },
    ]);
  }
}

/** The planned bypass south of Korvel town, from Westgate to Mill Lane's end of Brenn Road. */
const KORVEL_BYPASS: Local[] = [
  [500, southValleyNorth(500)],
  [1_500, southValleyNorth(1_500) - 230],
  [3_000, southValleyNorth(3_000) - 240],
  [3_800, southValleyNorth(3_800) - 60],
  [4_000, 3_120],
];

async function personWithRole(deps: AppDeps, role: 'planner' | 'analyst') {
  const [person] = await deps.db
    .select({ id: users.id, name: users.name })
    .from(users)
    .where(eq(users.role, role))
    .orderBy(users.createdAt)
    .limit(1);
  return person ?? { id: null, name: 'Highpass Valley Transit Authority (demo)' };
}

function round(value: number, digits: number): number {
  const factor = 10 ** digits;
  return Math.round(value * factor) / factor;
}
