import { describe, expect, it } from 'vitest';
import { previewResponseSchema, type PreviewRequestInput } from '../../../shared/domain/analysis';
import {
  analyseRoute,
  analyseRouteDetailed,
  ENGINEERING_CAUTION,
  replayDescent,
  STANDARD_GRAVITY_MPS2,
  stateAt,
  UncoveredTerrainError,
  type DetailedAnalysis,
} from '../../../shared/engine/index';
import { aStraightRoute, aWorkedExampleBus, relativeError } from '../support/engine-builders';

describe('analyseRoute', () => {
  describe('the full-battery descent of engine README §3.4 / §8 case 16', () => {
    // 800 m drop over 12 km of road at 30 km/h; horizontal length √(12 000² − 800²).
    const horizontalM = Math.sqrt(12_000 ** 2 - 800 ** 2);
    const request: PreviewRequestInput = {
      route: { type: 'LineString', coordinates: aStraightRoute(horizontalM, (s) => 1_300 - (800 * s) / horizontalM) },
      vehicle: aWorkedExampleBus({ regenEfficiency: 0.889 * 0.97, batteryCapacityWh: 350_000, maxChargePowerW: 1_000_000 }),
      conditions: { startSoc: 0.5 },
      options: { speedLimitKph: 30, startAtRest: false, endAtRest: false, smoothingWindowM: 0 },
    };

    it('brakes 36.27 kWh at the wheel (±0.3 %: ρ follows the ISA with altitude here, 1.225 in the hand calculation)', async () => {
      const { summary } = await analyseRoute(request);

      expect(summary.slopeLengthM).toBeCloseTo(12_000, 3);
      expect(relativeError(summary.brakingEnergyWh, 36_270)).toBeLessThan(3e-3);
    });

    it('raises SOC by stored/capacity with the auxiliaries fed from regeneration first', async () => {
      const { summary } = await analyseRoute(request);

      const storedWh = summary.regenEnergyWh - summary.auxEnergyWh;
      expect(summary.endSoc - summary.startSoc).toBeCloseTo(storedWh / 350_000, 9);
      // the engine README gives 25.46 kWh / 7.27 %, taking the auxiliaries off before the cells' 3 % loss;
      // the engine nets them at the battery terminals (η 0.862 wheel → battery), 0.7 % lower.
      expect(relativeError(storedWh, 25_460)).toBeLessThan(0.01);
      expect(relativeError(summary.endSoc - summary.startSoc, 0.0727)).toBeLessThan(0.01);
    });
  });

  it('puts m·g·Δh into regeneration, friction, rolling and drag on a constant-speed descent (within 0.5 %)', async () => {
    const detailed = await analyseRouteDetailed({
      route: { type: 'LineString', coordinates: aStraightRoute(5_000, (s) => 1_200 - 0.07 * s) },
      vehicle: aWorkedExampleBus({ regenPowerW: 60_000 }),
      conditions: { startSoc: 0.5, ambientC: 10 },
      options: { speedLimitKph: 30, startAtRest: false, endAtRest: false },
    });
    const { model, run, response } = detailed;

    const rollingWh = sumOverSegments(detailed, run.rollingN);
    const aeroWh = sumOverSegments(detailed, run.aeroN);
    const regenWheelWh = response.summary.regenEnergyWh / 0.889;
    const dropM = model.elevationM[0]! - model.elevationM[model.pointCount - 1]!;
    const gravityWh = (model.massKg * STANDARD_GRAVITY_MPS2 * dropM) / 3_600;

    expect(response.summary.frictionBrakeEnergyWh).toBeGreaterThan(0);
    expect(relativeError(regenWheelWh + response.summary.frictionBrakeEnergyWh + rollingWh + aeroWh, gravityWh)).toBeLessThan(5e-3);
  });

  it('does no net gradient work on a closed loop that returns to its start elevation', async () => {
    const detailed = await analyseRouteDetailed({
      route: { type: 'LineString', coordinates: aLoop() },
      vehicle: aWorkedExampleBus(),
      conditions: { ambientC: 15 },
      options: { stops: [{ atM: 1_500, dwellS: 20 }] },
    });

    const gradeWh = sumOverSegments(detailed, detailed.run.gradeN);
    const gravityScaleWh = (detailed.model.massKg * STANDARD_GRAVITY_MPS2 * 150) / 3_600;

    expect(Math.abs(gradeWh)).toBeLessThan(1e-6 * gravityScaleWh);
  });

  it('closes the battery energy balance: SOC_start·E − (traction/η + aux − regen) + shortfall = SOC_end·E (0.1 %)', async () => {
    const detailed = await analyseRouteDetailed(aMountainRequest());
    const { summary } = detailed.response;
    const capacityWh = 400_000;
    let tractionElectricWh = 0;
    detailed.run.segmentTractionElectricJ.forEach((j) => (tractionElectricWh += j / 3_600));

    const netWh = tractionElectricWh + summary.auxEnergyWh - summary.regenEnergyWh;

    expect(relativeError(summary.batteryNetEnergyWh, netWh)).toBeLessThan(1e-3);
    expect(Math.abs(summary.startSoc * capacityWh - netWh + summary.energyShortfallWh - summary.endSoc * capacityWh)).toBeLessThan(
      1e-3 * Math.abs(netWh) + 1e-6,
    );
  });

  it('takes 1.979 MJ of kinetic energy out stopping from 50 km/h with δ 1.08 (engine README §8 case 15)', async () => {
    const detailed = await analyseRouteDetailed({
      route: { type: 'LineString', coordinates: aStraightRoute(400, () => 600) },
      vehicle: aWorkedExampleBus({ rotatingMassFactor: 0.08 }),
      conditions: { ambientC: 15 },
      options: { spacingM: 1, speedLimitKph: 50 },
    });
    let brakingInertiaJ = 0;
    for (let k = 0; k < detailed.model.pointCount - 1; k++) {
      const workJ = detailed.run.inertiaN[k]! * detailed.model.slopeLengthM[k]!;
      if (workJ < 0) brakingInertiaJ -= workJ;
    }

    expect(Math.max(...detailed.run.speedMps)).toBeCloseTo(50 / 3.6, 9);
    expect(relativeError(brakingInertiaJ, 1.979e6)).toBeLessThan(1e-3);
  });

  it('returns a response that satisfies the API contract, with the engineering caution', async () => {
    const response = await analyseRoute(aMountainRequest());

    expect(() => previewResponseSchema.parse(response)).not.toThrow();
    expect(response.caution).toBe(ENGINEERING_CAUTION);
    const lengths = Object.values(response.profile).map((values) => values.length);
    expect(new Set(lengths).size).toBe(1);
  });

  it('reports a long steep descent with negative grades and a risk from the disc fade bands', async () => {
    const response = await analyseRoute(aMountainRequest());

    const descent = response.descents[0]!;
    expect(response.descents).toHaveLength(1);
    expect(descent.meanGradePercent).toBeLessThan(-5);
    expect(descent.maxGradePercent).toBeLessThanOrEqual(descent.meanGradePercent);
    expect(descent.dropM).toBeGreaterThan(500);
    expect(['high', 'critical']).toContain(descent.risk);
    expect(descent.beyondTypeApprovalReference).toBe(true);
  });

  describe('advice', () => {
    it('finds a maxSafeSpeedKph in whole km/h whose peak stays 50 K under the fade threshold and 1 km/h more does not', async () => {
      const detailed = await analyseRouteDetailed(aMountainRequest());
      const descent = detailed.response.descents[0]!;
      const range = rangeOf(detailed, descent.startM, descent.endM);
      const top = range.firstSegment;
      const start = stateAt(detailed.run, top);
      // The advice keeps the hotter brake group at or below 450 °C (disc fade) − 50 K = 400 °C.
      const limitC = descent.fadeThresholdC - descent.fadeMarginK!;
      const peakAt = (kph: number) =>
        replayDescent(detailed.model, detailed.run, range, kph / 3.6, start.soc, start.brakeTempC, { start }).peakGoverningC;

      expect(limitC).toBe(400);
      expect(descent.speedAdvice).toBe('limit');
      expect(Number.isInteger(descent.maxSafeSpeedKph)).toBe(true);
      expect(peakAt(descent.maxSafeSpeedKph!)).toBeLessThanOrEqual(limitC);
      expect(peakAt(descent.maxSafeSpeedKph! + 1)).toBeGreaterThan(limitC);
    });

    it('finds a maxTopSoc in whole percent whose peak stays 50 K under fade with regeneration working, and 1 point more does not', async () => {
      const detailed = await analyseRouteDetailed(aMountainRequest({ regenPowerW: 300_000 }));
      const descent = detailed.response.descents[0]!;
      const range = rangeOf(detailed, descent.startM, descent.endM);
      const start = stateAt(detailed.run, range.firstSegment);
      const limitC = descent.fadeThresholdC - descent.fadeMarginK!;
      const peakAt = (soc: number) =>
        replayDescent(detailed.model, detailed.run, range, null, soc, start.brakeTempC, { start }).peakGoverningC;

      expect(descent.maxTopSoc).not.toBeNull();
      expect(descent.maxTopSocReason).toBeNull();
      expect(Math.round(descent.maxTopSoc! * 100)).toBeCloseTo(descent.maxTopSoc! * 100, 9);
      expect(descent.maxTopSoc!).toBeGreaterThan(0.5);
      expect(peakAt(descent.maxTopSoc!)).toBeLessThanOrEqual(limitC);
      expect(peakAt(descent.maxTopSoc! + 0.01)).toBeGreaterThan(limitC);
    });

    it('says no limit is needed when the brakes never approach fade', async () => {
      const response = await analyseRoute(aMountainRequest({ startSoc: 0.3, regenPowerW: 300_000 }));

      expect(response.descents[0]!.speedAdvice).toBe('no-limit-needed');
      expect(response.descents[0]!.maxSafeSpeedKph).toBeNull();
    });

    it('says the descent is not holdable when even walking pace overheats drum brakes without regen', async () => {
      const request = aMountainRequest();
      request.vehicle = aWorkedExampleBus({ regenPowerW: 0, brakeType: 'drum', brakeThermalMassJPerK: 20_000, brakeCoolingAreaM2: 0.3 });

      const response = await analyseRoute(request);

      expect(response.descents[0]!.speedAdvice).toBe('not-holdable');
      expect(response.descents[0]!.maxTopSoc).toBeNull();
    });
  });

  describe('elevation from a terrain source', () => {
    const flatCoordinates = aStraightRoute(2_000, () => 0).map(([lon, lat]) => [lon, lat] as [number, number]);

    it('asks the source once for every resampled point when positions carry no z', async () => {
      let calls = 0;
      const response = await analyseRoute(
        { route: { type: 'LineString', coordinates: flatCoordinates }, vehicle: aWorkedExampleBus() },
        {
          sampleElevations: async (points) => {
            calls++;
            return points.map((_, i) => 500 + i);
          },
        },
      );

      expect(calls).toBe(1);
      expect(response.profile.elevationM[0]).toBe(500);
      expect(response.uncoveredStretches).toEqual([]);
    });

    it('fills a short gap linearly and reports it', async () => {
      const response = await analyseRoute(
        { route: { type: 'LineString', coordinates: flatCoordinates }, vehicle: aWorkedExampleBus(), options: { smoothingWindowM: 0 } },
        { sampleElevations: async (points) => points.map((_, i) => (i >= 50 && i <= 53 ? null : 700)) },
      );

      expect(response.uncoveredStretches).toEqual([{ fromM: expect.closeTo(500, 6), toM: expect.closeTo(530, 6), filled: true }]);
      expect(response.profile.elevationM[51]).toBeCloseTo(700, 9);
    });

    it('refuses a long gap with an error naming the stretch', async () => {
      const analysis = analyseRoute(
        { route: { type: 'LineString', coordinates: flatCoordinates }, vehicle: aWorkedExampleBus() },
        { sampleElevations: async (points) => points.map((_, i) => (i >= 20 && i <= 80 ? null : 700)) },
      );

      await expect(analysis).rejects.toThrow(UncoveredTerrainError);
      await expect(analysis).rejects.toThrow(/200–800 m/);
    });

    it('refuses a gap at the end of the route', async () => {
      const analysis = analyseRoute(
        { route: { type: 'LineString', coordinates: flatCoordinates }, vehicle: aWorkedExampleBus() },
        { sampleElevations: async (points) => points.map((_, i) => (i === points.length - 1 ? null : 700)) },
      );

      await expect(analysis).rejects.toThrow(/route\.coordinates/);
    });

    it('throws naming route.coordinates when there is neither z nor a source', async () => {
      await expect(
        analyseRoute({ route: { type: 'LineString', coordinates: flatCoordinates }, vehicle: aWorkedExampleBus() }),
      ).rejects.toThrow(/route\.coordinates/);
    });
  });

  describe('invalid input', () => {
    it.each([
      ['vehicle.curbMassKg', (r: PreviewRequestInput) => (r.vehicle = { ...aWorkedExampleBus(), curbMassKg: -1 })],
      ['vehicle.payloadKg', (r: PreviewRequestInput) => (r.vehicle = { ...aWorkedExampleBus(), payloadKg: Number.NaN })],
      ['vehicle.regenEfficiency', (r: PreviewRequestInput) => (r.vehicle = { ...aWorkedExampleBus(), regenEfficiency: 1.1 })],
      ['vehicle.drivetrainEfficiency', (r: PreviewRequestInput) => (r.vehicle = { ...aWorkedExampleBus(), drivetrainEfficiency: 0 })],
      ['vehicle.socTaperStart', (r: PreviewRequestInput) => (r.vehicle = { ...aWorkedExampleBus(), socTaperStart: 0.97 })],
      ['vehicle.batteryCapacityWh', (r: PreviewRequestInput) => (r.vehicle = { ...aWorkedExampleBus(), batteryCapacityWh: 0 })],
      ['conditions.startSoc', (r: PreviewRequestInput) => (r.conditions = { startSoc: 1.2 })],
      ['options.spacingM', (r: PreviewRequestInput) => (r.options = { spacingM: 0 })],
      ['options.stops.0.atM', (r: PreviewRequestInput) => (r.options = { stops: [{ atM: 99_000 }] })],
      ['options.speedLimitKph', (r: PreviewRequestInput) => (r.options = { speedLimitKph: -5 })],
      [
        'route.coordinates',
        (r: PreviewRequestInput) =>
          (r.route = {
            type: 'LineString',
            coordinates: [
              [8, 46, 1],
              [8, 46, 1],
            ],
          }),
      ],
      ['route.coordinates', (r: PreviewRequestInput) => (r.route = { type: 'LineString', coordinates: [[8, 46, 1]] })],
    ])('throws a RangeError naming %s', async (field, spoil) => {
      const request = aMountainRequest();
      spoil(request);

      const analysis = analyseRoute(request);

      await expect(analysis).rejects.toThrow(RangeError);
      await expect(analysis).rejects.toMatchObject({ field: expect.stringContaining(field) });
    });
  });
});

// Helpers

/**
 * 3 km climb at 2 %, then 8 km of 7 % descent with a stop halfway, then 1 km flat; 19 t bus at
 * 50 km/h, 20 °C, by default with only 40 kW of regeneration (so the friction brakes work hard).
 */
function aMountainRequest(setup: { startSoc?: number; regenPowerW?: number } = {}): PreviewRequestInput {
  const profile = (s: number) => (s <= 3_000 ? 1_000 + 0.02 * s : s <= 11_000 ? 1_060 - 0.07 * (s - 3_000) : 500);
  return {
    route: { type: 'LineString', coordinates: aStraightRoute(12_000, profile, { vertexSpacingM: 100 }) },
    vehicle: aWorkedExampleBus({ regenPowerW: setup.regenPowerW ?? 40_000 }),
    conditions: { ambientC: 20, startSoc: setup.startSoc ?? 0.9 },
    options: { speedLimitKph: 50, stops: [{ atM: 6_000, dwellS: 30 }] },
  };
}

/** A closed loop of four 1 km legs, up 150 m on the first two and down on the others. */
function aLoop(): [number, number, number][] {
  const east = aStraightRoute(1_000, (s) => 800 + 0.075 * s, { azimuthDeg: 90, vertexSpacingM: 100 });
  const [lonE, latE] = east[east.length - 1]!;
  const north = aStraightRoute(1_000, (s) => 875 + 0.075 * s, { lon0: lonE, lat0: latE, azimuthDeg: 0, vertexSpacingM: 100 });
  const [lonN, latN] = north[north.length - 1]!;
  const west = aStraightRoute(1_000, (s) => 950 - 0.075 * s, { lon0: lonN, lat0: latN, azimuthDeg: 270, vertexSpacingM: 100 });
  const [lonW] = west[west.length - 1]!;
  const start = east[0]!;
  const back = aStraightRoute(1_000, (s) => 875 - 0.075 * s, {
    lon0: lonW,
    lat0: west[west.length - 1]![1],
    azimuthDeg: 180,
    vertexSpacingM: 100,
  });
  back[back.length - 1] = start;
  return [...east, ...north.slice(1), ...west.slice(1), ...back.slice(1)];
}

function sumOverSegments(detailed: DetailedAnalysis, forceN: Float64Array): number {
  let joules = 0;
  for (let k = 0; k < detailed.model.pointCount - 1; k++) joules += forceN[k]! * detailed.model.slopeLengthM[k]!;
  return joules / 3_600;
}

function rangeOf(detailed: DetailedAnalysis, startM: number, endM: number) {
  const d = detailed.model.distanceM;
  const firstSegment = d.indexOf(startM);
  const lastSegment = d.indexOf(endM) - 1;
  return { firstSegment, lastSegment };
}
