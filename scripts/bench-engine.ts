/**
 * Benchmark of the calculation engine: full analysis (resampling, smoothing, speed profile,
 * forces, battery, brake heat, descents with both advice solvers, and the safety-grade
 * assessment of every descent: the worst credible case run over the whole route with its own
 * advice solve, and the sensitivity replays) of synthetic mountain routes with elevations given,
 * at 10 m spacing. Prints a markdown table of median and spread over N runs; the columns
 * "with worst case" and "sensitivity rows" count what each timed analysis carried, so a table that
 * leaves the safety work out cannot pass for one that includes it. Target: under 50 ms median
 * for 50 km.
 *
 *   node --import tsx scripts/bench-engine.ts [runs]
 */
import { analyseRoute, presetVehicle } from '../shared/engine/index';
import type { PreviewRequestInput } from '../shared/domain/analysis';

const runs = Number(process.argv[2] ?? 25);

/** A winding route eastwards at 46.5° N with a valley–pass–valley elevation profile. */
function syntheticRoute(lengthKm: number): PreviewRequestInput {
  const vertexSpacingM = 49.9; // just under 5 × 10 m, so each leg splits into 5 pieces
  const vertices = Math.round((lengthKm * 1_000) / vertexSpacingM);
  const metresPerDegLat = 111_200;
  const metresPerDegLon = 111_320 * Math.cos((46.5 * Math.PI) / 180);
  const coordinates: [number, number, number][] = [];
  let x = 0;
  let y = 0;
  for (let i = 0; i <= vertices; i++) {
    const s = i * vertexSpacingM;
    // Winding: heading swings ±35° with a 1.2 km period (curves of a few hundred metres radius).
    const heading = 0.6 * Math.sin((2 * Math.PI * s) / 1_200);
    if (i > 0) {
      x += vertexSpacingM * Math.cos(heading);
      y += vertexSpacingM * Math.sin(heading);
    }
    // Climbs of ~600 m over 12.5 km then descents, with shorter undulations and DEM-like noise.
    const z = 900 + 600 * Math.sin((2 * Math.PI * s) / 25_000) + 40 * Math.sin((2 * Math.PI * s) / 1_700) + 2 * Math.sin(i * 12.9898);
    coordinates.push([8 + x / metresPerDegLon, 46.5 + y / metresPerDegLat, z]);
  }
  const lengthM = lengthKm * 1_000;
  const stops = [];
  for (let at = 600; at < lengthM - 300; at += 600) stops.push({ atM: at, dwellS: 20 });
  return {
    route: { type: 'LineString', coordinates },
    vehicle: presetVehicle('battery-bus-12m', 'full', 'winter'),
    conditions: { ambientC: 5, startSoc: 0.9 },
    options: { spacingM: 10, speedLimitKph: 50, stops },
  };
}

function median(values: number[]): number {
  const sorted = [...values].sort((a, b) => a - b);
  const mid = sorted.length >> 1;
  return sorted.length % 2 ? sorted[mid]! : 0.5 * (sorted[mid - 1]! + sorted[mid]!);
}

async function main(): Promise<void> {
  const lines = [
    '| route | points | descents | with worst case | sensitivity rows | median ms | min ms | max ms | µs per point |',
    '| --- | ---: | ---: | ---: | ---: | ---: | ---: | ---: | ---: |',
  ];
  for (const lengthKm of [1, 10, 50, 200]) {
    const request = syntheticRoute(lengthKm);
    const first = await analyseRoute(request); // warm-up, and the shape of the result
    for (let i = 0; i < 3; i++) await analyseRoute(request);
    const times: number[] = [];
    const count = lengthKm >= 200 ? Math.max(5, Math.round(runs / 3)) : runs;
    for (let i = 0; i < count; i++) {
      const start = performance.now();
      await analyseRoute(request);
      times.push(performance.now() - start);
    }
    const points = first.profile.distanceM.length;
    const med = median(times);
    const withWorstCase = first.descents.filter((descent) => descent.worstCase !== undefined).length;
    const sensitivityRows = first.descents.reduce((sum, descent) => sum + (descent.sensitivity?.length ?? 0), 0);
    lines.push(
      `| ${lengthKm} km | ${points} | ${first.descents.length} | ${withWorstCase} | ${sensitivityRows} | ${med.toFixed(2)} | ${Math.min(...times).toFixed(2)} | ${Math.max(...times).toFixed(2)} | ${((med * 1_000) / points).toFixed(2)} |`,
    );
  }
  const { loadavg } = await import('node:os');
  console.log(
    `Engine benchmark, ${runs} runs per route (200 km: fewer), Node ${process.version}, load average ${loadavg()
      .map((v) => v.toFixed(1))
      .join(' ')}\n`,
  );
  console.log(lines.join('\n'));
}

await main();
