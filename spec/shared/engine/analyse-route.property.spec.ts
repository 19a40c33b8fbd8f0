import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import { analyseRouteDetailed } from '../../../shared/engine/index';
import { geodesicDirect } from '../../../shared/engine/geodesy';
import type { PreviewRequestInput } from '../../../shared/domain/analysis';

/** Random winding routes with random terrain, random vehicles, loads, SOC and options. */
const requests: fc.Arbitrary<PreviewRequestInput> = fc
  .record({
    legs: fc.array(
      fc.record({ lengthM: fc.double({ min: 20, max: 1_500, noNaN: true }), turnDeg: fc.double({ min: -120, max: 120, noNaN: true }), rise: fc.double({ min: -0.14, max: 0.14, noNaN: true }) }),
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
          expect(v).toBeLessThanOrEqual(request.options!.speedLimitKph as number / 3.6 + 1e-9);
        });
      }),
      { numRuns: 60, seed: 20_261_202 },
    );
  });
});
