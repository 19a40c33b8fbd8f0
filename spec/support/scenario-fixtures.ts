/**
 * Builders for review, board and batch specs: routes, vehicle profiles and scenarios inserted
 * straight into the tables, with stored results built by hand so every figure is known.
 */
import type { Descent, Summary } from '@shared/domain/analysis';
import type { DirectionResult } from '@shared/domain/scenarios';
import { presetVehicle } from '@shared/engine/vehicle-presets';
import { ENGINE_VERSION } from '@shared/engine/constants';
import type { Database, Executor } from '../../api/db/client';
import { roadRouteVersions, roadRoutes, scenarios, vehicleProfiles, type ScenarioRow } from '../../api/db/schema/index';

/** An invented line across an invented hillside (positions carry elevation, in metres). */
export const HILL_LINE: [number, number, number][] = [
  [10.0, 46.0, 900],
  [10.01, 46.0, 850],
  [10.02, 46.0, 800],
  [10.03, 46.0, 700],
];

export async function aRoute(
  db: Executor,
  overrides: {
    name?: string;
    tripsPerDay?: number;
    serviceDaysPerYear?: number;
    createdById?: string | null;
    coordinates?: [number, number, number][];
  } = {},
) {
  const [route] = await db
    .insert(roadRoutes)
    .values({ createdById: overrides.createdById ?? null })
    .returning();
  const coordinates = overrides.coordinates ?? HILL_LINE;
  await db.insert(roadRouteVersions).values({
    routeId: route!.id,
    version: 1,
    name: overrides.name ?? 'Pass road 7',
    mode: 'bus',
    geometry: { type: 'LineString', coordinates: coordinates.map(([lon, lat]) => [lon, lat]) },
    coordinates,
    stops: [],
    speedLimits: [],
    defaultSpeedLimitKph: 50,
    tripsPerDay: overrides.tripsPerDay ?? 10,
    serviceDaysPerYear: overrides.serviceDaysPerYear ?? 300,
    lengthM: 2_300,
    createdByName: 'Spec planner',
  });
  return route!;
}

export async function aVehicleProfile(db: Executor, overrides: { name?: string } = {}) {
  const [profile] = await db
    .insert(vehicleProfiles)
    .values({
      name: overrides.name ?? 'Spec 12 m battery bus',
      vehicleClass: 'battery-bus-12m',
      vehicle: presetVehicle('battery-bus-12m', 'seated'),
      loadsKg: { empty: 0, seated: 2_500, 'full-standing': 6_000 },
      passengerMassKg: 70,
      seasons: {
        winter: { ambientC: -5, auxPowerW: 20_000 },
        mild: { ambientC: 12, auxPowerW: 6_000 },
        summer: { ambientC: 28, auxPowerW: 15_000 },
      },
    })
    .returning();
  return profile!;
}

/** A descent record with plausible figures; pass what the test is about. */
export function aDescent(overrides: Partial<Descent> = {}): Descent {
  return {
    startM: 1_000,
    endM: 2_000,
    lengthM: 1_000,
    dropM: 80,
    meanGradePercent: -8,
    maxGradePercent: -10.5,
    gravityEnergyWh: 4_000,
    brakingEnergyWh: 3_200,
    regenEnergyWh: 1_500,
    frictionBrakeEnergyWh: 1_700,
    retarderEnergyWh: 0,
    peakBrakeTempC: 480,
    gsrsPeakBrakeTempC: 240,
    risk: 'high',
    fadeThresholdC: 450,
    maxSafeSpeedKph: 22,
    speedAdvice: 'limit',
    maxTopSoc: 0.62,
    socAtTop: 0.8,
    beyondTypeApprovalReference: false,
    ...overrides,
  };
}

export function aSummary(overrides: Partial<Summary> = {}): Summary {
  return {
    lengthM: 2_300,
    slopeLengthM: 2_302,
    ascentM: 0,
    descentM: 200,
    durationS: 400,
    tractionEnergyWh: 3_000,
    brakingEnergyWh: 5_000,
    regenEnergyWh: 2_000,
    frictionBrakeEnergyWh: 1_000,
    retarderEnergyWh: 0,
    auxEnergyWh: 700,
    batteryNetEnergyWh: 2_300,
    kWhPerKm: 1,
    peakBrakeTempC: 480,
    gsrsPeakBrakeTempC: 240,
    startSoc: 0.8,
    endSoc: 0.79,
    energyShortfallWh: 0,
    tractionLimitedM: 0,
    ...overrides,
  };
}

/** A direction result whose profile runs 0–2 300 m every 100 m along HILL_LINE's longitude. */
export function aDirectionResult(direction: 'outbound' | 'inbound', descents: Descent[], summary: Summary = aSummary()): DirectionResult {
  const distanceM = Array.from({ length: 24 }, (_, index) => index * 100);
  const along = (from: number, to: number) => distanceM.map((d) => from + ((to - from) * d) / 2_300);
  return {
    direction,
    summary,
    profile: {
      distanceM,
      lon: along(10, 10.03),
      lat: distanceM.map(() => 46),
      elevationM: along(900, 700),
      gradePercent: distanceM.map(() => -8),
      speedMps: distanceM.map(() => 8),
      timeS: distanceM.map((d) => d / 8),
      rollingN: distanceM.map(() => 0),
      aeroN: distanceM.map(() => 0),
      gradeN: distanceM.map(() => 0),
      inertiaN: distanceM.map(() => 0),
      tractionN: distanceM.map(() => 0),
      tractionPowerW: distanceM.map(() => 0),
      batteryPowerW: distanceM.map(() => 0),
      regenPowerW: distanceM.map(() => 0),
      frictionBrakePowerW: distanceM.map(() => 0),
      soc: distanceM.map(() => 0.8),
      brakeTempC: along(20, 480),
      gsrsBrakeTempC: along(20, 240),
      airDensityKgM3: distanceM.map(() => 1.1),
    },
    descents,
  };
}

/** A computed scenario row with the given stored result. */
export async function aScenario(
  db: Database,
  values: {
    routeId: string;
    vehicleProfileId: string;
    name?: string;
    direction?: 'outbound' | 'inbound' | 'round-trip';
    inService?: boolean;
    createdById?: string | null;
    computedAt?: Date;
    summary?: Summary;
    directionResults?: DirectionResult[];
  },
): Promise<ScenarioRow> {
  const directionResults = values.directionResults ?? [aDirectionResult('outbound', [aDescent()])];
  const [row] = await db
    .insert(scenarios)
    .values({
      name: values.name ?? 'Winter, full standing',
      routeId: values.routeId,
      routeVersion: 1,
      direction: values.direction ?? 'outbound',
      vehicleProfileId: values.vehicleProfileId,
      load: { kind: 'case', case: 'full-standing' },
      season: { kind: 'season', season: 'winter' },
      startSoc: 0.8,
      options: { spacingM: 10, smoothingWindowM: 150, useStops: true, layoverS: 300 },
      inService: values.inService ?? false,
      status: 'done',
      engineVersion: ENGINE_VERSION,
      computedAt: values.computedAt ?? new Date(),
      summary: values.summary ?? directionResults[0]!.summary,
      directionResults,
      createdById: values.createdById ?? null,
      createdByName: 'Spec planner',
    })
    .returning();
  return row!;
}
