import { describe, expect, it } from 'vitest';
import type { VehicleInput } from '@shared/domain/analysis';
import { fitCalibration, type CalibrationTrip, type FitParameter } from '@shared/engine/calibration-fit';
import { alignTrip, matchTrackToLine, prepareTrack } from '@shared/engine/trip-alignment';
import { presetVehicle } from '@shared/engine/vehicle-presets';
import { parseLoggedTripCsv } from '../../../api/logged-trips/logged-trip-csv';
import { alignedTrip, replayTrip, startBrakeTempC } from '../../../api/logged-trips/trip-replay';
import { aLoggedTripCsv, TEST_TRIP_OPTIONS, testRoad, TRUE_VEHICLE } from '../../support/logged-trip-fixtures';

const ALL: FitParameter[] = [
  'rollingResistanceCoefficient',
  'dragAreaM2',
  'auxPowerW',
  'drivetrainEfficiency',
  'regenEfficiency',
  'brakeThermalMassJPerK',
  'brakeCoolingAreaM2',
];
const TRUTH: Record<string, number> = {
  rollingResistanceCoefficient: TRUE_VEHICLE.rollingResistanceCoefficient,
  dragAreaM2: TRUE_VEHICLE.dragCoefficient * TRUE_VEHICLE.frontalAreaM2,
  auxPowerW: TRUE_VEHICLE.auxPowerW,
  drivetrainEfficiency: TRUE_VEHICLE.drivetrainEfficiency,
  regenEfficiency: TRUE_VEHICLE.regenEfficiency,
  brakeThermalMassJPerK: TRUE_VEHICLE.brakeThermalMassJPerK!,
  brakeCoolingAreaM2: TRUE_VEHICLE.brakeCoolingAreaM2!,
};
/** The profile the fit starts from: the generic 12 m class, which differs from the truth in every fitted parameter. */
const START: VehicleInput = { ...presetVehicle('battery-bus-12m'), payloadKg: TRUE_VEHICLE.payloadKg };

describe('fitCalibration', () => {
  it('recovers the parameters two synthetic trips were made from, each within its stated 95 % interval', async () => {
    const trips = [await aTrip(7, 0.6), await aTrip(107, 0.93)];

    const outcome = await fitCalibration({ trips, parameters: ALL });

    const fitted = [...outcome.parameters, ...(outcome.brake?.parameters ?? [])];
    expect(fitted.map((p) => p.key).sort()).toEqual([...ALL].sort());
    for (const parameter of fitted) {
      expect(parameter.low, parameter.key).not.toBeNull();
      expect(TRUTH[parameter.key], parameter.key).toBeGreaterThanOrEqual(parameter.low!);
      expect(TRUTH[parameter.key], parameter.key).toBeLessThanOrEqual(parameter.high!);
    }
    // The start was off by about a tenth in energy; the fit closes most of the gap.
    expect(Math.abs(outcome.before.energyErrorPercent)).toBeGreaterThan(5);
    expect(Math.abs(outcome.after.energyErrorPercent)).toBeLessThan(2);
    expect(outcome.after.rmsErrorW).toBeLessThan(outcome.before.rmsErrorW);
    expect(outcome.warnings).toEqual([]);
  });

  it('keeps the truth inside the 95 % intervals about as often as promised over several noise draws', async () => {
    let inside = 0;
    let total = 0;
    for (const seed of [11, 23, 31]) {
      const outcome = await fitCalibration({ trips: [await aTrip(seed, 0.6), await aTrip(seed + 100, 0.93)], parameters: ALL });
      for (const p of [...outcome.parameters, ...(outcome.brake?.parameters ?? [])]) {
        total++;
        if (TRUTH[p.key]! >= p.low! && TRUTH[p.key]! <= p.high!) inside++;
      }
    }

    // 21 intervals at 95 %: at least 18 should hold the truth (a binomial 5 % tail is below 17).
    expect(total).toBe(21);
    expect(inside).toBeGreaterThanOrEqual(18);
  });

  it('warns that rolling resistance and drag cannot be told apart when a trip runs at one speed on the level', async () => {
    const level = testRoad().map(([lon, lat]) => [lon, lat, 700] as [number, number, number]);
    const csv = await aLoggedTripCsv({
      request: {
        route: { type: 'LineString', coordinates: level },
        vehicle: TRUE_VEHICLE,
        conditions: { ambientC: 8, startSoc: 0.6 },
        options: { speedLimitKph: 50 },
      },
      withBrakeTemperature: false,
    });
    const trip = await tripFromCsv(csv, level, 'level');

    const outcome = await fitCalibration({ trips: [trip], parameters: ['rollingResistanceCoefficient', 'dragAreaM2', 'auxPowerW'] });

    const warning = outcome.warnings.find((w) => w.code === 'indistinguishable' || w.code === 'ill_conditioned');
    expect(warning?.parameters).toEqual(expect.arrayContaining(['rollingResistanceCoefficient', 'dragAreaM2']));
    expect(warning?.message).toMatch(/cannot|barely|no unique/);
  });

  it('gives the road load as F = A + B·v + C·v² (SAE J1263/J2263 form) with A = Cr·m·g and C = ½·ρ·Cd·A at the 40 CFR 1066.310 reference density', async () => {
    const outcome = await fitCalibration({ trips: [await aTrip(7, 0.6)], parameters: ['rollingResistanceCoefficient', 'dragAreaM2'] });

    const cr = outcome.parameters.find((p) => p.key === 'rollingResistanceCoefficient')!.fitted;
    const cda = outcome.parameters.find((p) => p.key === 'dragAreaM2')!.fitted;
    const massKg = TRUE_VEHICLE.curbMassKg + TRUE_VEHICLE.payloadKg;
    expect(outcome.roadLoad.massKg).toBeCloseTo(massKg, 6);
    expect(outcome.roadLoad.aN).toBeCloseTo(cr * massKg * 9.80665, 6);
    expect(outcome.roadLoad.bNPerMps).toBe(0);
    // 40 CFR 1066.310: reference air density 1.17 kg/m³, B = 0, C = D_adj.
    expect(outcome.roadLoad.cNPerMps2).toBeCloseTo(0.5 * 1.17 * cda, 9);
  });
});

// Helpers

async function aTrip(seed: number, startSoc: number): Promise<CalibrationTrip> {
  const csv = await aLoggedTripCsv({
    seed,
    request: {
      route: { type: 'LineString', coordinates: testRoad() },
      vehicle: TRUE_VEHICLE,
      conditions: { ambientC: 8, startSoc },
      options: TEST_TRIP_OPTIONS,
    },
  });
  return tripFromCsv(csv, testRoad(), `seed ${seed}`);
}

async function tripFromCsv(csv: string, road: number[][], name: string): Promise<CalibrationTrip> {
  const parsed = await parseLoggedTripCsv(Buffer.from(csv), `${name}.csv`, 100_000);
  const track = prepareTrack(parsed.samples);
  const aligned = alignTrip(parsed.samples, track, road, matchTrackToLine(track, road));
  const alignment = { ...aligned, elevationM: aligned.lineElevationM! };
  const detail = await replayTrip({ alignment, ambientC: 8, startSoc: aligned.soc?.[0] ?? 0.8 }, START);
  return {
    id: name,
    name,
    model: detail.model,
    speedMps: detail.run.speedMps,
    startSoc: detail.conditions.startSoc,
    initialBrakeTempC: startBrakeTempC(alignment) ?? 8,
    trip: alignedTrip(alignment),
    payloadKnown: true,
  };
}
