import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { TerrainTilesVersion, terrainTileUrl } from '../../../web/app/map/terrain-tiles-version';

describe('TerrainTilesVersion', () => {
  let version: TerrainTilesVersion;
  let http: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({ providers: [provideHttpClient(), provideHttpClientTesting()] });
    version = TestBed.inject(TerrainTilesVersion);
    http = TestBed.inject(HttpTestingController);
  });

  afterEach(() => http.verify());

  it('asks the catalogue once and keeps its version', async () => {
    version.ensureLoaded();
    version.ensureLoaded();

    http.expectOne('/api/terrain').flush({ items: [], tilesVersion: 'v7' });
    await Promise.resolve();
    await Promise.resolve();

    expect(version.version()).toBe('v7');
  });

  it('is settled only once the first answer is in, so maps never fetch unversioned tiles first (issue 10)', async () => {
    version.ensureLoaded();
    expect(version.settled()).toBe(false);

    http.expectOne('/api/terrain').flush({ items: [], tilesVersion: 'v7' });
    await Promise.resolve();
    await Promise.resolve();
    await Promise.resolve();

    expect(version.settled()).toBe(true);
  });

  it('takes a newer version reported by the terrain screen without asking again', () => {
    version.report('v8');
    version.ensureLoaded();

    http.expectNone('/api/terrain');
    expect(version.version()).toBe('v8');
  });
});

describe('terrainTileUrl', () => {
  it('names the version in the tile URL once it is known', () => {
    expect(terrainTileUrl(null)).toBe('/api/tiles/terrain/{z}/{x}/{y}.png');
    expect(terrainTileUrl('3f a')).toBe('/api/tiles/terrain/{z}/{x}/{y}.png?v=3f%20a');
  });
});
