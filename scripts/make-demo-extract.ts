// Writes the invented Korvel valley demo region as an OpenStreetMap extract (OSM XML), the file
// the demo seed imports, and as .osm.pbf when osmium-tool (Debian) is installed. Deterministic.
//
//   node --import tsx scripts/make-demo-extract.ts [out-dir]     (default .var/demo)
import { spawnSync } from 'node:child_process';
import { mkdirSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { demoOsmExtractXml } from '../api/demo/demo-osm-extract';

const outDir = process.argv[2] ?? '.var/demo';
mkdirSync(outDir, { recursive: true });
const xmlPath = join(outDir, 'korvel-valley.osm');
writeFileSync(xmlPath, demoOsmExtractXml());
console.log(`Wrote ${xmlPath}`);
const pbfPath = join(outDir, 'korvel-valley.osm.pbf');
const osmium = spawnSync('osmium', ['cat', '--overwrite', xmlPath, '-o', pbfPath], { stdio: 'inherit' });
if (osmium.status === 0) console.log(`Wrote ${pbfPath}`);
else console.log('osmium-tool is not installed: no .osm.pbf written (apt-get install osmium-tool)');
