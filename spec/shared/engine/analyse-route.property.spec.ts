import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyseRouteDetailed } from '../../../shared/engine/index';
import { geodesicDirect } from '../../../shared/engine/geodesy';
import type { PreviewRequestInput } from '../../../shared/domain/analysis';

/** Random winding routes with random terrain, random vehicles, loads, SOC and options. */
const requests: fc.Arbitrary<PreviewRequestInput> = fc
  .record({
    legs: fc.array(
      fc.record({
        lengthM: fc.double({ min: 20, max: 1_500, noNaN: true }),
        turnDeg: fc.double({ min: -120, max: 120, noNaN: true }),
        rise: fc.double({ min: -0.14, max: 0.14, noNaN: true }),
      }),
      { minLength: 1, maxLength: 8 },
    ),
    lat0: fc.double({ min: -70, max: 70, noNaN: true }),
    curbMassKg: fc.double({ min: 7_000, max: 45_000, noNaN: true }),
    payloadKg: fc.double({ min: 0, max: 12_000, noNaN: true }),
    regenPowerW: fc.oneof(fc.constant(0), fc.double({ min: 10_000, max: 400_000, noNaN: true })),
    retarderPowerW: fc.oneof(fc.constant(0), fc.double({ min: 10_000, max: 300_000, noNaN: true })),
    batteryCapacityWh: fc.double({ min: 20_000, max: 600_000, noNaN: true }),
    powerSource: fc.constantFrom('battery' as const, 'overhead-line' as const),
    brakeType: fc.constantFrom('disc' as const, 'drum' as const),
    efficiency: fc.double({ min: 0.6, max: 1, noNaN: true }),
    startSoc: fc.double({ min: 0, max: 1, noNaN: true }),
    ambientC: fc.double({ min: -25, max: 40, noNaN: true }),
    speedLimitKph: fc.double({ min: 10, max: 90, noNaN: true }),
    capKph: fc.option(fc.double({ min: 8, max: 40, noNaN: true }), { nil: undefined }),
    spacingM: fc.double({ min: 5, max: 40, noNaN: true }),
    stopFraction: fc.option(fc.double({ min: 0, max: 1, noNaN: true }), { nil: undefined }),
  })
  .map((r) => {
    const coordinates: [number, number, number][] = [[8, r.lat0, 1_200]];
    let azimuth = 0;
    let z = 1_200;
    let totalM = 0;
    const out: [number, number] = [0, 0];
    for (const leg of r.legs) {
      const [lon, lat] = coordinates[coordinates.length - 1]!;
      azimuth += (leg.turnDeg * Math.PI) / 180;
      geodesicDirect(lon, lat, azimuth, leg.lengthM, out);
      z = Math.min(3_500, Math.max(0, z + leg.rise * leg.lengthM));
      coordinates.push([out[0], out[1], z]);
      totalM += leg.lengthM;
    }
    return {
      route: { type: 'LineString' as const, coordinates },
      vehicle: {
        curbMassKg: r.curbMassKg,
        payloadKg: r.payloadKg,
        frontalAreaM2: 8,
        dragCoefficient: 0.7,
        rollingResistanceCoefficient: 0.007,
        rotatingMassFactor: 0.04,
        tractionPowerW: 250_000,
        regenPowerW: r.regenPowerW,
        drivetrainEfficiency: r.efficiency,
        regenEfficiency: r.efficiency,
        batteryCapacityWh: r.batteryCapacityWh,
        maxChargePowerW: r.batteryCapacityWh * 0.5,
        auxPowerW: 10_000,
        retarderPowerW: r.retarderPowerW,
        powerSource: r.powerSource,
        brakeType: r.brakeType,
      },
      conditions: { startSoc: r.startSoc, ambientC: r.ambientC },
      options: {
        spacingM: r.spacingM,
        speedLimitKph: r.speedLimitKph,
        descentSpeedCapKph: r.capKph,
        descentMinLengthM: 200,
        stops: r.stopFraction === undefined ? [] : [{ atM: r.stopFraction * totalM * 0.999, dwellS: 20 }],
      },
    };
  });

/**
 * The same random vehicles, conditions and options on a route that surely descends: a flat
 * approach, then 0.6–6 km at 3.5–12 %, then a flat run-out.
 */
const descentRequests: fc.Arbitrary<PreviewRequestInput> = fc
  .tuple(requests, fc.double({ min: 0.035, max: 0.12, noNaN: true }), fc.double({ min: 600, max: 6_000, noNaN: true }))
  .map(([request, grade, lengthM]) => ({
    ...request,
    route: {
      type: 'LineString' as const,
      coordinates: [
        [8, 46, 1_800],
        [8, 46.002, 1_800],
        ...Array.from({ length: 11 }, (_, i) => {
          const s = (i + 1) / 11;
          return [8, 46.002 + (s * lengthM) / 111_200, 1_800 - grade * s * lengthM] as [number, number, number];
        }),
        [8, 46.004 + lengthM / 111_200, 1_800 - grade * lengthM],
      ],
    },
    options: { ...request.options, stops: [] },
  }));

describe('analyseRoute over random routes and vehicles (property-based)', () => {
  it('never yields NaN, keeps SOC in [0, 1], brakes at or above ambient, friction ≥ 0 and speed within every limit', async () => {
    await fc.assert(
      fc.asyncProperty(requests, async (request) => {
        const { response, model } = await analyseRouteDetailed(request);
        const ambientC = request.conditions!.ambientC!;

        for (const [name, values] of Object.entries(response.profile)) {
          for (const value of values) expect(Number.isFinite(value), name).toBe(true);
        }
        for (const [name, value] of Object.entries(response.summary)) expect(Number.isFinite(value), name).toBe(true);
        for (const descent of response.descents) {
          for (const value of Object.values(descent)) if (typeof value === 'number') expect(Number.isFinite(value)).toBe(true);
        }
        response.profile.soc.forEach((soc) => {
          expect(soc).toBeGreaterThanOrEqual(0);
          expect(soc).toBeLessThanOrEqual(1);
        });
        response.profile.brakeTempC.forEach((t) => expect(t).toBeGreaterThanOrEqual(ambientC - 1e-6));
        response.profile.gsrsBrakeTempC.forEach((t) => expect(t).toBeGreaterThanOrEqual(ambientC - 1e-6));
        response.profile.frictionBrakePowerW.forEach((p) => expect(p).toBeGreaterThanOrEqual(0));
        expect(response.summary.frictionBrakeEnergyWh).toBeGreaterThanOrEqual(0);
        response.profile.speedMps.forEach((v, i) => {
          expect(v).toBeLessThanOrEqual(model.limitMps[i]! + 1e-9);
          expect(v).toBeLessThanOrEqual((request.options!.speedLimitKph as number) / 3.6 + 1e-9);
        });
      }),
      { numRuns: 60, seed: 20_261_202 },
    );
  });

  it('never reports a worst case cooler than the nominal run, the worst-case run itself included', async () => {
    let descents = 0;
    await fc.assert(
      fc.asyncProperty(descentRequests, async (request) => {
        const { response } = await analyseRouteDetailed(request);

        descents += response.descents.length;
        for (const descent of response.descents) {
          const nominal = Math.max(descent.peakBrakeTempC, descent.peakBrakeTempByAxleC!.front, descent.peakBrakeTempByAxleC!.rear);
          const worst = descent.worstCase!;
          expect(worst.peakBrakeTempC).toBeGreaterThanOrEqual(nominal - 1e-6);
          // The worst-case run's own brake groups (before any floor at the nominal peak).
          expect(worst.peakBrakeTempByAxleC!.front).toBeGreaterThanOrEqual(descent.peakBrakeTempByAxleC!.front - 1e-6);
          expect(worst.peakBrakeTempByAxleC!.rear).toBeGreaterThanOrEqual(descent.peakBrakeTempByAxleC!.rear - 1e-6);
          expect(RISK_ORDER.indexOf(descent.risk)).toBeGreaterThanOrEqual(RISK_ORDER.indexOf(descent.nominalRisk!));
        }
      }),
      { numRuns: 40, seed: 20_261_203 },
    );
    expect(descents).toBeGreaterThan(20);
  });

  it('never raises the speed or SOC advice when the margin below fade grows', async () => {
    let limits = 0;
    const margins = fc.tuple(fc.double({ min: 0, max: 150, noNaN: true }), fc.double({ min: 0, max: 150, noNaN: true }));
    await fc.assert(
      fc.asyncProperty(descentRequests, margins, async (request, [a, b]) => {
        const [small, large] = a <= b ? [a, b] : [b, a];
        const withMargin = (fadeMarginK: number) =>
          analyseRouteDetailed({ ...request, options: { ...request.options, safety: { fadeMarginK } } });
        const [loose, tight] = await Promise.all([withMargin(small), withMargin(large)]);

        loose.response.descents.forEach((descent, i) => {
          const other = tight.response.descents[i]!;
          if (descent.speedAdvice === 'limit' || descent.maxTopSoc !== null) limits++;
          expect(speedRank(other)).toBeLessThanOrEqual(speedRank(descent));
          expect(speedRank(other.worstCase!)).toBeLessThanOrEqual(speedRank(descent.worstCase!));
          expect(socRank(other)).toBeLessThanOrEqual(socRank(descent));
        });
      }),
      { numRuns: 25, seed: 20_261_204 },
    );
    expect(limits).toBeGreaterThan(5);
  });
});

const RISK_ORDER = ['low', 'elevated', 'high', 'critical'];

/** Speed advice as a number: no limit needed is any speed, not holdable none. */
function speedRank(advice: { speedAdvice: string; maxSafeSpeedKph: number | null }): number {
  if (advice.speedAdvice === 'no-limit-needed') return Number.POSITIVE_INFINITY;
  if (advice.speedAdvice === 'limit') return advice.maxSafeSpeedKph!;
  return 0;
}

/** SOC advice as a number: no SOC keeps the brakes cool is none; SOC playing no part stays apart. */
function socRank(descent: { maxTopSoc: number | null; maxTopSocReason?: string | null }): number {
  if (descent.maxTopSoc !== null) return descent.maxTopSoc;
  return descent.maxTopSocReason === 'no-soc-keeps-brakes-cool' ? -1 : Number.NEGATIVE_INFINITY;
}
