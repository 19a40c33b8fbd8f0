import { TestBed } from '@angular/core/testing';
import { MAP_LAYERS_STORAGE_KEY, MapLayerPreference } from '../../../web/app/map/map-layer-preference';

describe('MapLayerPreference', () => {
  afterEach(() => localStorage.removeItem(MAP_LAYERS_STORAGE_KEY));

  it('shows the base map and the terrain together when nothing is stored', () => {
    expect(TestBed.inject(MapLayerPreference).layers()).toBe('both');
  });

  it('remembers the choice in localStorage for the next map', () => {
    TestBed.inject(MapLayerPreference).set('terrain');

    expect(localStorage.getItem(MAP_LAYERS_STORAGE_KEY)).toBe('terrain');
  });

  it('reads a stored choice at start', () => {
    localStorage.setItem(MAP_LAYERS_STORAGE_KEY, 'base');

    expect(TestBed.inject(MapLayerPreference).layers()).toBe('base');
  });

  it('ignores a stored value it does not know', () => {
    localStorage.setItem(MAP_LAYERS_STORAGE_KEY, 'satellite');

    expect(TestBed.inject(MapLayerPreference).layers()).toBe('both');
  });
});
