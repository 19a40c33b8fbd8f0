/**
 * Memory peak of the GTFS import on hostile feeds: `node --import tsx scripts/bench-gtfs-bomb.ts`.
 *
 * Builds four feeds once into .var/bench/ (a 1 GiB zip bomb: shapes.txt of one row repeated,
 * about 2.5 MB zipped; a 450 MB shapes.txt; and two of 250 MiB, just under the per-file limit, so
 * that they are streamed until a row bound stops them: one whose rows all belong to the route's
 * shape, one whose rows belong to a shape no trip uses), then imports each in a fresh Node process through the
 * same function the API's POST /api/routes/import-gtfs calls, and prints the process's peak
 * resident memory (getrusage maxrss), its resident memory just before the import, the time taken
 * and the outcome. Run it on an older checkout to compare.
 */
import { spawnSync } from 'node:child_process';
import { existsSync, mkdirSync, readFileSync, statSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';

const MIB = 1024 * 1024;
const CASES = [
  { label: 'zip bomb, shapes.txt unpacks to 1 GiB', file: 'gtfs-bomb-1gib.zip', shapesBytes: 1024 * MIB },
  { label: 'shapes.txt unpacks to 450 MB', file: 'gtfs-bomb-450mb.zip', shapesBytes: 450 * 1000 * 1000 },
  { label: 'shapes.txt of 250 MiB, all on the route’s shape', file: 'gtfs-bomb-250mib.zip', shapesBytes: 250 * MIB },
  {
    label: 'shapes.txt of 250 MiB, all on a shape no trip uses',
    file: 'gtfs-bomb-250mib-unused.zip',
    shapesBytes: 250 * MIB,
    shapeId: 'unused' as const,
  },
];
const benchDir = join(fileURLToPath(new URL('..', import.meta.url)), '.var', 'bench');

if (process.argv[2] === '--child') {
  await child(process.argv[3]!);
} else {
  await parent();
}

async function parent(): Promise<void> {
  mkdirSync(benchDir, { recursive: true });
  const { gtfsBomb } = await import('./gtfs-bomb');
  console.log('| feed | zip size | outcome | peak RSS | RSS before import | time |');
  console.log('| --- | ---: | --- | ---: | ---: | ---: |');
  for (const feed of CASES) {
    const path = join(benchDir, feed.file);
    if (!existsSync(path)) writeFileSync(path, await gtfsBomb({ shapesBytes: feed.shapesBytes, shapeId: feed.shapeId }));
    // A fresh process per feed, so one feed's peak does not hide the next one's.
    const run = spawnSync(process.execPath, ['--import', 'tsx', fileURLToPath(import.meta.url), '--child', path], {
      encoding: 'utf8',
      maxBuffer: 16 * MIB,
    });
    const line = run.stdout.trim().split('\n').at(-1) ?? '';
    let result: { outcome: string; peakMb: number; beforeMb: number; seconds: number };
    try {
      result = JSON.parse(line);
    } catch {
      // The import killed its process (out of memory): the outcome is the exit and the peak unknown.
      result = {
        outcome:
          `process died (exit ${run.status ?? run.signal}): ${run.stderr.split('\n').find((l) => /heap|memory/i.test(l)) ?? ''}`.trim(),
        peakMb: NaN,
        beforeMb: NaN,
        seconds: NaN,
      };
    }
    const kb = Math.round(statSync(path).size / 1024);
    console.log(
      `| ${feed.label} | ${kb} kB | ${result.outcome} | ${result.peakMb.toFixed(0)} MB | ${result.beforeMb.toFixed(0)} MB | ${result.seconds.toFixed(1)} s |`,
    );
  }
}

async function child(path: string): Promise<void> {
  const { gtfsToDrafts } = await import('../api/road-routes/gtfs-import');
  const data = readFileSync(path);
  const beforeMb = process.memoryUsage().rss / MIB;
  const started = performance.now();
  let outcome: string;
  try {
    const { drafts } = await gtfsToDrafts('feed.zip', data);
    outcome = `imported ${drafts.length} route(s)`;
  } catch (error) {
    const status = (error as { status?: number }).status;
    outcome = `${status ?? 'error'}: ${error instanceof Error ? error.message : String(error)}`.slice(0, 140);
  }
  const seconds = (performance.now() - started) / 1000;
  const peakMb = process.resourceUsage().maxRSS / 1024;
  console.log(JSON.stringify({ outcome, peakMb, beforeMb, seconds }));
}
