/**
 * Where a first visit's code bytes come from, package by package:
 * `node --import tsx scripts/page-weight-floor.ts` (runs its own `ng build --stats-json` into a
 * scratch folder; about half a minute).
 *
 * For the route editor and the scenario result, it follows esbuild's record of the build (the
 * metafile Angular writes as stats.json): the scripts index.html loads, then the page's own lazy
 * chunks and everything they import statically. Code a page loads later (a `@defer` block, a
 * dialog) is left out, so the figures are a lower bound of what the page needs before it can
 * show anything. Each chunk is compressed as the server sends it (brotli quality 11,
 * scripts/precompress-web.mjs) and its compressed size is shared out among the packages in it
 * in proportion to their bytes in the chunk. The fonts are the files index.html preloads and the
 * icon font, as they travel (woff2 is compressed already). HTTP headers, map tiles and API
 * answers are not counted here; scripts/bench-page-weight.ts measures the whole visit.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, readdirSync, rmSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { brotliForWeb } from './precompress-web.mjs';

interface MetafileOutput {
  bytes: number;
  entryPoint?: string;
  imports: { path: string; kind: string }[];
  inputs: Record<string, { bytesInOutput: number }>;
}

/** The lazy chunks each page's route loads as the router matches it (shell, page, and the editor's map). */
const PAGES: Record<string, string[]> = {
  'route editor': ['web/app/shell/shell.ts', 'web/app/road-routes/route-editor.ts', 'web/app/map/terrain-map.ts'],
  'scenario result': ['web/app/shell/shell.ts', 'web/app/scenarios/scenario-result.ts'],
};

/** Packages named on their own in the table; the rest are summed as "other packages". */
const GROUPS: [label: string, test: RegExp][] = [
  ['@angular/core, common, platform-browser', /^node_modules\/@angular\/(core|common|platform-browser)\//],
  ['@angular/router', /^node_modules\/@angular\/router\//],
  ['@angular/forms', /^node_modules\/@angular\/forms\//],
  ['@angular/material and cdk', /^node_modules\/@angular\/(material|cdk)\//],
  ['rxjs, tslib', /^node_modules\/(rxjs|tslib)\//],
  ['leaflet', /^node_modules\/leaflet\//],
  [
    'base-map renderer (protomaps-leaflet and its parts)',
    /^node_modules\/(protomaps-leaflet|@protomaps|pmtiles|pbf|rbush|quickselect|@mapbox|color2k|fflate|potpack)\//,
  ],
  ['chart.js and ng2-charts', /^node_modules\/(chart\.js|ng2-charts|@kurkle|es-toolkit)\//],
  ['zod', /^node_modules\/zod\//],
  ['@turf', /^node_modules\/@turf\//],
  ['other packages', /^node_modules\//],
  ["the app's own code (web/, shared/)", /./],
];

const scratch = mkdtempSync(join(tmpdir(), 'page-weight-floor-'));
try {
  const build = spawnSync('npx', ['ng', 'build', '--stats-json', '--output-path', scratch], { encoding: 'utf8' });
  if (build.status !== 0) throw new Error(`ng build failed:\n${build.stdout}${build.stderr}`);
  const outputs = (JSON.parse(readFileSync(join(scratch, 'stats.json'), 'utf8')) as { outputs: Record<string, MetafileOutput> }).outputs;
  const browser = join(scratch, 'browser');
  // The modulepreload and font hints of the shipped index.html (npm run build:web adds them).
  const preload = spawnSync(process.execPath, ['scripts/preload-web.mjs', browser], { encoding: 'utf8' });
  if (preload.status !== 0) throw new Error(`preload-web failed:\n${preload.stdout}${preload.stderr}`);
  const index = readFileSync(join(browser, 'index.html'), 'utf8');

  const byEntry = new Map(
    Object.entries(outputs).flatMap(([path, output]) => (output.entryPoint ? [[output.entryPoint, path] as const] : [])),
  );
  // What index.html loads: main and the scripts it preloads (main's imports and the application's).
  const byName = new Map(Object.keys(outputs).map((path) => [path.split('/').pop()!, path]));
  const initial = [...index.matchAll(/<link rel="modulepreload" href="([^"]+)">|<script[^>]* src="([^"]+\.js)"|\['(main-[A-Z0-9]+\.js)'/g)]
    .map((match) => byName.get(match[1] ?? match[2] ?? match[3]!))
    .filter((path): path is string => path !== undefined);
  if (!initial.some((path) => /(^|\/)main-[A-Z0-9]+\.js$/.test(path))) throw new Error('index.html loads no main-*.js');

  const fonts = [...index.matchAll(/<link rel="preload" as="font"[^>]* href="([^"]+)"/g)].map((match) => match[1]!);
  const iconFont = readdirSync(join(browser, 'media')).find((name) => name.startsWith('material-symbols') && name.endsWith('.woff2'));
  const fontBytes = [...fonts, ...(iconFont ? [`media/${iconFont}`] : [])].reduce(
    (sum, name) => sum + statSync(join(browser, name)).size,
    0,
  );
  const stylesheet = /href="(styles-[A-Z0-9]+\.css)"/.exec(index)?.[1];
  const styleBytes = brotli(Buffer.from(index)) + (stylesheet ? brotli(readFileSync(join(browser, stylesheet))) : 0);

  for (const [page, entries] of Object.entries(PAGES)) {
    const chunks = new Set<string>();
    for (const start of [...initial, ...entries.map((entry) => byEntry.get(entry) ?? missing(entry))])
      addWithImports(start, outputs, chunks);
    const shares = new Map<string, number>(GROUPS.map(([label]) => [label, 0]));
    for (const chunk of chunks) {
      const output = outputs[chunk]!;
      const compressed = brotli(readFileSync(join(browser, chunk.split('/').pop()!)));
      const total = Object.values(output.inputs).reduce((sum, input) => sum + input.bytesInOutput, 0) || 1;
      for (const [input, { bytesInOutput }] of Object.entries(output.inputs)) {
        const label = GROUPS.find(([, test]) => test.test(input))![0];
        shares.set(label, shares.get(label)! + (compressed * bytesInOutput) / total);
      }
    }
    const own = shares.get("the app's own code (web/, shared/)")!;
    const code = [...shares.values()].reduce((sum, bytes) => sum + bytes, 0);
    console.log(`\n${page}: ${chunks.size} scripts`);
    console.log('| part | kB on the wire |\n| --- | ---: |');
    for (const [label, bytes] of shares) if (bytes > 0) console.log(`| ${label} | ${kb(bytes)} |`);
    console.log(`| fonts (three Noto Sans faces and the icon font) | ${kb(fontBytes)} |`);
    console.log(`| index.html and the stylesheet | ${kb(styleBytes)} |`);
    console.log(`| **before the app's own code, tiles and API answers** | **${kb(code - own + fontBytes + styleBytes)}** |`);
    console.log(`| **all of the above** | **${kb(code + fontBytes + styleBytes)}** |`);
  }
} finally {
  rmSync(scratch, { recursive: true, force: true });
}

function addWithImports(path: string, outputs: Record<string, MetafileOutput>, seen: Set<string>): void {
  if (seen.has(path) || !outputs[path]) return;
  seen.add(path);
  for (const imported of outputs[path].imports) if (imported.kind === 'import-statement') addWithImports(imported.path, outputs, seen);
}

function missing(entry: string): never {
  throw new Error(`${entry} is not a lazy chunk of the build: update PAGES in scripts/page-weight-floor.ts`);
}

function brotli(content: Buffer): number {
  return brotliForWeb(content).length;
}

function kb(bytes: number): string {
  return `${(bytes / 1000).toFixed(1)} kB`;
}
