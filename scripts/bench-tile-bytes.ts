// Bytes and colour error of the demo's terrain tiles as the server encodes them: renders the
// tiles the route editor and the scenario result show on the demo (or the z/x/y given), each as
// the tile kernel encodes it and as its exact RGB colours, and prints per tile and in total the
// PNG's bytes, the time to render and encode it, and how far its decoded pixels (pngjs) are from
// the exact colours: mean and worst difference per channel in levels of 255, over opaque pixels.
// Pixels that should be transparent (no model covers them) and are not, or the reverse, are
// counted apart. With BENCH_TILE_PNG=<folder> it also writes each tile (ours and the exact RGB)
// there, to look at them side by side.
//
//   node --import tsx scripts/bench-tile-bytes.ts [z/x/y …]
import { mkdirSync, rmSync, writeFileSync } from 'node:fs';
import { join, resolve } from 'node:path';
import { performance } from 'node:perf_hooks';
import { PNG } from 'pngjs';
import { makeDemoTerrainTiff } from '../api/demo/demo-terrain';
import { PyramidBuilder } from '../api/terrain/ingestion/terrain-pyramid';
import { inspectGeoTiff } from '../api/terrain/ingestion/geotiff-inspection';
import { BlockStore } from '../api/terrain/raster/block-store';
import type { ReadyTerrain } from '../api/terrain/terrain-runtime';
import { renderTilePng, sampleTileElevations, shadeAndTint, TILE_ENCODING } from '../api/terrain/tiles/tile-kernel.mjs';
import { terrainTileTask, transparentTile } from '../api/terrain/tiles/tile-renderer';

/**
 * The tiles the demo's route editor (its first route) and scenario result (its first computed
 * scenario) load on a first visit, as `scripts/bench-page-weight.ts` with BENCH_FILES=1 lists them.
 */
const DEMO_TILES = [
  '10/541/362',
  '10/542/362',
  '11/1083/722',
  '11/1083/723',
  '11/1083/724',
  '11/1084/722',
  '11/1084/723',
  '11/1084/724',
  '12/2166/1446',
  '12/2166/1447',
  '12/2166/1448',
  '12/2167/1446',
  '12/2167/1447',
  '12/2167/1448',
  '12/2168/1446',
  '12/2168/1447',
  '12/2168/1448',
  '12/2169/1446',
  '12/2169/1447',
  '12/2169/1448',
];

const dir = resolve('.var/bench-tile-bytes');
const tiles = process.argv.length > 2 ? process.argv.slice(2) : DEMO_TILES;
const pngFolder = process.env['BENCH_TILE_PNG'];

rmSync(dir, { recursive: true, force: true });
mkdirSync(join(dir, 'overviews'), { recursive: true });
const tiffPath = join(dir, 'demo.tif');
writeFileSync(tiffPath, makeDemoTerrainTiff());
const header = await inspectGeoTiff(tiffPath, { maxPixels: 1e9, maxBlockBytes: 64 * 1024 * 1024 });
const ring = header.footprint.coordinates[0]!;
const model: ReadyTerrain = {
  id: 'demo',
  version: 'v1',
  name: 'demo',
  path: tiffPath,
  overviewDir: join(dir, 'overviews'),
  widthPx: header.widthPx,
  heightPx: header.heightPx,
  blockWidthPx: header.blockWidthPx,
  blockHeightPx: header.blockHeightPx,
  originX: header.originX,
  originY: header.originY,
  pixelSizeX: header.pixelSizeX,
  pixelSizeY: header.pixelSizeY,
  resolutionM: header.resolutionM,
  proj4Definition: header.crs.proj4Definition,
  isGeographic: header.crs.isGeographic,
  nodata: header.nodata,
  dataType: header.dataType,
  verticalScaleToM: header.verticalScaleToM,
  overviews: [],
  bbox: [
    Math.min(...ring.map((p) => p[0]!)),
    Math.min(...ring.map((p) => p[1]!)),
    Math.max(...ring.map((p) => p[0]!)),
    Math.max(...ring.map((p) => p[1]!)),
  ],
};

// The reduced pyramid, as ingestion builds it.
const blocks = new BlockStore({ cacheBytes: 256 * 1024 * 1024, threads: 1 });
const pyramid = await PyramidBuilder.create(model.overviewDir, model.widthPx, model.heightPx);
for (let row = 0; row < model.heightPx; row += 512) {
  const rows = Math.min(512, model.heightPx - row);
  await pyramid.addRows(await blocks.window(model, [0, row, model.widthPx, row + rows]), rows);
}
model.overviews = await pyramid.finish();
if (pngFolder) mkdirSync(pngFolder, { recursive: true });

console.log(`tile encoding ${TILE_ENCODING}; ${tiles.length} tiles of the demo model`);
console.log('| tile | bytes | render + encode | mean error | worst error | wrong transparency |');
console.log('| --- | ---: | ---: | ---: | ---: | ---: |');
let totalBytes = 0;
let totalError = 0;
let totalChannels = 0;
let worstError = 0;
let wrongAlpha = 0;
for (const tile of tiles) {
  const [z, x, y] = tile.split('/').map(Number) as [number, number, number];
  const prepared = await terrainTileTask(blocks, [model], z, x, y);
  if (prepared === null || prepared === 'empty') {
    const bytes = transparentTile().length;
    totalBytes += bytes;
    console.log(`| ${tile} | ${bytes} | — | — | — | — |`);
    continue;
  }
  const { task } = prepared;
  // Twice: the first call compiles the kernel.
  renderTilePng(task);
  const start = performance.now();
  const png = renderTilePng(task);
  const ms = performance.now() - start;
  const exact = shadeAndTint(sampleTileElevations(task.layers), task.cellSizeM, task.sun, task.stops, task.shadowFloor, task.shadeGain);
  const decoded = PNG.sync.read(Buffer.from(png));
  let sum = 0;
  let opaque = 0;
  let worst = 0;
  let wrong = 0;
  for (let k = 0; k < 256 * 256; k++) {
    const empty = (exact[3 * k]! | exact[3 * k + 1]! | exact[3 * k + 2]!) === 0;
    if (decoded.data[4 * k + 3] !== (empty ? 0 : 255)) wrong++;
    if (empty) continue;
    opaque++;
    for (let c = 0; c < 3; c++) {
      const error = Math.abs(decoded.data[4 * k + c]! - exact[3 * k + c]!);
      sum += error;
      if (error > worst) worst = error;
    }
  }
  totalBytes += png.length;
  totalError += sum;
  totalChannels += 3 * opaque;
  worstError = Math.max(worstError, worst);
  wrongAlpha += wrong;
  console.log(`| ${tile} | ${png.length} | ${ms.toFixed(1)} ms | ${(sum / (3 * opaque)).toFixed(2)} | ${worst} | ${wrong} |`);
  if (pngFolder) {
    const name = tile.replaceAll('/', '-');
    writeFileSync(join(pngFolder, `${name}-tile.png`), png);
    const rgba = new PNG({ width: 256, height: 256 });
    for (let k = 0; k < 256 * 256; k++) {
      rgba.data[4 * k] = exact[3 * k]!;
      rgba.data[4 * k + 1] = exact[3 * k + 1]!;
      rgba.data[4 * k + 2] = exact[3 * k + 2]!;
      rgba.data[4 * k + 3] = (exact[3 * k]! | exact[3 * k + 1]! | exact[3 * k + 2]!) === 0 ? 0 : 255;
    }
    writeFileSync(join(pngFolder, `${name}-exact.png`), PNG.sync.write(rgba));
  }
}
await blocks.close();
console.log(
  `total ${(totalBytes / 1000).toFixed(1)} kB; mean error ${(totalError / totalChannels).toFixed(2)} levels of 255 per channel, ` +
    `worst ${worstError}; ${wrongAlpha} pixels with the wrong transparency`,
);
