import { describe, expect, it } from 'vitest';
import type { PreviewRequestInput } from '../../../shared/domain/analysis';
import {
  analyseRoute,
  combineDirections,
  EngineInputError,
  layoverBrakeTempC,
  legRequest,
  MissingElevationError,
  RouteTooLargeError,
  runRoundTrip,
  STEFAN_BOLTZMANN_W_PER_M2_K4,
  UncoveredTerrainError,
  type TripPlan,
} from '../../../shared/engine/index';
import { aStraightRoute, aWorkedExampleBus } from '../support/engine-builders';

const LENGTH_M = 3_000;

/** A 6 % descent of 3 km with one stop and one speed-limit stretch, as a scenario would plan it. */
function aDescentPlan(overrides: Partial<TripPlan> = {}): TripPlan {
  return {
    line: {
      coordinates: aStraightRoute(LENGTH_M, (s) => 1_400 - 0.06 * s),
      stops: [{ atM: 1_000, dwellS: 30, name: 'Upper Fold' }],
      speedLimits: [{ fromM: 2_000, toM: 2_600, speedKph: 30 }],
      defaultSpeedLimitKph: 50,
      lengthM: LENGTH_M,
    },
    direction: 'round-trip',
    vehicle: aWorkedExampleBus(),
    ambientC: 10,
    startSoc: 0.6,
    layoverS: 600,
    spacingM: 10,
    smoothingWindowM: 0,
    useStops: true,
    ...overrides,
  };
}

/**
 * The lumped brake's standstill cooling, C·dT/dt = −h·A·(T − T_amb) − ε·σ·A·(T⁴ − T_amb⁴),
 * integrated with explicit Euler steps of 1 ms: an independent numerical solution of the equation
 * in the engine README §4.3 (h = 12 W/(m²·K) at standstill).
 */
function coolByEuler(startC: number, ambientC: number, durationS: number, c = 92_000, area = 1.6, emissivity = 0.6): number {
  const ambientK = ambientC + 273.15;
  let temperatureK = startC + 273.15;
  const stepS = 0.001;
  for (let t = 0; t < durationS; t += stepS) {
    const lossW =
      12 * area * (temperatureK - ambientK) + emissivity * STEFAN_BOLTZMANN_W_PER_M2_K4 * area * (temperatureK ** 4 - ambientK ** 4);
    temperatureK -= (stepS * lossW) / c;
  }
  return temperatureK - 273.15;
}

describe('layoverBrakeTempC', () => {
  it('cools brakes at 300 °C to 239.4 °C in a 10 min layover at 10 °C (Euler integration of the same equation, ±0.3 K)', () => {
    const engine = layoverBrakeTempC(aWorkedExampleBus(), 300, 10, 600);

    expect(coolByEuler(300, 10, 600)).toBeCloseTo(239.37, 1);
    expect(Math.abs(engine - coolByEuler(300, 10, 600))).toBeLessThan(0.3);
  });

  it("uses the vehicle's own brake mass, area and emissivity", () => {
    const heavy = layoverBrakeTempC(
      aWorkedExampleBus({ brakeThermalMassJPerK: 184_000, brakeCoolingAreaM2: 1.6, brakeEmissivity: 0.6 }),
      300,
      10,
      600,
    );

    expect(Math.abs(heavy - coolByEuler(300, 10, 600, 184_000))).toBeLessThan(0.3);
    expect(heavy).toBeGreaterThan(layoverBrakeTempC(aWorkedExampleBus(), 300, 10, 600) + 20);
  });

  it('leaves brakes at ambient where they are and changes nothing over no time', () => {
    expect(layoverBrakeTempC(aWorkedExampleBus(), 10, 10, 600)).toBeCloseTo(10, 9);
    expect(layoverBrakeTempC(aWorkedExampleBus(), 250, 10, 0)).toBeCloseTo(250, 9);
  });
});

describe('runRoundTrip', () => {
  it('runs outbound, cools the brakes over the layover, and starts inbound with the SOC and brake temperature left', async () => {
    const plan = aDescentPlan();
    const outcome = await runRoundTrip(plan, (request) => analyseRoute(request));
    if (!outcome.ok) throw outcome.error;
    const [outbound, inbound] = outcome.directions;

    expect(outcome.directions.map((leg) => leg.direction)).toEqual(['outbound', 'inbound']);
    const inboundConditions = outcome.inputs.directions[1]!.request.conditions!;
    expect(inboundConditions.startSoc).toBe(outbound!.summary.endSoc);
    expect(inbound!.summary.startSoc).toBeCloseTo(outbound!.summary.endSoc, 12);
    const arrivalC = outbound!.profile.brakeTempC.at(-1)!;
    expect(arrivalC).toBeGreaterThan(plan.ambientC + 5);
    expect(outcome.inputs.layover).toEqual({
      durationS: 600,
      brakeTempBeforeC: arrivalC,
      brakeTempAfterC: layoverBrakeTempC(plan.vehicle, arrivalC, 10, 600),
      ambientC: 10,
    });
    expect(inboundConditions.initialBrakeTempC).toBe(outcome.inputs.layover!.brakeTempAfterC);
    expect(Math.abs(inboundConditions.initialBrakeTempC! - coolByEuler(arrivalC, 10, 600))).toBeLessThan(0.3);
    expect(inbound!.profile.brakeTempC[0]).toBeCloseTo(inboundConditions.initialBrakeTempC!, 9);
  });

  it('combines both legs into the trip totals, the outbound descending and the inbound climbing', async () => {
    const outcome = await runRoundTrip(aDescentPlan(), (request) => analyseRoute(request));
    if (!outcome.ok) throw outcome.error;
    const [outbound, inbound] = outcome.directions;

    expect(outcome.summary).toEqual(combineDirections(outbound!.summary, inbound!.summary));
    expect(outbound!.profile.elevationM[0]!).toBeGreaterThan(outbound!.profile.elevationM.at(-1)! + 170);
    expect(inbound!.profile.elevationM[0]!).toBeCloseTo(outbound!.profile.elevationM.at(-1)!, 6);
    expect(outbound!.summary.regenEnergyWh).toBeGreaterThan(inbound!.summary.regenEnergyWh);
  });

  it('reverses the line for the inbound leg: positions backwards, stops and stretches mirrored', () => {
    const plan = aDescentPlan();
    const inbound = legRequest(plan, 'inbound', 0.5, 40);
    const outbound = legRequest(plan, 'outbound', 0.6);

    expect(inbound.route.coordinates).toEqual([...plan.line.coordinates].reverse());
    expect(inbound.options!.stops).toEqual([{ atM: 2_000, dwellS: 30, name: 'Upper Fold' }]);
    expect(inbound.options!.speedLimitKph).toEqual([
      { fromM: 0, toM: 400, speedKph: 50 },
      { fromM: 400, toM: 1_000, speedKph: 30 },
      { fromM: 1_000, toM: 3_000, speedKph: 50 },
    ]);
    expect(inbound.conditions).toEqual({ ambientC: 10, startSoc: 0.5, initialBrakeTempC: 40 });
    expect(outbound.options!.stops).toEqual([{ atM: 1_000, dwellS: 30, name: 'Upper Fold' }]);
    expect(outbound.conditions).toEqual({ ambientC: 10, startSoc: 0.6 });
  });

  it('serves no stops when the plan says so, and runs one direction alone without a layover', async () => {
    const requests: PreviewRequestInput[] = [];
    const outcome = await runRoundTrip(aDescentPlan({ direction: 'inbound', useStops: false }), (request) => {
      requests.push(request);
      return analyseRoute(request);
    });
    if (!outcome.ok) throw outcome.error;

    expect(requests).toHaveLength(1);
    expect(requests[0]!.options!.stops).toEqual([]);
    expect(requests[0]!.conditions).toEqual({ ambientC: 10, startSoc: 0.6 });
    expect(outcome.inputs.layover).toBeUndefined();
    expect(outcome.summary).toEqual(outcome.directions[0]!.summary);
  });

  it('ends with the leg an engine refusal stopped at, keeping the inputs it ran on', async () => {
    let calls = 0;
    const outcome = await runRoundTrip(aDescentPlan(), (request) => {
      calls++;
      if (calls === 2) throw new UncoveredTerrainError([{ fromM: 100, toM: 900 }], [{ fromM: 100, toM: 900 }], 100);
      return analyseRoute(request);
    });

    expect(outcome.ok).toBe(false);
    if (outcome.ok) return;
    expect(outcome.direction).toBe('inbound');
    expect(outcome.legCount).toBe(2);
    expect(outcome.error).toBeInstanceOf(UncoveredTerrainError);
    expect(outcome.error.code).toBe('terrain_not_covered');
    expect(outcome.inputs.directions.map((leg) => leg.direction)).toEqual(['outbound', 'inbound']);
    expect(outcome.inputs.layover).toBeDefined();
  });

  it('lets any other failure through as a fault', async () => {
    await expect(
      runRoundTrip(aDescentPlan(), () => {
        throw new Error('the analysis thread stopped');
      }),
    ).rejects.toThrow('the analysis thread stopped');
    const refused = await runRoundTrip(aDescentPlan(), () => {
      throw new EngineInputError('vehicle.curbMassKg', 'must be > 0, got 0');
    });
    expect(refused.ok).toBe(false);
  });
});

describe('engine refusal codes', () => {
  it('tells a route without elevations and without a source apart by class and code, not by message', async () => {
    const flat = aStraightRoute(1_000, () => 0).map(([lon, lat]) => [lon, lat] as [number, number]);
    const refusal = analyseRoute({
      route: { type: 'LineString', coordinates: flat },
      vehicle: aWorkedExampleBus(),
      conditions: { startSoc: 0.5 },
    });

    await expect(refusal).rejects.toBeInstanceOf(MissingElevationError);
    await expect(refusal).rejects.toMatchObject({ code: 'elevation_missing', field: 'route.coordinates' });
  });

  it('gives every refusal class its own code, the plain input error "invalid_input"', () => {
    expect(new EngineInputError('vehicle.curbMassKg', 'must be > 0').code).toBe('invalid_input');
    expect(new UncoveredTerrainError([], [], 100).code).toBe('terrain_not_covered');
    expect(new RouteTooLargeError(500_000, 60_000, 10, 400_000, 50_000).code).toBe('route_too_large');
    expect(new MissingElevationError().code).toBe('elevation_missing');
  });
});
