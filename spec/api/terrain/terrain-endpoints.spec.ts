import { copyFileSync, mkdirSync, readFileSync, truncateSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { PNG } from 'pngjs';
import request from 'supertest';
import { afterAll, beforeAll, beforeEach, describe, expect, it } from 'vitest';
import { addTerrainDependent } from '../../../api/terrain/terrain-repository';
import { catalogueVersion } from '../../../api/terrain/terrain-runtime';
import { TILE_ENCODING } from '../../../api/terrain/tiles/tile-kernel.mjs';
import { recoverTerrain } from '../../../api/terrain/terrain-service';
import { terrainModels } from '../../../api/db/schema/index';
import { createTestContext, emptyAndCloseTestContext, signedInAgent, type TestContext } from '../../support/test-app';
import { countRows, truncateAll } from '../../support/test-database';
import { hasGdal, python, tempDir, writeSyntheticGrid } from './support/gdal';
import { filesUnder, uploadTerrain, waitUntilIngested, type Agent } from './support/terrain-fixtures';

describe.skipIf(!hasGdal)('terrain endpoints', () => {
  const temp = tempDir();
  const dataDir = join(temp.dir, 'data');
  let context: TestContext;
  let analyst: Agent;
  let admin: Agent;
  let good: string;

  beforeAll(async () => {
    context = createTestContext({ DATA_DIR: dataDir, TERRAIN_MAX_PIXELS: '2000000' });
    good = join(temp.dir, 'good.tif');
    writeSyntheticGrid({
      path: good,
      epsg: 32632,
      geoTransform: [640000, 20, 0, 5160000, 0, -20],
      widthPx: 400,
      heightPx: 300,
      dataType: 'Float32',
      nodata: -9999,
      creationOptions: ['TILED=YES', 'COMPRESS=DEFLATE'],
    });
  });

  beforeEach(async () => {
    await truncateAll(context.db);
    ({ agent: analyst } = await signedInAgent(context.app, context.db, 'analyst'));
    ({ agent: admin } = await signedInAgent(context.app, context.db, 'admin'));
  });

  afterAll(() => emptyAndCloseTestContext(context, temp));

  describe('POST /api/terrain', () => {
    it('accepts a GeoTIFF with 201 and ingests it to "ready" with statistics and quality notes', async () => {
      const response = await uploadTerrain(analyst, good, 'Valley floor 20 m');

      expect(response.status).toBe(201);
      expect(response.body).toEqual({ id: expect.any(String), status: 'processing' });
      const model = await waitUntilIngested(analyst, response.body.id);
      expect(model).toMatchObject({
        name: 'Valley floor 20 m',
        status: 'ready',
        crs: 'EPSG:32632',
        widthPx: 400,
        heightPx: 300,
        resolutionM: 20,
        nodata: -9999,
        dataType: 'Float32',
        pixelType: 'area',
        nodataShare: 0,
        footprint: { type: 'Polygon' },
      });
      expect(model.qualityNotes.join(' ')).toMatch(/No nodata pixels/);
      expect(filesUnder(dataDir).filter((f) => f.startsWith('terrain/'))).toContain(`terrain/${model.id}/model.tif`);
    });

    it('lists every model for any signed-in role', async () => {
      await uploadTerrain(analyst, good, 'Listed');
      const { agent: board } = await signedInAgent(context.app, context.db, 'board');

      const response = await board.get('/api/terrain');

      expect(response.status).toBe(200);
      expect(response.body.items).toHaveLength(1);
      expect(response.body.items[0].name).toBe('Listed');
      expect(typeof response.body.tilesVersion).toBe('string');
    });

    it('refuses planners with 403 and stores nothing', async () => {
      const { agent: planner } = await signedInAgent(context.app, context.db, 'planner');
      // A small body: the 403 comes before the upload is read, and a large body would then
      // meet a closed socket.
      const small = writeBytes('small.tif', Buffer.from('II*\0'));

      const response = await uploadTerrain(planner, small, 'Not mine');

      expect(response.status).toBe(403);
      expect(await countRows(context.db, 'terrain_models')).toBe(0);
    });

    it('answers 409 naming the existing model when the same file comes twice', async () => {
      const first = await uploadTerrain(analyst, good, 'Original');
      await waitUntilIngested(analyst, first.body.id);
      const before = filesUnder(dataDir);

      const second = await uploadTerrain(analyst, good, 'Copy');

      expect(second.status).toBe(409);
      expect(second.body.error.code).toBe('duplicate_terrain');
      expect(second.body.error.message).toContain('Original');
      expect(await countRows(context.db, 'terrain_models')).toBe(1);
      expect(filesUnder(dataDir)).toEqual(before);
    });

    const badInputs: Array<{ label: string; make: () => string; status: number; message: RegExp; config?: Record<string, string> }> = [
      {
        label: 'a file that is not a TIFF',
        make: () => writeText('route.gpx', '<gpx version="1.1"></gpx>'),
        status: 415,
        message: /not a TIFF/,
      },
      {
        label: 'a truncated GeoTIFF',
        make: () => {
          const path = copy('truncated.tif');
          truncateSync(path, Math.floor(readFileSync(path).length / 2));
          return path;
        },
        status: 400,
        message: /truncated/,
      },
      {
        label: 'a corrupt header',
        make: () => {
          const bytes = Buffer.alloc(64, 0xff);
          bytes.write('II', 0, 'latin1');
          bytes.writeUInt16LE(42, 2);
          bytes.writeUInt32LE(8, 4);
          return writeBytes('corrupt.tif', bytes);
        },
        status: 400,
        message: /truncated or corrupt/,
      },
      {
        label: 'a TIFF without georeferencing',
        make: () => {
          const path = join(temp.dir, 'plain.tif');
          python(
            `
import sys; import numpy as np; from osgeo import gdal
ds = gdal.GetDriverByName('GTiff').Create(sys.argv[1], 20, 20, 1, gdal.GDT_Float32)
ds.GetRasterBand(1).WriteArray(np.ones((20, 20), dtype=np.float32)); ds = None
print('{}')`,
            [path],
          );
          return path;
        },
        status: 400,
        message: /no georeferencing/,
      },
      {
        label: 'a CRS without an EPSG code',
        make: () => {
          const path = join(temp.dir, 'custom-crs.tif');
          python(
            `
import sys; import numpy as np; from osgeo import gdal, osr
ds = gdal.GetDriverByName('GTiff').Create(sys.argv[1], 20, 20, 1, gdal.GDT_Float32)
srs = osr.SpatialReference(); srs.ImportFromProj4('+proj=tmerc +lat_0=0 +lon_0=7.3 +k=1 +x_0=0 +y_0=0 +ellps=GRS80 +units=m')
ds.SetProjection(srs.ExportToWkt()); ds.SetGeoTransform((1000, 10, 0, 5000000, 0, -10))
ds.GetRasterBand(1).WriteArray(np.ones((20, 20), dtype=np.float32)); ds = None
print('{}')`,
            [path],
          );
          return path;
        },
        status: 422,
        message: /user-defined coordinate reference system/,
      },
      {
        label: 'an EPSG code that cannot be transformed',
        make: () => {
          const path = join(temp.dir, 'unknown-epsg.tif');
          // EPSG:5714 is a vertical CRS (mean sea level height): not a horizontal grid.
          python(
            `
import sys; import numpy as np; from osgeo import gdal, osr
ds = gdal.GetDriverByName('GTiff').Create(sys.argv[1], 20, 20, 1, gdal.GDT_Float32)
srs = osr.SpatialReference(); srs.ImportFromEPSG(32632); ds.SetProjection(srs.ExportToWkt())
ds.SetGeoTransform((600000, 10, 0, 5000000, 0, -10))
ds.GetRasterBand(1).WriteArray(np.ones((20, 20), dtype=np.float32)); ds = None
print('{}')`,
            [path],
          );
          patchProjectedCsKey(path, 5714);
          return path;
        },
        status: 422,
        message: /EPSG:5714/,
      },
      {
        label: 'a Byte raster',
        make: () => {
          const path = join(temp.dir, 'byte.tif');
          python(
            `
import sys; import numpy as np; from osgeo import gdal, osr
ds = gdal.GetDriverByName('GTiff').Create(sys.argv[1], 20, 20, 1, gdal.GDT_Byte)
srs = osr.SpatialReference(); srs.ImportFromEPSG(32632); ds.SetProjection(srs.ExportToWkt())
ds.SetGeoTransform((600000, 10, 0, 5000000, 0, -10))
ds.GetRasterBand(1).WriteArray(np.ones((20, 20), dtype=np.uint8)); ds = None
print('{}')`,
            [path],
          );
          return path;
        },
        status: 422,
        message: /UInt8/,
      },
      {
        label: 'a grid beyond TERRAIN_MAX_PIXELS (decompression bomb)',
        make: () => {
          const path = join(temp.dir, 'bomb.tif');
          python(
            `
import sys; from osgeo import gdal, osr
ds = gdal.GetDriverByName('GTiff').Create(sys.argv[1], 3000, 3000, 1, gdal.GDT_Float32, options=['TILED=YES', 'COMPRESS=DEFLATE', 'SPARSE_OK=TRUE'])
srs = osr.SpatialReference(); srs.ImportFromEPSG(32632); ds.SetProjection(srs.ExportToWkt())
ds.SetGeoTransform((600000, 10, 0, 5000000, 0, -10)); ds = None
print('{}')`,
            [path],
          );
          return path;
        },
        status: 413,
        message: /9000000 pixels; the limit is 2000000/,
      },
    ];

    for (const bad of badInputs) {
      it(`refuses ${bad.label} with ${bad.status}, stores nothing and stays up`, async () => {
        const path = bad.make();
        const filesBefore = filesUnder(dataDir);

        const response = await uploadTerrain(analyst, path, bad.label);

        expect(response.status, response.text).toBe(bad.status);
        expect(response.body.error.message).toMatch(bad.message);
        expect(await countRows(context.db, 'terrain_models')).toBe(0);
        expect(filesUnder(dataDir)).toEqual(filesBefore);
        expect((await request(context.app).get('/api/health')).status).toBe(200);
      });
    }

    it('refuses an upload over TERRAIN_MAX_UPLOAD_BYTES with 413 and removes the partial file', async () => {
      const small = createTestContext({ DATA_DIR: dataDir, TERRAIN_MAX_UPLOAD_BYTES: '10000' });
      const { agent } = await signedInAgent(small.app, small.db, 'analyst');
      const filesBefore = filesUnder(dataDir);

      const response = await uploadTerrain(agent, good, 'Too big');

      expect(response.status).toBe(413);
      expect(response.body.error.message).toMatch(/upload limit/);
      expect(await countRows(context.db, 'terrain_models')).toBe(0);
      expect(filesUnder(dataDir)).toEqual(filesBefore);
      await small.close();
    });

    it('refuses an upload without a name or without a file with 400', async () => {
      const noName = await analyst.post('/api/terrain').attach('file', good);
      const noFile = await analyst.post('/api/terrain').field('name', 'Nothing attached');

      expect(noName.status).toBe(400);
      expect(noName.body.error.message).toMatch(/name/);
      expect(noFile.status).toBe(400);
      expect(noFile.body.error.message).toMatch(/file/);
      expect(filesUnder(join(dataDir, 'uploads'))).toEqual([]);
    });
  });

  describe('DELETE /api/terrain/:id', () => {
    it('takes the model out of the catalogue with 204, keeping its files until it can no longer be restored (issue 11)', async () => {
      const { body } = await uploadTerrain(analyst, good, 'Doomed');
      await waitUntilIngested(analyst, body.id);

      const response = await analyst.delete(`/api/terrain/${body.id}`);
      const reupload = await uploadTerrain(analyst, good, 'Doomed again');
      const restored = await analyst.post(`/api/terrain/${body.id}/restore`);

      expect(response.status).toBe(204);
      expect(reupload.status).toBe(409);
      expect(reupload.body.error.message).toMatch(/deleted from the catalogue as “Doomed”; restore it/);
      expect(filesUnder(dataDir).filter((f) => f.startsWith(`terrain/${body.id}/model.tif`))).toHaveLength(1);
      expect(restored.status).toBe(200);
      expect(restored.body).toMatchObject({ id: body.id, status: 'ready' });
      expect((await analyst.get('/api/terrain')).body.items.map((item: { id: string }) => item.id)).toEqual([body.id]);
    });

    it('hides a deleted model from the catalogue and from sampling', async () => {
      const { body } = await uploadTerrain(analyst, good, 'Gone');
      await waitUntilIngested(analyst, body.id);

      await analyst.delete(`/api/terrain/${body.id}`);

      expect((await analyst.get(`/api/terrain/${body.id}`)).status).toBe(404);
      expect((await analyst.get('/api/terrain')).body.items).toEqual([]);
      expect((await analyst.post('/api/terrain/sample').send({ points: [[10.86, 46.56]] })).body.elevationsM).toEqual([null]);
    });

    it('answers 409 while a saved scenario depends on it; analysts may not force; admins may', async () => {
      const { body } = await uploadTerrain(analyst, good, 'In use');
      await waitUntilIngested(analyst, body.id);
      await addTerrainDependent(context.db, body.id, 'scenario', '00000000-0000-4000-8000-000000000001');

      const refused = await analyst.delete(`/api/terrain/${body.id}`);
      const analystForce = await analyst.delete(`/api/terrain/${body.id}?force=true`);
      const adminForce = await admin.delete(`/api/terrain/${body.id}?force=true`);

      expect(refused.status).toBe(409);
      expect(refused.body.error.message).toMatch(/1 saved scenario/);
      expect(analystForce.status).toBe(403);
      expect(adminForce.status).toBe(204);
      expect((await analyst.get('/api/terrain')).body.items).toEqual([]);
    });
  });

  describe('start-up recovery', () => {
    it('removes half-received uploads and orphan folders, and re-queues models left processing', async () => {
      const { body } = await uploadTerrain(analyst, good, 'Interrupted');
      await waitUntilIngested(analyst, body.id);
      // Simulate a kill: the model is back in "processing", a partial upload and a folder
      // without a row lie around.
      await context.db.update(terrainModels).set({ status: 'processing', readyAt: null });
      mkdirSync(join(dataDir, 'uploads'), { recursive: true });
      writeFileSync(join(dataDir, 'uploads', 'half.part'), 'partial');
      mkdirSync(join(dataDir, 'terrain', 'not-registered'), { recursive: true });
      writeFileSync(join(dataDir, 'terrain', 'not-registered', 'model.tif'), 'orphan');

      const recovered = await recoverTerrain(context.deps);
      const model = await waitUntilIngested(analyst, body.id);

      expect(recovered.removed).toEqual(expect.arrayContaining(['terrain/not-registered', 'uploads/half.part']));
      expect(recovered.requeued).toEqual([body.id]);
      expect(model.status).toBe('ready');
      expect(filesUnder(join(dataDir, 'terrain')).every((f) => f.startsWith(`${body.id}/`))).toBe(true);
    });
  });

  describe('GET /api/tiles/terrain/:z/:x/:y.png', () => {
    it('keys cached tiles by their encoding as well as by the models, so no tile of an earlier encoding is served', () => {
      const models = [
        { id: 'a', version: '1' },
        { id: 'b', version: '2' },
      ];

      expect(catalogueVersion(models)).toBe(catalogueVersion(models, TILE_ENCODING));
      expect(catalogueVersion(models, 'an-earlier-encoding')).not.toBe(catalogueVersion(models));
      // The palette each tile quantised for itself, until tiles took their palette from tint and shade.
      expect(TILE_ENCODING).not.toBe('palette-256');
      expect(catalogueVersion(models, 'palette-256')).not.toBe(catalogueVersion(models));
      expect(catalogueVersion([models[0]!])).not.toBe(catalogueVersion(models));
    });

    it('renders hillshade and tint over the model, transparent outside, with ETag revalidation', async () => {
      const { body } = await uploadTerrain(analyst, good, 'Tiled');
      await waitUntilIngested(analyst, body.id);
      const { agent: board } = await signedInAgent(context.app, context.db, 'board');
      // The model lies around 10.85° E, 46.55° N.
      const [x, y] = tileOf(10.86, 46.56, 14);

      const tile = await board.get(`/api/tiles/terrain/14/${x}/${y}.png`).buffer(true);
      const again = await board.get(`/api/tiles/terrain/14/${x}/${y}.png`).set('If-None-Match', tile.headers['etag']!);
      const empty = await board.get('/api/tiles/terrain/14/0/0.png').buffer(true);
      const anonymous = await request(context.app).get(`/api/tiles/terrain/14/${x}/${y}.png`);

      expect(tile.status).toBe(200);
      expect(tile.headers['content-type']).toBe('image/png');
      expect(tile.headers['cache-control']).toMatch(/max-age/);
      const png = PNG.sync.read(tile.body as Buffer);
      expect([png.width, png.height]).toEqual([256, 256]);
      // A palette PNG (colour type 3), at most 256 entries, and far smaller than RGB.
      const bytes = tile.body as Buffer;
      expect(bytes[25]).toBe(3);
      expect(bytes.toString('latin1', 37, 41)).toBe('PLTE');
      expect(bytes.readUInt32BE(33) / 3).toBeLessThanOrEqual(256);
      expect((empty.body as Buffer).length).toBeLessThan(200);
      expect(opaqueShare(png)).toBeGreaterThan(0.5);
      expect(distinctGreys(png)).toBeGreaterThan(20);
      expect(again.status).toBe(304);
      expect(opaqueShare(PNG.sync.read(empty.body as Buffer))).toBe(0);
      expect(anonymous.status).toBe(401);
      // The disk cache is written after the answer.
      await expect
        .poll(() => filesUnder(join(dataDir, 'tiles')).some((f) => f.endsWith(`14/${x}/${y}.png`)), { timeout: 5_000 })
        .toBe(true);
    });

    it('lets the browser keep a tile for a day when the URL names the current catalogue version', async () => {
      const { body } = await uploadTerrain(analyst, good, 'Versioned');
      await waitUntilIngested(analyst, body.id);
      const { tilesVersion } = (await analyst.get('/api/terrain')).body as { tilesVersion: string };
      const [x, y] = tileOf(10.86, 46.56, 14);

      const current = await analyst.get(`/api/tiles/terrain/14/${x}/${y}.png?v=${tilesVersion}`);
      const outdated = await analyst.get(`/api/tiles/terrain/14/${x}/${y}.png?v=an-older-version`);

      expect([current.status, outdated.status]).toEqual([200, 200]);
      expect(current.headers['cache-control']).toBe('private, max-age=86400, immutable');
      expect(outdated.headers['cache-control']).toBe('private, max-age=60');
    });

    it('uses the reduced pyramid at low zoom and answers 404 off the map', async () => {
      const { body } = await uploadTerrain(analyst, good, 'Pyramid');
      const model = await waitUntilIngested(analyst, body.id);
      const [x, y] = tileOf(10.86, 46.56, 9);

      const low = await analyst.get(`/api/tiles/terrain/9/${x}/${y}.png`).buffer(true);
      const off = await analyst.get('/api/tiles/terrain/3/9/0.png');

      expect(model.status).toBe('ready');
      expect(filesUnder(join(dataDir, 'terrain', body.id))).toEqual(['model.tif', 'overview-2.f32']);
      expect(low.status).toBe(200);
      expect(opaqueShare(PNG.sync.read(low.body as Buffer))).toBeGreaterThan(0);
      expect(off.status).toBe(404);
    });
  });

  function copy(name: string): string {
    const path = join(temp.dir, name);
    copyFileSync(good, path);
    return path;
  }

  function writeText(name: string, text: string): string {
    return writeBytes(name, Buffer.from(text));
  }

  function writeBytes(name: string, bytes: Buffer): string {
    const path = join(temp.dir, name);
    writeFileSync(path, bytes);
    return path;
  }
});

/** Rewrites the EPSG code in ProjectedCSTypeGeoKey (3072) of a little-endian classic TIFF. */
function patchProjectedCsKey(path: string, code: number): void {
  python(
    `
import sys
from osgeo import gdal
gdal.UseExceptions()
path, code = sys.argv[1], int(sys.argv[2])
data = bytearray(open(path, 'rb').read())
import struct
# Find the GeoKeyDirectory (tag 34735) in the first IFD of a little-endian classic TIFF.
ifd = struct.unpack_from('<I', data, 4)[0]
count = struct.unpack_from('<H', data, ifd)[0]
for i in range(count):
    tag, typ, n, value = struct.unpack_from('<HHII', data, ifd + 2 + 12 * i)
    if tag == 34735:
        keys = value
        header = struct.unpack_from('<4H', data, keys)
        for k in range(header[3]):
            key, loc, cnt, val = struct.unpack_from('<4H', data, keys + 8 + 8 * k)
            if key == 3072:
                struct.pack_into('<H', data, keys + 8 + 8 * k + 6, code)
open(path, 'wb').write(bytes(data))
print('{}')`,
    [path, String(code)],
  );
}

function tileOf(lon: number, lat: number, z: number): [number, number] {
  const n = 2 ** z;
  const latRad = (lat * Math.PI) / 180;
  return [Math.floor(((lon + 180) / 360) * n), Math.floor(((1 - Math.log(Math.tan(latRad) + 1 / Math.cos(latRad)) / Math.PI) / 2) * n)];
}

function opaqueShare(png: PNG): number {
  let opaque = 0;
  for (let i = 3; i < png.data.length; i += 4) if (png.data[i] === 255) opaque++;
  return opaque / (png.width * png.height);
}

function distinctGreys(png: PNG): number {
  const seen = new Set<number>();
  for (let i = 0; i < png.data.length; i += 4) if (png.data[i + 3]) seen.add(png.data[i]!);
  return seen.size;
}
