// Writes the invented demo region's elevation model (Korvel valley, 20 m, UTM 32N) as a tiled
// DEFLATE GeoTIFF, and its pass road as GeoJSON. Deterministic; no GDAL needed.
//
//   node --import tsx scripts/make-demo-terrain.ts [out-dir]     (default .var/demo)
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { DEMO_ROADS, makeDemoTerrainTiff } from '../api/demo/demo-terrain';

const outDir = process.argv[2] ?? '.var/demo';
mkdirSync(outDir, { recursive: true });
const tiffPath = join(outDir, 'korvel-valley-20m.tif');
writeFileSync(tiffPath, makeDemoTerrainTiff());
const roadsPath = join(outDir, 'demo-roads.geojson');
writeFileSync(
  roadsPath,
  JSON.stringify(
    {
      type: 'FeatureCollection',
      features: DEMO_ROADS.map((road) => ({
        type: 'Feature',
        properties: { id: road.id, name: road.name, elevationsM: road.elevationsM, gradesPercent: road.gradesPercent },
        geometry: { type: 'LineString', coordinates: road.coordinates },
      })),
    },
    null,
    2,
  ),
);
console.log(`Wrote ${tiffPath} and ${roadsPath}`);
