import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { VectorTile } from '@mapbox/vector-tile';
import Protobuf from 'pbf';
import request from 'supertest';
import { afterAll, afterEach, beforeAll, describe, expect, it } from 'vitest';
import { waitForInlineBasemapJobs } from '../../../api/basemap/basemap-service';
import { createTestContext, signedInAgent, type TestContext } from '../../support/test-app';
import { truncateAll } from '../../support/test-database';
import {
  GERMAN_VILLAGE_OSM,
  SOMES_ISLAND_PBF,
  WEST_OAKLAND_BZ2,
  importExtract,
  ogrCount,
  requireExtract,
  westOaklandXml,
} from './support/osm-extracts';

/** Our road classes as highway values (the style's ROAD_CLASSES), for the same count in GDAL. */
const HIGHWAYS = [
  'motorway',
  'motorway_link',
  'trunk',
  'trunk_link',
  'primary',
  'primary_link',
  'secondary',
  'secondary_link',
  'tertiary',
  'tertiary_link',
  'unclassified',
  'residential',
  'living_street',
  'road',
  'service',
  'busway',
  'bus_guideway',
  'track',
  'pedestrian',
  'footway',
  'cycleway',
  'path',
  'bridleway',
  'steps',
];
const PLACES = [
  'city',
  'town',
  'village',
  'hamlet',
  'suburb',
  'quarter',
  'neighbourhood',
  'locality',
  'isolated_dwelling',
  'island',
  'islet',
];
const inList = (values: string[]) => values.map((value) => `'${value}'`).join(', ');

describe('base map (OpenStreetMap extracts)', () => {
  let context: TestContext;
  let scratch: ReturnType<typeof westOaklandXml>;

  beforeAll(() => {
    context = createTestContext();
    scratch = westOaklandXml();
  });
  afterEach(async () => {
    await waitForInlineBasemapJobs(context.deps);
    await truncateAll(context.db);
  });
  afterAll(async () => {
    scratch.remove();
    await context.close();
  });

  describe('POST /api/basemap', () => {
    it('refuses a file that is not an OpenStreetMap extract with 415, storing nothing', async () => {
      const { agent } = await signedInAgent(context.app, context.db, 'analyst');
      const notOsm = join(scratch.path, '..', 'roads.osm.pbf');
      writeFileSync(notOsm, '{"type":"FeatureCollection","features":[]}');

      const response = await agent.post('/api/basemap').attach('file', notOsm);

      expect(response.status).toBe(415);
      expect(response.body.error.code).toBe('not_osm');
      expect(response.body.error.message).toMatch(/roads\.osm\.pbf.*not an OpenStreetMap extract/);
      expect((await agent.get('/api/basemap')).body.items).toEqual([]);
    });

    it('refuses planners: only analysts and administrators import extracts', async () => {
      const { agent } = await signedInAgent(context.app, context.db, 'planner');

      const response = await agent.post('/api/basemap').attach('file', requireExtract(GERMAN_VILLAGE_OSM));

      expect(response.status).toBe(403);
    });

    it('imports West Oakland (OSM XML) with the road and place counts GDAL reads in the same file', async () => {
      const { agent } = await signedInAgent(context.app, context.db, 'analyst');

      const { item, list } = await importExtract(agent, context.deps, scratch.path, 'west-oakland.osm');

      // GDAL's OSM driver (ogrinfo, Debian's gdal-bin) on the same file: ways with a highway tag
      // in our classes that are lines (not areas), and named places.
      expect(item['roadCount']).toBe(ogrCount(scratch.path, `SELECT COUNT(*) FROM lines WHERE highway IN (${inList(HIGHWAYS)})`));
      expect(item['roadCount']).toBeGreaterThan(30);
      const places =
        ogrCount(scratch.path, `SELECT COUNT(*) FROM points WHERE place IN (${inList(PLACES)}) AND name IS NOT NULL`) +
        ogrCount(scratch.path, `SELECT COUNT(*) FROM multipolygons WHERE place IN (${inList(PLACES)}) AND name IS NOT NULL`);
      expect(item['placeCount']).toBe(places);
      expect(item['active']).toBe(true);
      expect(item['graphEdgeCount']).toBeGreaterThan(0);
      const [west, south, east, north] = item['bbox'] as number[];
      expect(west).toBeGreaterThan(-122.31);
      expect(east).toBeLessThan(-122.28);
      expect(south).toBeGreaterThan(37.8);
      expect(north).toBeLessThan(37.82);
      expect(list.tilesVersion).toMatch(/^[0-9a-f]{16}$/);
    });

    it('imports Somes Island (.osm.pbf) with the place, landuse and water counts GDAL reads in the same file', async () => {
      const { agent } = await signedInAgent(context.app, context.db, 'admin');
      const file = requireExtract(SOMES_ISLAND_PBF);

      const { item } = await importExtract(agent, context.deps, file);

      const places =
        ogrCount(file, `SELECT COUNT(*) FROM points WHERE place IN (${inList(PLACES)}) AND name IS NOT NULL`) +
        ogrCount(file, `SELECT COUNT(*) FROM multipolygons WHERE place IN (${inList(PLACES)}) AND name IS NOT NULL`);
      expect(item['placeCount']).toBe(places);
      expect(item['placeCount']).toBeGreaterThan(0);
      // Woods, grassland and bare rock: our landuse classes from natural=*.
      const landuse = ogrCount(
        file,
        `SELECT COUNT(*) FROM multipolygons WHERE natural IN ('wood', 'scrub', 'heath', 'grassland', 'bare_rock', 'scree', 'wetland', 'beach', 'sand', 'glacier') OR landuse IN ('farmyard', 'farmland', 'forest', 'meadow', 'grass', 'residential')`,
      );
      expect(item['landuseCount']).toBe(landuse);
      expect(item['roadCount']).toBe(ogrCount(file, `SELECT COUNT(*) FROM lines WHERE highway IN (${inList(HIGHWAYS)})`));
    });

    it('reads bzip2-compressed OSM XML as published, with the same counts as the plain file', async () => {
      const { agent } = await signedInAgent(context.app, context.db, 'analyst');

      const { item } = await importExtract(agent, context.deps, requireExtract(WEST_OAKLAND_BZ2));

      expect(item['roadCount']).toBe(ogrCount(scratch.path, `SELECT COUNT(*) FROM lines WHERE highway IN (${inList(HIGHWAYS)})`));
    });

    it('keeps the old extract serving while a new one imports, and switches when it is ready', async () => {
      const { agent } = await signedInAgent(context.app, context.db, 'analyst');
      const first = await importExtract(agent, context.deps, scratch.path, 'west-oakland.osm');
      const oldVersion = first.list.tilesVersion as string;
      const oldTile = await agent.get(`/api/tiles/base/16/10503/25323.pbf?v=${oldVersion}`).buffer(true).parse(binary);

      const upload = await agent.post('/api/basemap').attach('file', requireExtract(GERMAN_VILLAGE_OSM));
      expect(upload.status).toBe(202);
      const during = await agent.get('/api/basemap');
      const duringTile = await agent.get(`/api/tiles/base/16/10503/25323.pbf`).buffer(true).parse(binary);
      await waitForInlineBasemapJobs(context.deps);
      const after = await agent.get('/api/basemap');

      expect(['queued', 'importing']).toContain(during.body.items.find((item: { id: string }) => item.id === upload.body.id).status);
      expect(during.body.tilesVersion).toBe(oldVersion);
      expect(decode(duringTile.body).layers['roads']?.length).toBe(decode(oldTile.body).layers['roads']?.length);
      expect(after.body.tilesVersion).not.toBe(oldVersion);
      const active = after.body.items.filter((item: { active: boolean }) => item.active);
      expect(active.map((item: { id: string }) => item.id)).toEqual([upload.body.id]);
      // The old import's tiles are gone from the new version: West Oakland is empty now.
      const newTile = await agent.get(`/api/tiles/base/16/10503/25323.pbf?v=${after.body.tilesVersion}`).buffer(true).parse(binary);
      expect(newTile.body.length).toBe(0);
    });

    it('records a failed import with the reason and leaves the active extract serving', async () => {
      const { agent } = await signedInAgent(context.app, context.db, 'analyst');
      const first = await importExtract(agent, context.deps, scratch.path, 'west-oakland.osm');
      const broken = join(scratch.path, '..', 'broken.osm');
      writeFileSync(broken, '<?xml version="1.0"?>\n<osm version="0.6">\n<node id="1" lat="37.8" lon="-122.3">\n<way id="oops"');

      const upload = await agent.post('/api/basemap').attach('file', broken);
      await waitForInlineBasemapJobs(context.deps);
      const list = await agent.get('/api/basemap');

      expect(upload.status).toBe(202);
      const failed = list.body.items.find((item: { id: string }) => item.id === upload.body.id);
      expect(failed.status).toBe('failed');
      expect(failed.error).toMatch(/osm2pgsql could not import the file/);
      expect(list.body.tilesVersion).toBe(first.list.tilesVersion);
      const tile = await agent.get(`/api/tiles/base/16/10503/25323.pbf`).buffer(true).parse(binary);
      expect(decode(tile.body).layers['roads']?.length).toBeGreaterThan(0);
    });
  });

  describe('GET /api/tiles/base/{z}/{x}/{y}.pbf', () => {
    it('serves a Mapbox Vector Tile that a general-purpose decoder reads, with classed roads, landuse and named places', async () => {
      const { agent } = await signedInAgent(context.app, context.db, 'analyst');
      const { list } = await importExtract(agent, context.deps, requireExtract(SOMES_ISLAND_PBF));
      const { agent: planner } = await signedInAgent(context.app, context.db, 'planner');
      const [x, y] = tileOf(174.865, -41.256, 14);

      const response = await planner.get(`/api/tiles/base/14/${x}/${y}.pbf?v=${list.tilesVersion}`).buffer(true).parse(binary);

      expect(response.status).toBe(200);
      expect(response.headers['content-type']).toBe('application/vnd.mapbox-vector-tile');
      expect(response.headers['cache-control']).toContain('immutable');
      const tile = decode(response.body);
      expect(Object.keys(tile.layers).sort()).toEqual(['landuse', 'places', 'roads']);
      const roads = features(tile, 'roads');
      expect(roads.length).toBeGreaterThan(0);
      expect(roads.every((feature) => feature.type === 2 && typeof feature.properties['class'] === 'string')).toBe(true);
      const landuse = features(tile, 'landuse');
      expect(landuse.map((feature) => feature.properties['class'])).toEqual(expect.arrayContaining(['forest', 'rock']));
      expect(landuse.every((feature) => feature.type === 3)).toBe(true);
      const places = features(tile, 'places');
      expect(places.length).toBeGreaterThan(0);
      expect(places.every((feature) => typeof feature.properties['name'] === 'string' && feature.type === 1)).toBe(true);
    });

    it('draws roads closed to buses (private service roads) and marks them so', async () => {
      const { agent } = await signedInAgent(context.app, context.db, 'analyst');
      await importExtract(agent, context.deps, requireExtract(GERMAN_VILLAGE_OSM));
      const [x, y] = tileOf(10.0695, 48.136, 15);

      const tile = decode((await agent.get(`/api/tiles/base/15/${x}/${y}.pbf`).buffer(true).parse(binary)).body);

      const roads = features(tile, 'roads');
      expect(new Set(roads.map((feature) => feature.properties['class']))).toEqual(new Set(['minor', 'service', 'track']));
      expect(roads.find((feature) => feature.properties['name'] === 'Goethestraße')?.properties['bus']).toBe(true);
      const service = roads.filter((feature) => feature.properties['class'] === 'service');
      expect(service.length).toBe(8);
      expect(service.filter((feature) => feature.properties['bus'] === false).length).toBe(
        ogrCount(
          GERMAN_VILLAGE_OSM,
          'SELECT COUNT(*) FROM lines WHERE highway = \'service\' AND other_tags LIKE \'%"access"=>"private"%\'',
        ),
      );
    });

    it('carries named places and leaves minor roads out at small scales', async () => {
      const { agent } = await signedInAgent(context.app, context.db, 'analyst');
      await importExtract(agent, context.deps, requireExtract(SOMES_ISLAND_PBF));
      const [x14, y14] = tileOf(174.865, -41.256, 14);
      const [x9, y9] = tileOf(174.865, -41.256, 9);

      const close = decode((await agent.get(`/api/tiles/base/14/${x14}/${y14}.pbf`).buffer(true).parse(binary)).body);
      const far = decode((await agent.get(`/api/tiles/base/9/${x9}/${y9}.pbf`).buffer(true).parse(binary)).body);

      const places = features(close, 'places');
      expect(places.length).toBeGreaterThan(0);
      expect(places.every((feature) => typeof feature.properties['name'] === 'string' && feature.type === 1)).toBe(true);
      expect(features(close, 'roads').length).toBeGreaterThan(0);
      expect(features(far, 'roads')).toEqual([]);
    });

    it('answers 304 to the ETag it gave, and an empty tile where the extract has nothing', async () => {
      const { agent } = await signedInAgent(context.app, context.db, 'analyst');
      await importExtract(agent, context.deps, requireExtract(GERMAN_VILLAGE_OSM));
      const [x, y] = tileOf(10.0695, 48.136, 15);

      const first = await agent.get(`/api/tiles/base/15/${x}/${y}.pbf`).buffer(true).parse(binary);
      const again = await agent.get(`/api/tiles/base/15/${x}/${y}.pbf`).set('If-None-Match', first.headers['etag']!);
      const elsewhere = await agent.get('/api/tiles/base/15/0/0.pbf').buffer(true).parse(binary);

      expect(again.status).toBe(304);
      expect(elsewhere.status).toBe(200);
      expect(elsewhere.body.length).toBe(0);
    });

    it('refuses anonymous requests and tiles outside the map', async () => {
      const { agent } = await signedInAgent(context.app, context.db, 'board');

      const anonymous = await request(context.app).get('/api/tiles/base/1/0/0.pbf');
      const outside = await agent.get('/api/tiles/base/2/4/0.pbf');

      expect(anonymous.status).toBe(401);
      expect(outside.status).toBe(404);
    });
  });
});

// Helpers

function binary(response: request.Response, done: (error: Error | null, body: Buffer) => void) {
  const chunks: Buffer[] = [];
  response.on('data', (chunk: Buffer) => chunks.push(chunk));
  response.on('end', () => done(null, Buffer.concat(chunks)));
}

function decode(body: Buffer): VectorTile {
  return new VectorTile(new Protobuf(body));
}

function features(tile: VectorTile, layerName: string) {
  const layer = tile.layers[layerName];
  if (!layer) return [];
  return Array.from({ length: layer.length }, (_, index) => layer.feature(index));
}

/** XYZ tile holding a WGS 84 position (Web Mercator). */
function tileOf(lon: number, lat: number, z: number): [number, number] {
  const n = 2 ** z;
  const x = Math.floor(((lon + 180) / 360) * n);
  const latRad = (lat * Math.PI) / 180;
  const y = Math.floor(((1 - Math.log(Math.tan(latRad) + 1 / Math.cos(latRad)) / Math.PI) / 2) * n);
  return [x, y];
}
