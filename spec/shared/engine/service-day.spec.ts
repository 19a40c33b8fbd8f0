import { describe, expect, it } from 'vitest';
import fc from 'fast-check';
import type { VehicleInput } from '../../../shared/domain/analysis';
import type { Block, Charger } from '../../../shared/domain/service-days';
import { blockResultSchema } from '../../../shared/domain/service-days';
import {
  CHARGER_REACH_M,
  clock,
  runServiceDay,
  runTrip,
  tripSeries,
  type ServiceDayEngineInput,
  type ServiceDayRouteInput,
} from '../../../shared/engine/service-day';
import { auxiliaryBreakdown } from '../../../shared/engine/auxiliary-power';
import { DEFAULT_CLIMATE } from '../../../shared/engine/constants';
import { geodesicDirect } from '../../../shared/engine/geodesy';
import { analyseRouteDetailed } from '../../../shared/engine/analyse-route';
import { initialVehicleState } from '../../../shared/engine/route-simulation';
import { aStraightRoute, aWorkedExampleBus } from '../support/engine-builders';

const ROUTE = '00000000-0000-4000-8000-00000000000a';
const HILL = '00000000-0000-4000-8000-00000000000b';
const BUS = '00000000-0000-4000-8000-0000000000b1';
const LOADS = { empty: 0, seated: 3_000, 'full-standing': 6_000 };

type Coordinates = [number, number, number][];

function both(routeId: string, outbound: Coordinates, options: ServiceDayRouteInput['options'] = {}): ServiceDayRouteInput[] {
  return [
    { routeId, direction: 'outbound', route: { type: 'LineString', coordinates: outbound }, options },
    { routeId, direction: 'inbound', route: { type: 'LineString', coordinates: [...outbound].reverse() }, options },
  ];
}

function end(coordinates: Coordinates): [number, number] {
  const last = coordinates[coordinates.length - 1]!;
  return [last[0], last[1]];
}

function aCharger(position: [number, number], overrides: Partial<Charger> = {}): Charger {
  return {
    key: 'T1',
    name: 'Upper terminus',
    kind: 'terminus',
    position,
    powerW: 150_000,
    efficiency: 0.9,
    targetSoc: 0.9,
    connectS: 30,
    ...overrides,
  };
}

function trips(routeId: string, departures: number[], first: 'outbound' | 'inbound' = 'outbound'): Block['trips'] {
  return departures.map((departureS, i) => ({
    routeId,
    direction: (i % 2 === 0) === (first === 'outbound') ? 'outbound' : 'inbound',
    departureS,
    load: { kind: 'case', case: 'seated' },
  }));
}

function aDay(
  overrides: Partial<ServiceDayEngineInput> & Pick<ServiceDayEngineInput, 'routes' | 'blocks'>,
  vehicle: VehicleInput = aWorkedExampleBus(),
): ServiceDayEngineInput {
  return {
    ambientC: 10,
    batteryAge: 'beginning-of-life',
    reserveSoc: 0.15,
    vehicles: [{ vehicleProfileId: BUS, vehicle, loadsKg: LOADS, passengerMassKg: 75 }],
    chargers: [],
    ...overrides,
  };
}

/** 6 km climbing 8 % (480 m), the bus's brakes carry the descent's heat into the next trip. */
const hill = aStraightRoute(6_000, (s) => 600 + 0.08 * s, { vertexSpacingM: 100 });

describe('a hand-worked two-trip block with one terminus charger', () => {
  /*
   * A flat, straight 3 000 m route (every vertex at 500 m) run out and back. The vehicle is chosen
   * so each figure can be worked by hand:
   *   m = 16 000 kg curb + 3 000 kg seated load = 19 000 kg; no rotating-mass allowance (δ = 0);
   *   Cr = 0.007, no air drag (Cd = 0), drivetrain and regeneration efficiency 0.9, no regeneration
   *   fade at low speed, auxiliaries 10 kW, battery 200 kWh usable, charge limit 200 kW.
   * Speed profile: 36 km/h (10 m/s) limit, 1 m/s² up and down, at rest at both ends.
   *   Accelerating 0 → 10 m/s takes v/a = 10 s over v²/2a = 50 m; braking the same; the 2 900 m
   *   between at 10 m/s take 290 s. Trip time t = 10 + 290 + 10 = 310 s.
   * Rolling force Cr·m·g = 0.007 × 19 000 × 9.80665 = 1 304.28 N.
   * Wheel traction energy: kinetic ½·m·v² = 950 000 J, plus rolling over the 2 950 m of
   *   accelerating and cruising: 1 304.28 × 2 950 = 3 847 627 J; total 4 797 627 J; from the
   *   battery ÷ 0.9 = 5 330 697 J.
   * Braking: the kinetic energy less rolling over the 50 m of braking: 950 000 − 65 214 = 884 786 J
   *   at the wheel, all regenerated (≤ 177 kW, within the 300 kW machine, the 60 kN force limit and
   *   the 200 kW charge limit); into the battery × 0.9 = 796 307 J.
   * Auxiliaries 10 kW × 310 s = 3 100 000 J.
   * Net per trip: 5 330 697 − 796 307 + 3 100 000 = 7 634 390 J = 2 120.66 Wh; ΔSOC 0.010 603.
   *
   * Block: pull-out 08:00 at SOC 0.5, trip 1 leaves 08:00 and arrives 08:05:10 at the far end,
   * where a 150 kW charger (efficiency 0.9, target 0.9, connect 30 s) stands. Trip 2 leaves 08:20,
   * so the layover is 890 s: 30 s connecting, then 860 s at min(150 kW × 0.9, 200 kW) = 135 kW into
   * the battery: 116 100 000 J = 32 250 Wh (grid: 35 833.3 Wh); the auxiliaries draw 10 kW × 890 s
   * = 2 472.22 Wh meanwhile. Trip 2 arrives at 08:25:10; pull-in at 08:30, 290 s standing at the
   * start (no charger): 805.56 Wh.
   * SOC: 0.5 → 0.489 397 (trip 1) → + (32 250 − 2 472.22) / 200 000 = 0.638 286 → 0.627 682 (trip 2)
   *   → 0.623 655 at pull-in.
   * Balance: (0.5 − 0.623 655) × 200 000 + 32 250 = 7 519.1 Wh
   *   = 2 × 2 120.66 + 2 472.22 + 805.56 = 7 519.1 Wh.
   */
  const flat = aStraightRoute(3_000, () => 500, { vertexSpacingM: 100 });
  const vehicle = aWorkedExampleBus({
    curbMassKg: 16_000,
    payloadKg: 0,
    dragCoefficient: 0,
    rotatingMassFactor: 0,
    drivetrainEfficiency: 0.9,
    regenEfficiency: 0.9,
    regenMinSpeedMps: 0,
    auxPowerW: 10_000,
    batteryCapacityWh: 200_000,
    maxChargePowerW: 200_000,
  });
  const options = { spacingM: 10, speedLimitKph: 36, accelerationMps2: 1, decelerationMps2: 1, smoothingWindowM: 0 };
  const result = runServiceDay(
    aDay(
      {
        routes: both(ROUTE, flat, options),
        chargers: [aCharger(end(flat))],
        blocks: [
          {
            blockId: 'HW-1',
            vehicleProfileId: BUS,
            pullOutS: 8 * 3600,
            pullInS: 8.5 * 3600,
            startSoc: 0.5,
            trips: trips(ROUTE, [8 * 3600, 8 * 3600 + 1200]),
          },
        ],
      },
      vehicle,
    ),
  );
  const block = result.blocks[0]!;

  it('charges 32 250 Wh at 135 kW after the connect time, drawing 35 833 Wh and 150 kW from the grid', () => {
    expect(block.chargingEvents).toHaveLength(1);
    const event = block.chargingEvents[0]!;
    expect(event.chargerKey).toBe('T1');
    expect(event.startS).toBeCloseTo(8 * 3600 + 310 + 30, 6);
    expect(event.endS).toBeCloseTo(8 * 3600 + 1200, 6);
    expect(event.energyWh).toBeCloseTo(32_250, 3);
    expect(event.gridEnergyWh).toBeCloseTo(35_833.33, 1);
    expect(result.peakChargingPowerW).toEqual([{ chargerKey: 'T1', powerW: expect.closeTo(150_000, 3) as number }]);
  });

  it('ends at SOC 0.623 655 with the hand-worked net energy of 7 519.1 Wh', () => {
    expect(block.feasible).toBe(true);
    expect(block.tripNetEnergyWh).toBeCloseTo(2 * 2_120.66 + 2_472.22 + 805.56, 0);
    expect(block.chargedEnergyWh).toBeCloseTo(32_250, 3);
    expect(block.endSoc).toBeCloseTo(0.623_655, 5);
    // The lowest point is inside trip 1, just before braking (300 s): the energy of accelerating
    // and cruising plus 300 s of auxiliaries, (5 330 697 + 3 000 000) J = 2 314.08 Wh, taken from
    // 0.5 × 200 kWh gives 0.488 430; braking then regenerates 796 307 J before the trip ends.
    expect(block.minSoc).toBeCloseTo(0.488_430, 5);
    expect((0.5 - block.endSoc) * 200_000 + block.chargedEnergyWh).toBeCloseTo(block.tripNetEnergyWh, 6);
  });

  it('traces the SOC at the trip ends and the charge ends, in time order', () => {
    const times = block.socTrace.map((point) => point.timeS);
    expect([...times].sort((a, b) => a - b)).toEqual(times);
    const at = (timeS: number) => block.socTrace.find((point) => Math.abs(point.timeS - timeS) < 1e-6)?.soc;
    expect(at(8 * 3600)).toBeCloseTo(0.5, 9);
    expect(at(8 * 3600 + 310)).toBeCloseTo(0.489_397, 5);
    expect(at(8 * 3600 + 1200)).toBeCloseTo(0.638_286, 5);
    expect(at(8 * 3600 + 1510)).toBeCloseTo(0.627_682, 5);
    expect(at(8.5 * 3600)).toBeCloseTo(0.623_655, 5);
    // Points inside a trip every minute or so.
    expect(times.filter((t) => t > 8 * 3600 && t < 8 * 3600 + 310).length).toBeGreaterThanOrEqual(4);
    expect(blockResultSchema.safeParse(block).success).toBe(true);
  });
});

describe('the energy balance over random blocks', () => {
  const routes = [
    ...both(ROUTE, hill, { spacingM: 20 }),
    ...both(
      HILL,
      aStraightRoute(4_000, (s) => 900 - 0.03 * s + 20 * Math.sin(s / 300), { vertexSpacingM: 100 }),
      { spacingM: 20 },
    ),
  ];
  const top = end(hill);
  it('(start SOC − end SOC) × usable capacity + charged energy equals the trips\u2019 and layovers\u2019 net energy within 0.5 %', () => {
    fc.assert(
      fc.property(
        fc.record({
          tripCount: fc.integer({ min: 1, max: 6 }),
          gaps: fc.array(fc.integer({ min: 0, max: 2_400 }), { minLength: 6, maxLength: 6 }),
          startSoc: fc.double({ min: 0.3, max: 1, noNaN: true }),
          ambientC: fc.double({ min: -20, max: 35, noNaN: true }),
          route: fc.constantFrom(ROUTE, HILL),
          withCharger: fc.boolean(),
          chargerPowerW: fc.double({ min: 20_000, max: 450_000, noNaN: true }),
          targetSoc: fc.double({ min: 0.5, max: 1, noNaN: true }),
          climate: fc.boolean(),
          endOfLife: fc.boolean(),
          capacityWh: fc.double({ min: 60_000, max: 500_000, noNaN: true }),
        }),
        (r) => {
          // Departures with layovers after each ~25 min trip.
          const departures: number[] = [];
          let t = 6 * 3600;
          for (let i = 0; i < r.tripCount; i++) {
            departures.push(t);
            t += 1_800 + r.gaps[i]!;
          }
          const input = aDay(
            {
              ambientC: r.ambientC,
              batteryAge: r.endOfLife ? 'end-of-life' : 'beginning-of-life',
              routes,
              chargers: r.withCharger
                ? [
                    aCharger(top, { powerW: r.chargerPowerW, targetSoc: r.targetSoc }),
                    aCharger(end([...hill].reverse()), { key: 'D', kind: 'depot' }),
                  ]
                : [],
              blocks: [
                {
                  blockId: 'R',
                  vehicleProfileId: BUS,
                  depotChargerKey: r.withCharger ? 'D' : undefined,
                  pullOutS: 6 * 3600 - 600,
                  pullInS: t,
                  startSoc: r.startSoc,
                  trips: trips(r.route, departures),
                },
              ],
            },
            aWorkedExampleBus({ batteryCapacityWh: r.capacityWh, maxChargePowerW: r.capacityWh }),
          );
          if (r.climate) input.vehicles[0]!.climate = {};
          const block = runServiceDay(input).blocks[0]!;
          const capacityWh = r.capacityWh * (r.endOfLife ? 0.8 : 1);
          const left = (r.startSoc - block.endSoc) * capacityWh + block.chargedEnergyWh;
          const right = block.tripNetEnergyWh;
          expect(Math.abs(left - right)).toBeLessThanOrEqual(0.005 * Math.max(Math.abs(right), 1));
          expect(block.chargedEnergyWh).toBeCloseTo(
            block.chargingEvents.reduce((sum, e) => sum + e.energyWh, 0),
            6,
          );
          const socs = block.socTrace.map((p) => p.soc);
          expect(Math.min(...socs)).toBeGreaterThanOrEqual(block.minSoc - 1e-12);
          expect(block.socTrace.at(-1)!.soc).toBe(block.endSoc);
        },
      ),
      { numRuns: 40, seed: 15 },
    );
  });
});

describe('a block through the day', () => {
  const top = end(hill);
  const routes = both(HILL, hill, { spacingM: 20 });

  it('fails its reserve with the SOC, the time and the reserve in plain words', () => {
    const result = runServiceDay(
      aDay(
        {
          routes,
          blocks: [
            {
              blockId: 'LOW',
              vehicleProfileId: BUS,
              pullOutS: 6 * 3600,
              pullInS: 9 * 3600,
              startSoc: 0.9,
              trips: trips(HILL, [6 * 3600, 6 * 3600 + 2_400, 6 * 3600 + 4_800, 6 * 3600 + 7_200]),
            },
          ],
        },
        aWorkedExampleBus({ batteryCapacityWh: 85_000 }),
      ),
    );
    const block = result.blocks[0]!;
    expect(block.feasible).toBe(false);
    expect(block.minSoc).toBeLessThan(0.15);
    expect(block.minSoc).toBeGreaterThan(0);
    const reserve = block.problems.find((p) => p.includes('reserve'))!;
    expect(reserve).toMatch(/^falls to \d+ % at \d\d:\d\d, below the 15 % reserve$/);
    expect(reserve).toContain(`falls to ${Math.round(block.minSoc * 100)} %`);
  });

  it('names a trip that leaves before the previous one arrives', () => {
    const result = runServiceDay(
      aDay({
        routes,
        blocks: [
          {
            blockId: 'TIGHT',
            vehicleProfileId: BUS,
            pullOutS: 6 * 3600,
            pullInS: 9 * 3600,
            startSoc: 0.9,
            trips: trips(HILL, [6 * 3600, 6 * 3600 + 60]),
          },
        ],
      }),
    );
    const block = result.blocks[0]!;
    expect(block.feasible).toBe(false);
    expect(block.problems[0]).toMatch(/^trip 2 leaves at 06:01, before trip 1 arrives at 06:\d\d$/);
  });

  it('makes a block infeasible when a trip runs the battery empty, and says where', () => {
    const result = runServiceDay(
      aDay(
        {
          routes,
          blocks: [
            {
              blockId: 'EMPTY',
              vehicleProfileId: BUS,
              pullOutS: 6 * 3600,
              pullInS: 9 * 3600,
              startSoc: 0.2,
              trips: trips(HILL, [6 * 3600]),
            },
          ],
        },
        aWorkedExampleBus({ batteryCapacityWh: 40_000 }),
      ),
    );
    const block = result.blocks[0]!;
    expect(block.feasible).toBe(false);
    expect(block.problems[0]).toMatch(/^trip 1 \(route .+ outbound\) cannot be driven: the battery runs empty at \d+\.\d km, 06:\d\d$/);
    expect(block.minSoc).toBe(0);
  });

  it('says which trip has no route input instead of failing the whole day', () => {
    const result = runServiceDay(
      aDay({
        routes,
        blocks: [
          { blockId: 'A', vehicleProfileId: BUS, pullOutS: 0, pullInS: 7_200, startSoc: 0.9, trips: trips(ROUTE, [600]) },
          { blockId: 'B', vehicleProfileId: BUS, pullOutS: 0, pullInS: 7_200, startSoc: 0.9, trips: trips(HILL, [600]) },
        ],
      }),
    );
    expect(result.blocks[0]!.problems).toEqual([`trip 1 cannot be driven: route ${ROUTE} (outbound) was not given to the calculation`]);
    expect(result.blocks[1]!.feasible).toBe(true);
  });

  it('charges only at a charger within reach of the trip\u2019s last point', () => {
    const near = [0, 0] as [number, number];
    const far = [0, 0] as [number, number];
    geodesicDirect(top[0], top[1], Math.PI / 2, CHARGER_REACH_M - 20, near);
    geodesicDirect(top[0], top[1], Math.PI / 2, CHARGER_REACH_M + 30, far);
    const run = (position: [number, number]) =>
      runServiceDay(
        aDay({
          routes,
          chargers: [aCharger(position)],
          blocks: [{ blockId: 'C', vehicleProfileId: BUS, pullOutS: 0, pullInS: 10_000, startSoc: 0.6, trips: trips(HILL, [0, 3_600]) }],
        }),
      ).blocks[0]!;
    expect(run(near).chargingEvents).toHaveLength(1);
    expect(run(far).chargingEvents).toHaveLength(0);
  });

  it('stops charging at the charger\u2019s target SOC, and charges slower at the end of the battery\u2019s life', () => {
    const day = (age: 'beginning-of-life' | 'end-of-life', targetSoc: number) =>
      runServiceDay(
        aDay(
          {
            batteryAge: age,
            routes,
            chargers: [aCharger(top, { powerW: 400_000, efficiency: 0.95, targetSoc })],
            blocks: [{ blockId: 'T', vehicleProfileId: BUS, pullOutS: 0, pullInS: 20_000, startSoc: 0.5, trips: trips(HILL, [0, 6_000]) }],
          },
          aWorkedExampleBus({
            maxChargePowerW: 150_000,
            endOfLifeCapacityFraction: 0.75,
            endOfLifeChargePowerFraction: 0.5,
            socTaperStart: 0.9,
            socCeiling: 0.95,
          }),
        ),
      ).blocks[0]!;
    const young = day('beginning-of-life', 0.8);
    const event = young.chargingEvents[0]!;
    expect(event.socAfter).toBeCloseTo(0.8, 9);
    // 150 kW limit (below 400 kW × 0.95): the charged energy over the charging time.
    const youngPowerW = (event.energyWh * 3600) / (event.endS - event.startS);
    expect(youngPowerW).toBeLessThanOrEqual(150_000 + 1e-6);
    const old = day('end-of-life', 0.9).chargingEvents[0]!;
    const oldPowerW = (old.energyWh * 3600) / (old.endS - old.startS);
    expect(oldPowerW).toBeLessThanOrEqual(75_000 + 1e-6);
    expect(oldPowerW).toBeGreaterThan(70_000);
  });

  it('runs at end of life with the stated share of usable capacity (0.8 when none is stated)', () => {
    const day = (age: 'beginning-of-life' | 'end-of-life') =>
      runServiceDay(
        aDay({
          batteryAge: age,
          routes,
          blocks: [{ blockId: 'E', vehicleProfileId: BUS, pullOutS: 0, pullInS: 3_000, startSoc: 0.9, trips: trips(HILL, [0]) }],
        }),
      ).blocks[0]!;
    const young = day('beginning-of-life');
    const old = day('end-of-life');
    expect(old.tripNetEnergyWh).toBeCloseTo(young.tripNetEnergyWh, 0);
    expect((0.9 - old.endSoc) / (0.9 - young.endSoc)).toBeCloseTo(1 / 0.8, 3);
  });

  it('reports the usable energy and charge power the day ran with, and which auxiliary model', () => {
    const day = (age: 'beginning-of-life' | 'end-of-life') =>
      runServiceDay(
        aDay({
          batteryAge: age,
          routes,
          blocks: [{ blockId: 'E', vehicleProfileId: BUS, pullOutS: 0, pullInS: 3_000, startSoc: 0.9, trips: trips(HILL, [0]) }],
        }),
      ).blocks[0]!.vehicle!;
    const young = day('beginning-of-life');
    const old = day('end-of-life');
    expect(young.usableCapacityWh).toBeCloseTo(400_000, 6);
    expect(old.usableCapacityWh).toBeCloseTo(0.8 * 400_000, 6);
    expect(old.maxChargePowerW).toBeCloseTo(young.maxChargePowerW, 6);
    expect(old.auxiliarySource).toBe('season');
    expect(old.standingHeatingPowerW).toBe(0);
    expect(old.preconditioningEnergyWh).toBe(0);
  });

  it('sums two vehicles charging at one charger at the same time into its peak', () => {
    const block = (blockId: string): Block => ({
      blockId,
      vehicleProfileId: BUS,
      pullOutS: 0,
      pullInS: 9_000,
      startSoc: 0.5,
      trips: trips(HILL, [0, 5_000]),
    });
    const result = runServiceDay(aDay({ routes, chargers: [aCharger(top, { powerW: 100_000 })], blocks: [block('P1'), block('P2')] }));
    expect(result.peakChargingPowerW[0]!.powerW).toBeCloseTo(200_000, 3);
  });

  it('pre-conditions from the depot charger when the block names one, else from the battery', () => {
    const depot = aCharger(end([...hill].reverse()), { key: 'D', kind: 'depot', powerW: 100_000 });
    const day = (depotChargerKey?: string) => {
      const input = aDay({
        ambientC: -10,
        routes,
        chargers: [depot],
        blocks: [
          {
            blockId: 'W',
            vehicleProfileId: BUS,
            depotChargerKey,
            pullOutS: 6 * 3600,
            pullInS: 6 * 3600 + 2_400,
            startSoc: 0.9,
            trips: trips(HILL, [6 * 3600]),
          },
        ],
      });
      input.vehicles[0]!.climate = {};
      return runServiceDay(input);
    };
    const fromDepot = day('D');
    const fromBattery = day();
    const event = fromDepot.blocks[0]!.chargingEvents[0]!;
    expect(event).toMatchObject({ chargerKey: 'D', purpose: 'preconditioning', startS: 6 * 3600 - 1_800, endS: 6 * 3600, energyWh: 0 });
    expect(event.gridEnergyWh).toBeGreaterThan(0);
    // The battery pays for it when no depot charger is named: the same energy, less the charger's losses.
    const socDrop = fromBattery.blocks[0]!.endSoc - fromDepot.blocks[0]!.endSoc;
    expect(-socDrop * 400_000).toBeCloseTo(event.gridEnergyWh * depot.efficiency, 3);
    expect(fromBattery.blocks[0]!.socTrace[0]).toEqual({ timeS: 6 * 3600 - 1_800, soc: 0.9 });
    // The result says what the climate drew: heating at a stop (the default climate at −10 °C:
    // heat pump at its lower limit plus resistive back-up), and the pre-conditioning energy.
    const standing = auxiliaryBreakdown(DEFAULT_CLIMATE, { ambientC: -10, passengers: 0, doorOpenings: 0, durationS: 3_600 });
    const vehicle = fromDepot.blocks[0]!.vehicle!;
    expect(vehicle.auxiliarySource).toBe('climate');
    expect(vehicle.standingHeatingPowerW).toBeCloseTo(standing.heatPumpElectricW + standing.resistiveElectricW, 6);
    expect(vehicle.standingAuxPowerW).toBeCloseTo(standing.totalW, 6);
    expect(vehicle.preconditioningEnergyWh).toBeCloseTo(event.gridEnergyWh * depot.efficiency, 3);
    expect(vehicle.tripAuxPowerW.mean).toBeGreaterThan(DEFAULT_CLIMATE.baseLoadW);
    expect(vehicle.tripAuxPowerW.max).toBeCloseTo(vehicle.tripAuxPowerW.mean, 6);
  });
});

describe('descents with the state the vehicle arrives with', () => {
  // Down the hill first (inbound), so the brakes reach the next descent hot after a short layover.
  const routes = both(HILL, hill, { spacingM: 20 });
  const noRegen = aWorkedExampleBus({ regenPowerW: 0, curbMassKg: 16_000, brakeThermalMassJPerK: 120_000 });
  const run = (layoverS: number) =>
    runServiceDay(
      aDay(
        {
          routes,
          blocks: [
            {
              blockId: 'D',
              vehicleProfileId: BUS,
              pullOutS: 0,
              pullInS: 40_000,
              startSoc: 0.9,
              // down, up, down: the second descent comes after the climb and a layover.
              trips: [
                { routeId: HILL, direction: 'inbound', departureS: 0, load: { kind: 'case', case: 'seated' } },
                { routeId: HILL, direction: 'outbound', departureS: 1_500 + layoverS, load: { kind: 'case', case: 'seated' } },
                { routeId: HILL, direction: 'inbound', departureS: 3_000 + 2 * layoverS, load: { kind: 'case', case: 'seated' } },
              ],
            },
          ],
        },
        noRegen,
      ),
    ).blocks[0]!;

  it('carries brake heat into later descents, and never reports them cooler than the same descent alone', () => {
    const block = run(0);
    const [first, second] = block.descents.filter((d) => d.direction === 'inbound');
    expect(first!.tripIndex).toBe(0);
    expect(second!.tripIndex).toBe(2);
    expect(first!.arrivalBrakeTempC).toBeCloseTo(10, 6);
    expect(second!.arrivalBrakeTempC).toBeGreaterThan(first!.arrivalBrakeTempC + 5);
    expect(second!.peakBrakeTempC).toBeGreaterThanOrEqual(first!.peakBrakeTempC);
    for (const descent of block.descents) {
      const rank = ['low', 'elevated', 'high', 'critical'];
      expect(rank.indexOf(descent.risk)).toBeGreaterThanOrEqual(rank.indexOf(descent.standaloneRisk));
      expect(descent.worsenedByDay).toBe(rank.indexOf(descent.risk) > rank.indexOf(descent.standaloneRisk));
    }
  });

  it('flags a descent whose risk rises because of what came before', () => {
    // 6 km at 4.7 %: alone the worst case peaks in the elevated band (below 450 °C for discs);
    // after a descent, a climb and no layover the brakes arrive at about 115 °C and it reaches high.
    const gentle = aStraightRoute(6_000, (s) => 600 + 0.047 * s, { vertexSpacingM: 100 });
    const input = aDay(
      {
        routes: both(HILL, gentle, { spacingM: 20 }),
        blocks: [
          {
            blockId: 'W',
            vehicleProfileId: BUS,
            pullOutS: 0,
            pullInS: 40_000,
            startSoc: 0.9,
            trips: [
              { routeId: HILL, direction: 'inbound', departureS: 0, load: { kind: 'case', case: 'seated' } },
              { routeId: HILL, direction: 'outbound', departureS: 1_500, load: { kind: 'case', case: 'seated' } },
              { routeId: HILL, direction: 'inbound', departureS: 3_000, load: { kind: 'case', case: 'seated' } },
            ],
          },
        ],
      },
      aWorkedExampleBus({ regenPowerW: 0, curbMassKg: 16_000 }),
    );
    const [first, second] = runServiceDay(input).blocks[0]!.descents;
    expect(first).toMatchObject({ tripIndex: 0, risk: 'elevated', standaloneRisk: 'elevated', worsenedByDay: false });
    expect(second).toMatchObject({ tripIndex: 2, risk: 'high', standaloneRisk: 'elevated', worsenedByDay: true });
    expect(second!.peakBrakeTempC).toBeGreaterThan(450);
    expect(second!.arrivalBrakeTempC).toBeGreaterThan(100);
  });

  it('cools the brakes over a long layover, so the later descent arrives cooler', () => {
    const short = run(0).descents.filter((d) => d.direction === 'inbound')[1]!;
    const long = run(3 * 3600).descents.filter((d) => d.direction === 'inbound')[1]!;
    expect(long.arrivalBrakeTempC).toBeLessThan(short.arrivalBrakeTempC);
    expect(long.arrivalBrakeTempC).toBeGreaterThanOrEqual(10 - 1e-9);
  });
});

describe('a day\u2019s trip run', () => {
  it('steps exactly as the single-trip run does', async () => {
    const request = {
      route: { type: 'LineString' as const, coordinates: hill },
      // A small regeneration limit, so the descent also needs the friction brakes.
      vehicle: aWorkedExampleBus({ regenPowerW: 40_000 }),
      conditions: { ambientC: 3, startSoc: 0.7 },
      options: { spacingM: 20, stops: [{ atM: 2_000, dwellS: 30 }] },
    };
    const { model, run } = await analyseRouteDetailed(request);
    const state = initialVehicleState(0.7, 3);
    const series = tripSeries(model.pointCount);
    const lean = runTrip(model, run.speedMps, state, series);
    expect(lean.durationS).toBe(run.durationS);
    expect(lean.sourceJ).toBe(run.sourceJ);
    // Braking energy adds up as the single-trip summary adds it: regeneration at the terminals, friction.
    const sum = (values: Float64Array) => values.reduce((total, value) => total + value, 0);
    expect(lean.regenJ).toBeGreaterThan(0);
    expect(lean.frictionJ).toBeGreaterThan(0);
    expect(lean.regenJ).toBeCloseTo(sum(run.segmentRegenJ), 6);
    expect(lean.frictionJ).toBeCloseTo(sum(run.segmentFrictionJ), 6);
    expect(state.soc).toBe(run.endSoc);
    expect(Array.from(series.soc)).toEqual(Array.from(run.soc));
    expect(Array.from(series.timeS)).toEqual(Array.from(run.timeS));
    for (let i = 0; i < model.pointCount; i++) {
      expect(series.governingC[i]).toBe(Math.max(run.brakeTempC[i]!, run.frontBrakeTempC[i]!, run.rearBrakeTempC[i]!));
    }
  });
});

describe('input the calculation refuses', () => {
  it('names the field: a charger\u2019s efficiency above 1, a reserve outside 0–1, a vehicle without mass', () => {
    const routes = both(HILL, hill, { spacingM: 20 });
    const blocks: Block[] = [{ blockId: 'X', vehicleProfileId: BUS, pullOutS: 0, pullInS: 9_000, startSoc: 0.9, trips: trips(HILL, [0]) }];
    expect(() => runServiceDay(aDay({ routes, blocks, chargers: [aCharger(end(hill), { efficiency: 2 })] }))).toThrow(
      expect.objectContaining({ name: 'EngineInputError', field: 'chargers.0.efficiency' }) as Error,
    );
    expect(() => runServiceDay(aDay({ routes, blocks, reserveSoc: 1.5 }))).toThrow(
      expect.objectContaining({ field: 'reserveSoc' }) as Error,
    );
    expect(() => runServiceDay(aDay({ routes, blocks }, aWorkedExampleBus({ curbMassKg: -1 })))).toThrow(
      expect.objectContaining({ field: 'vehicles.0.vehicle.curbMassKg' }) as Error,
    );
  });
});

describe('service time', () => {
  it('writes times past midnight as GTFS does', () => {
    expect(clock(25 * 3600 + 7 * 60 + 59)).toBe('25:07');
    expect(clock(0)).toBe('00:00');
  });
});
