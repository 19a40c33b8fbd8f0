/** Builders for engine checks: vehicles and routes with known geometry. */
import type { VehicleInput } from '../../../shared/domain/analysis';
import { geodesicDirect } from '../../../shared/engine/geodesy';

/**
 * The 19 t bus of the engine README's worked examples (§1.4, §3.3, §8 cases 6–8, 16):
 * m 19 000 kg, Cr 0.007, Cd 0.7, A 8 m², η 0.889, aux 15 kW, δ = 1.
 */
export function aWorkedExampleBus(overrides: Partial<VehicleInput> = {}): VehicleInput {
  return {
    curbMassKg: 13_500,
    payloadKg: 5_500,
    frontalAreaM2: 8,
    dragCoefficient: 0.7,
    rollingResistanceCoefficient: 0.007,
    rotatingMassFactor: 0,
    tractionPowerW: 300_000,
    regenPowerW: 300_000,
    drivetrainEfficiency: 0.889,
    regenEfficiency: 0.889,
    batteryCapacityWh: 400_000,
    maxChargePowerW: 200_000,
    auxPowerW: 15_000,
    maxTractionForceN: 60_000,
    ...overrides,
  };
}

/**
 * A straight route northwards from (lon0, lat0) whose horizontal geodesic length is `lengthM`,
 * as vertices every `vertexSpacingM` carrying elevations from `elevationAt(s)`.
 */
export function aStraightRoute(
  lengthM: number,
  elevationAt: (distanceM: number) => number,
  options: { lon0?: number; lat0?: number; azimuthDeg?: number; vertexSpacingM?: number } = {},
): [number, number, number][] {
  const lon0 = options.lon0 ?? 10;
  const lat0 = options.lat0 ?? 46;
  const azimuth = ((options.azimuthDeg ?? 0) * Math.PI) / 180;
  const spacing = options.vertexSpacingM ?? 500;
  const count = Math.max(1, Math.round(lengthM / spacing));
  const coordinates: [number, number, number][] = [];
  const point: [number, number] = [0, 0];
  for (let i = 0; i <= count; i++) {
    const s = (lengthM * i) / count;
    geodesicDirect(lon0, lat0, azimuth, s, point);
    coordinates.push([point[0], point[1], elevationAt(s)]);
  }
  return coordinates;
}

export function relativeError(actual: number, expected: number): number {
  return Math.abs(actual / expected - 1);
}
