/**
 * Writes the invented Highpass Valley demo GTFS feed with blocks to data/demo-gtfs.zip (what it
 * holds and why: api/demo/demo-gtfs.ts).
 *
 *   node --import tsx scripts/make-demo-gtfs.ts
 *
 * The output is deterministic; run it again when the demo routes or blocks change, and commit the
 * file (spec/api/demo/demo-gtfs.spec.ts checks it matches).
 */
import { writeFileSync } from 'node:fs';
import { DEMO_GTFS_FILE, demoGtfsFiles, demoGtfsZip } from '../api/demo/demo-gtfs';

writeFileSync(DEMO_GTFS_FILE, await demoGtfsZip());
const files = demoGtfsFiles();
console.log(`${DEMO_GTFS_FILE}: ${Object.keys(files).length} files, ${files['trips.txt']!.split('\n').length - 2} trips`);
