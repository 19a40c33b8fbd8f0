/**
 * Benchmark of a service-day run: a network of 50 blocks × 12 trips over the demo's three bus
 * routes (valley line, pass line, ski shuttle; both directions, their stops and speed limits,
 * elevations from the routes' own design), the demo 12 m mountain bus with the climate model in
 * winter (−8 °C) at the end of the battery's life, terminus chargers at both ends of every route.
 * Times the full run (every block, every trip, every descent's worst case) two ways:
 *
 * - `engine`: `runServiceDay` on the main thread, all blocks at once;
 * - `pool`: the blocks split into one share per worker thread of a piscina pool (as the API's
 *   analyses run), each share run by `runServiceDay`, wall time from hand-over to the last answer
 *   (input copied to the workers and results back included; the pool is warmed up first).
 *
 * Prints a markdown table of median, min and max over the runs. Target: under 2 s for the pool.
 *
 *   node --import tsx scripts/bench-service-day.ts [runs] [threads]
 */
import { availableParallelism, loadavg } from 'node:os';
import { fileURLToPath } from 'node:url';
import { Piscina } from 'piscina';
import type { Block, Charger } from '../shared/domain/service-days';
import { runServiceDay, type ServiceDayEngineInput, type ServiceDayRouteInput } from '../shared/engine/service-day';
import { resampleRoute } from '../shared/engine/resample-route';
import { demoProfileDraft, demoRouteDesign } from '../api/demo/demo-network';
import { engineSpeedLimits, mirrorRoute } from '../api/road-routes/route-geometry';

const runs = Number(process.argv[2] ?? 7);
const threads = Number(process.argv[3] ?? Math.min(2, availableParallelism()));
const BLOCKS = 50;
const TRIPS = 12;
const ROUTE_KEYS = ['demo-route:valley-line', 'demo-route:pass-line', 'demo-route:ski-shuttle'];
const PROFILE_ID = '00000000-0000-4000-8000-00000000be01';

function routeId(index: number): string {
  return `00000000-0000-4000-8000-0000000000${(16 + index).toString(16)}`;
}

function buildInput(): ServiceDayEngineInput {
  const routes: ServiceDayRouteInput[] = [];
  const chargers: Charger[] = [];
  ROUTE_KEYS.forEach((key, index) => {
    const design = demoRouteDesign(key);
    const resampled = resampleRoute(design.coordinates, 10);
    const lengthM = resampled.distanceM.at(-1)!;
    const stops = design.stopsAtWaypoints
      .map((dwellS, i) =>
        dwellS === null ? null : { name: `stop ${i}`, lon: 0, lat: 0, atM: resampled.distanceM[resampled.vertexIndex[i]!]!, dwellS },
      )
      .filter((stop): stop is NonNullable<typeof stop> => stop !== null);
    const outbound = { coordinates: design.coordinates, stops, speedLimits: design.speedLimits, lengthM };
    for (const direction of ['outbound', 'inbound'] as const) {
      const line = direction === 'outbound' ? outbound : mirrorRoute(outbound);
      routes.push({
        routeId: routeId(index),
        direction,
        name: `${key.replace('demo-route:', '')} ${direction}`,
        route: { type: 'LineString', coordinates: line.coordinates as [number, number, number][] },
        options: {
          spacingM: 10,
          speedLimitKph: engineSpeedLimits(line.speedLimits, design.defaultSpeedLimitKph, lengthM),
          stops: line.stops.filter((stop) => stop.atM > 0 && stop.atM < lengthM).map((stop) => ({ atM: stop.atM, dwellS: stop.dwellS })),
        },
      });
      const last = line.coordinates[line.coordinates.length - 1]!;
      chargers.push({
        key: `${key}:${direction}-end`,
        name: `${key} ${direction} terminus`,
        kind: 'terminus',
        position: [last[0], last[1]],
        powerW: 300_000,
        efficiency: 0.92,
        targetSoc: 0.9,
        connectS: 30,
      });
    }
  });
  const blocks: Block[] = [];
  for (let b = 0; b < BLOCKS; b++) {
    const route = routeId(b % ROUTE_KEYS.length);
    const start = 5 * 3600 + (b % 10) * 300;
    const trips: Block['trips'] = [];
    for (let t = 0; t < TRIPS; t++) {
      trips.push({
        routeId: route,
        direction: t % 2 === 0 ? 'outbound' : 'inbound',
        departureS: start + t * 75 * 60,
        load: { kind: 'case', case: b % 3 === 0 ? 'full-standing' : 'seated' },
      });
    }
    blocks.push({
      blockId: `B${b + 1}`,
      vehicleProfileId: PROFILE_ID,
      pullOutS: start - 600,
      pullInS: start + TRIPS * 75 * 60,
      startSoc: 0.95,
      trips,
    });
  }
  const profile = demoProfileDraft('demo-vehicle:mountain-bus-12m');
  return {
    ambientC: -8,
    batteryAge: 'end-of-life',
    reserveSoc: 0.15,
    routes,
    vehicles: [
      {
        vehicleProfileId: PROFILE_ID,
        vehicle: { ...profile.vehicle, payloadKg: 0, auxPowerW: 24_000 },
        loadsKg: profile.loadsKg,
        passengerMassKg: profile.passengerMassKg ?? 70,
        climate: {},
      },
    ],
    chargers,
    blocks,
  };
}

function stats(values: number[]): { median: number; min: number; max: number } {
  const sorted = [...values].sort((a, b) => a - b);
  return { median: sorted[Math.floor(sorted.length / 2)]!, min: sorted[0]!, max: sorted[sorted.length - 1]! };
}

const loadBefore = loadavg()[0]!;
const input = buildInput();
const tripCount = input.blocks.reduce((sum, block) => sum + block.trips.length, 0);

// Engine alone, main thread.
const engineMs: number[] = [];
let result = runServiceDay(input); // warm-up
for (let i = 0; i < runs; i++) {
  const started = performance.now();
  result = runServiceDay(input);
  engineMs.push(performance.now() - started);
}

// Worker threads: one share of the blocks per thread.
const pool = new Piscina({
  filename: fileURLToPath(new URL('./bench-service-day-worker.mjs', import.meta.url)),
  minThreads: threads,
  maxThreads: threads,
});
const shares = Array.from({ length: threads }, (_, k) => ({ ...input, blocks: input.blocks.filter((_, b) => b % threads === k) }));
await Promise.all(shares.map((share) => pool.run(share))); // warm-up: workers loaded and compiled
const poolMs: number[] = [];
for (let i = 0; i < runs; i++) {
  const started = performance.now();
  await Promise.all(shares.map((share) => pool.run(share)));
  poolMs.push(performance.now() - started);
}
await pool.destroy();

const feasible = result.blocks.filter((block) => block.feasible).length;
const descents = result.blocks.reduce((sum, block) => sum + block.descents.length, 0);
const points = input.routes.map((route) => Math.round(resampleRoute(route.route.coordinates, 10).distanceM.length));
console.log(
  `${BLOCKS} blocks × ${TRIPS} trips (${tripCount} trips over routes of ${points.join('/')} points at 10 m, ${descents} descents assessed, ` +
    `${feasible} blocks feasible), ${runs} runs, load average before/after ${loadBefore.toFixed(1)}/${loadavg()[0]!.toFixed(1)} on ${availableParallelism()} cores\n`,
);
console.log('| run | threads | median ms | min ms | max ms |');
console.log('| --- | ---: | ---: | ---: | ---: |');
const e = stats(engineMs);
const p = stats(poolMs);
console.log(`| engine alone | 1 | ${e.median.toFixed(0)} | ${e.min.toFixed(0)} | ${e.max.toFixed(0)} |`);
console.log(`| worker pool | ${threads} | ${p.median.toFixed(0)} | ${p.min.toFixed(0)} | ${p.max.toFixed(0)} |`);
