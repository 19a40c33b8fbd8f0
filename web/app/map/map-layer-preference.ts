import { Injectable, signal } from '@angular/core';

/** What the maps show: the base map with the terrain over it, the base map alone, or the terrain alone. */
export type MapLayers = 'both' | 'base' | 'terrain';

export const MAP_LAYERS_STORAGE_KEY = 'descentry.map-layers';

/** The layer choice, kept in this browser so every map opens the way the person left the last one. */
@Injectable({ providedIn: 'root' })
export class MapLayerPreference {
  private readonly _layers = signal<MapLayers>(readStored());
  readonly layers = this._layers.asReadonly();

  set(layers: MapLayers): void {
    this._layers.set(layers);
    try {
      localStorage.setItem(MAP_LAYERS_STORAGE_KEY, layers);
    } catch {
      // Expected where storage is disabled (private windows): the choice then lasts for this visit.
    }
  }
}

function readStored(): MapLayers {
  try {
    const stored = localStorage.getItem(MAP_LAYERS_STORAGE_KEY);
    return stored === 'base' || stored === 'terrain' || stored === 'both' ? stored : 'both';
  } catch {
    // Expected where storage is disabled: show both.
    return 'both';
  }
}
