import JSZip from 'jszip';
import request from 'supertest';
import { afterAll, beforeEach, describe, expect, it } from 'vitest';
import { GTFS_LIMITS } from '../../../api/road-routes/gtfs-import';
import { gtfsBomb } from '../../../scripts/gtfs-bomb';
import { createTestContext } from '../../support/test-app';
import { sessionCookies } from '../../support/session-cookie';
import { countRows, truncateAll } from '../../support/test-database';

const context = createTestContext();
const { app, db } = context;
let planner: string;

beforeEach(async () => {
  await truncateAll(db);
  planner = await sessionCookies(db, context.deps.config)('planner');
});
afterAll(() => context.close());

describe('POST /api/routes/import-gtfs — bounds on a feed (issue 11)', () => {
  it('answers 413 naming shapes.txt and the per-file limit for a zip bomb, and creates nothing', async () => {
    const bomb = await gtfsBomb({ shapesBytes: GTFS_LIMITS.maxEntryBytes + 1024 * 1024 });

    const response = await upload(bomb, 'bomb.zip');

    expect(bomb.length).toBeLessThan(2 * 1024 * 1024);
    expect(response.status).toBe(413);
    expect(response.body.error.code).toBe('feed_too_large');
    expect(response.body.error.message).toMatch(/^shapes\.txt: unpacks to 257 MiB; the limit is 256 MiB per file$/);
    expect(await countRows(db, 'road_routes')).toBe(0);
  });

  it('answers 413 naming the feed and the limit when the archive holds too many entries', async () => {
    const zip = new JSZip();
    for (let i = 0; i <= GTFS_LIMITS.maxEntries; i++) zip.file(`extra-${i}.txt`, 'x\n');

    const response = await upload(await zip.generateAsync({ type: 'nodebuffer' }), 'crowded.zip');

    expect(response.status).toBe(413);
    expect(response.body.error.message).toBe(
      `crowded.zip: the archive holds ${GTFS_LIMITS.maxEntries + 1} entries; the limit is ${GTFS_LIMITS.maxEntries} entries`,
    );
  });

  it('answers 413 naming the file and its row limit when a file has too many rows', async () => {
    const limit = GTFS_LIMITS.maxRows['routes.txt'];
    const rows = Array.from({ length: limit + 1 }, (_, i) => `r${i},${i},Line ${i},3`).join('\n');
    const zip = await aValidFeedWith({ 'routes.txt': `route_id,route_short_name,route_long_name,route_type\n${rows}\n` });

    const response = await upload(zip, 'feed.zip');

    expect(response.status).toBe(413);
    expect(response.body.error.message).toBe(
      `routes.txt: has more than ${limit.toLocaleString('en')} rows; the limit is ${limit.toLocaleString('en')} rows`,
    );
    expect(response.body.error.details).toMatchObject({ file: 'routes.txt' });
  });

  it('still imports a feed zipped inside a folder, reading only what the routes need', async () => {
    const zip = await aValidFeedWith({}, 'feed/');

    const response = await upload(zip, 'feed.zip');

    expect(response.status).toBe(201);
    expect(response.body.items[0].stops).toHaveLength(2);
  });
});

// Helpers

function upload(content: Buffer, fileName: string) {
  return request(app).post('/api/routes/import-gtfs').set('Cookie', planner).attach('file', content, fileName);
}

/** A small valid feed: one route, a 1.1 km shape, two stops (unused stops and shapes beside them). */
async function aValidFeedWith(overrides: Record<string, string>, folder = ''): Promise<Buffer> {
  const files: Record<string, string> = {
    'routes.txt': 'route_id,route_short_name,route_long_name,route_type\nr1,1,Valley Line,3\n',
    'trips.txt': 'route_id,service_id,trip_id,direction_id,shape_id\nr1,all,t1,0,s1\n',
    'shapes.txt':
      'shape_id,shape_pt_lat,shape_pt_lon,shape_pt_sequence\ns1,46.50,9.00,1\ns1,46.51,9.00,2\nunused,46.6,9.1,1\nunused,46.7,9.1,2\n',
    'stops.txt': 'stop_id,stop_name,stop_lat,stop_lon\nA,Lower,46.50,9.00\nB,Upper,46.51,9.00\nZ,Elsewhere,46.9,9.9\n',
    'stop_times.txt': 'trip_id,arrival_time,departure_time,stop_id,stop_sequence\nt1,07:00:00,07:00:00,A,1\nt1,07:04:00,07:04:20,B,2\n',
    ...overrides,
  };
  const zip = new JSZip();
  for (const [name, text] of Object.entries(files)) zip.file(`${folder}${name}`, text);
  return zip.generateAsync({ type: 'nodebuffer' });
}
