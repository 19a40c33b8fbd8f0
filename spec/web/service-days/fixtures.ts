import type { Block, BlockResult, ServiceDayResult } from '@shared/domain/service-days';

export const ROUTE_A = '11111111-1111-4111-8111-111111111111';
export const ROUTE_B = '22222222-2222-4222-8222-222222222222';
export const VEHICLE = '33333333-3333-4333-8333-333333333333';
export const DAY_ID = '44444444-4444-4444-8444-444444444444';

/** Route A is 9 km long: 30 min at the 18 km/h planning speed. Route B is 6 km: 20 min. */
export const ROUTES = [
  { id: ROUTE_A, name: 'Brackenfold – Upper Tarn', lengthM: 9_000 },
  { id: ROUTE_B, name: 'Upper Tarn – Gillsby Pass', lengthM: 6_000 },
];
export const lookup = (routeId: string) => ROUTES.find((route) => route.id === routeId);

export function block(blockId: string, departures: [string, number, 'outbound' | 'inbound'][], extra: Partial<Block> = {}): Block {
  return {
    blockId,
    vehicleProfileId: VEHICLE,
    pullOutS: 6 * 3600,
    pullInS: 12 * 3600,
    startSoc: 0.95,
    trips: departures.map(([routeId, departureS, direction]) => ({
      routeId,
      departureS,
      direction,
      load: { kind: 'case', case: 'seated' },
    })),
    ...extra,
  };
}

export function blockResult(blockId: string, change: Partial<BlockResult> = {}): BlockResult {
  return {
    blockId,
    minSoc: 0.5,
    endSoc: 0.6,
    chargedEnergyWh: 0,
    tripNetEnergyWh: 50_000,
    feasible: true,
    problems: [],
    socTrace: [
      { timeS: 6 * 3600, soc: 0.95 },
      { timeS: 9 * 3600, soc: 0.7 },
      { timeS: 12 * 3600, soc: 0.6 },
    ],
    chargingEvents: [],
    descents: [],
    ...change,
  };
}

export function result(blocks: BlockResult[]): ServiceDayResult {
  return {
    serviceDayId: DAY_ID,
    engineVersion: 'test',
    computedAt: '2026-12-01T08:00:00.000Z',
    blocks,
    peakChargingPowerW: [],
    caution: 'Engineering estimates.',
  };
}
