import type { LineString, VehicleInput } from '@shared/domain/analysis';
import { synthesiseLoggedTripCsv, type SynthesisOptions } from '@shared/engine/logged-trip-synthesis';
import { presetVehicle } from '@shared/engine/vehicle-presets';

/**
 * A 6 km test road near 46.5° N: 1 km level, 2 km climbing at 6 %, 2 km descending at 7 %, 1 km
 * level, gently winding; positions carry elevations. Invented for the checks.
 */
export function testRoad(): LineString['coordinates'] {
  const coordinates: [number, number, number][] = [];
  let z = 700;
  for (let d = 0; d <= 6_000; d += 100) {
    const grade = d <= 1_000 ? 0 : d <= 3_000 ? 0.06 : d <= 5_000 ? -0.07 : 0;
    if (d > 0) z += grade * 100;
    coordinates.push([round(10.3 + (d * 0.7 + 200 * Math.sin(d / 800)) / 76_500, 7), round(46.5 + (d * 0.7) / 111_000, 7), round(z, 2)]);
  }
  return coordinates;
}

/** The parameters the test trips are made from: a 12 m battery bus that differs from the preset. */
export const TRUE_VEHICLE: VehicleInput = {
  ...presetVehicle('battery-bus-12m'),
  payloadKg: 2_240,
  rollingResistanceCoefficient: 0.0085,
  dragCoefficient: 0.62,
  auxPowerW: 9_000,
  drivetrainEfficiency: 0.84,
  regenEfficiency: 0.78,
  brakeThermalMassJPerK: 80_000,
  brakeCoolingAreaM2: 2.0,
};

/** Speed limits and stops of the test trips: speeds from 30 to 60 km/h, two stops. */
export const TEST_TRIP_OPTIONS = {
  speedLimitKph: [
    { fromM: 0, toM: 1_200, speedKph: 30 },
    { fromM: 1_200, toM: 3_000, speedKph: 45 },
    { fromM: 3_000, toM: 6_200, speedKph: 60 },
  ],
  stops: [
    { atM: 1_500, dwellS: 25 },
    { atM: 4_000, dwellS: 20 },
  ],
};

/** A logged trip CSV of TRUE_VEHICLE on the test road, with logger noise. */
export function aLoggedTripCsv(overrides: Partial<SynthesisOptions> = {}): Promise<string> {
  return synthesiseLoggedTripCsv({
    request: {
      route: { type: 'LineString', coordinates: testRoad() },
      vehicle: TRUE_VEHICLE,
      // A nearly full battery: regeneration is cut back on the descent and the friction brakes heat.
      conditions: { ambientC: 8, startSoc: 0.93 },
      options: TEST_TRIP_OPTIONS,
    },
    sampleRateHz: 1,
    noise: { powerW: 3_000, gpsM: 3, speedMps: 0.05, brakeTempC: 2, elevationM: 3 },
    seed: 7,
    withBrakeTemperature: true,
    withSoc: true,
    withElevation: true,
    ...overrides,
  });
}

function round(value: number, digits: number): number {
  const f = 10 ** digits;
  return Math.round(value * f) / f;
}

/** A vehicle profile draft for the checks: the generic 12 m class, mild season at 8 °C. */
export function aProfileDraft(name = 'Spec mountain bus') {
  return {
    name,
    vehicleClass: 'battery-bus-12m',
    vehicle: { ...presetVehicle('battery-bus-12m'), payloadKg: 0 },
    loadsKg: { empty: 0, seated: 2_240, 'full-standing': 6_000 },
    passengerMassKg: 70,
    seasons: {
      winter: { ambientC: -5, auxPowerW: 20_000 },
      mild: { ambientC: 8, auxPowerW: 6_000 },
      summer: { ambientC: 25, auxPowerW: 14_000 },
    },
  };
}
