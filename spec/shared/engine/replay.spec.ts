import { describe, expect, it } from 'vitest';
import { analyseRouteDetailed } from '@shared/engine/analyse-route';
import { geodesicDirect } from '@shared/engine/geodesy';
import { presetVehicle } from '@shared/engine/vehicle-presets';
import { testRoad, TEST_TRIP_OPTIONS } from '../../support/logged-trip-fixtures';

const bus = { ...presetVehicle('battery-bus-12m'), payloadKg: 2_000 };

describe('analyseRouteDetailed with a speed trace (replay)', () => {
  it('reproduces a planned run when given that run’s own speeds and stops', async () => {
    const request = {
      route: { type: 'LineString' as const, coordinates: testRoad() },
      vehicle: bus,
      conditions: { ambientC: 10, startSoc: 0.7 },
      options: TEST_TRIP_OPTIONS,
    };
    const planned = await analyseRouteDetailed(request);

    const replayed = await analyseRouteDetailed(
      request,
      {},
      { distanceM: Array.from(planned.model.distanceM), speedMps: Array.from(planned.run.speedMps) },
    );

    expect(replayed.run.speedMps).toEqual(planned.run.speedMps);
    expect(replayed.response.summary.batteryNetEnergyWh).toBeCloseTo(planned.response.summary.batteryNetEnergyWh, 6);
    expect(replayed.response.summary.frictionBrakeEnergyWh).toBeCloseTo(planned.response.summary.frictionBrakeEnergyWh, 6);
  });

  it('follows the trace, not the speed limits: a replay faster than the posted limit draws more power', async () => {
    const request = {
      route: { type: 'LineString' as const, coordinates: testRoad() },
      vehicle: bus,
      conditions: { ambientC: 10, startSoc: 0.7 },
      options: { speedLimitKph: 30 },
    };
    const planned = await analyseRouteDetailed(request);

    const fast = await analyseRouteDetailed(request, {}, { distanceM: [0, 100, 5_900, 6_200], speedMps: [0, 15, 15, 0] });

    expect(Math.max(...fast.run.speedMps)).toBeCloseTo(15, 6);
    expect(Math.max(...planned.run.speedMps)).toBeLessThanOrEqual(30 / 3.6 + 1e-9);
    expect(fast.response.summary.batteryNetEnergyWh).toBeGreaterThan(planned.response.summary.batteryNetEnergyWh);
  });

  it('needs no traction along a free coast-down: the road load F = A + C·v² of 40 CFR 1066.310 (B = 0) decelerates the vehicle exactly', async () => {
    // Level, straight road at sea level, ISA 15 °C. The coast-down equation Mₑ·dv/dt = −(A + C·v²)
    // has the closed form v(t) = √(A/C)·tan(φ₀ − k·t), s(t) = (Mₑ/C)·ln(cos(φ₀ − k·t)/cos φ₀),
    // with φ₀ = atan(v₀·√(C/A)) and k = √(A·C)/Mₑ (the analytical basis of coast-down analysis).
    const massKg = bus.curbMassKg + bus.payloadKg;
    const effectiveMassKg = (1 + bus.rotatingMassFactor) * massKg;
    const a = bus.rollingResistanceCoefficient * massKg * 9.80665;
    const c = 0.5 * 1.225 * bus.dragCoefficient * bus.frontalAreaM2;
    const v0 = 25;
    const phi0 = Math.atan(v0 * Math.sqrt(c / a));
    const k = Math.sqrt(a * c) / effectiveMassKg;
    const distanceM: number[] = [];
    const speedMps: number[] = [];
    for (let t = 0; ; t += 0.5) {
      const v = Math.sqrt(a / c) * Math.tan(phi0 - k * t);
      if (v < 3) break;
      distanceM.push((effectiveMassKg / c) * Math.log(Math.cos(phi0 - k * t) / Math.cos(phi0)));
      speedMps.push(v);
    }
    const lengthM = distanceM.at(-1)!;
    const end: [number, number] = [0, 0];
    geodesicDirect(9, 0, Math.PI / 2, lengthM, end);

    const coast = await analyseRouteDetailed(
      {
        route: {
          type: 'LineString',
          coordinates: [
            [9, 0, 0],
            [end[0], end[1], 0],
          ],
        },
        vehicle: bus,
        conditions: { ambientC: 15, startSoc: 0.5 },
        options: { spacingM: 10, smoothingWindowM: 0, startAtRest: false, endAtRest: false },
      },
      {},
      { distanceM, speedMps },
    );

    const resisting = coast.run.rollingN.map((rolling, i) => rolling + coast.run.aeroN[i]!);
    coast.run.tractionN
      .slice(0, -1)
      .forEach((traction, i) => expect(Math.abs(traction), `segment ${i}`).toBeLessThan(0.01 * resisting[i]!));
  });
});
