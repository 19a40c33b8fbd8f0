import { HttpClient } from '@angular/common/http';
import { Injectable, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import { basemapListSchema } from '@shared/domain/basemap';
import { BASEMAP_LIST_PATH } from './map-paths';

/**
 * Which base map the server serves: its tile version (tile URLs carry it, so browsers keep tiles
 * for a day and fetch new ones as soon as another extract becomes active) and its attribution.
 * Loaded once on first use; the base-map screen reports fresher answers.
 */
@Injectable({ providedIn: 'root' })
export class BasemapTilesVersion {
  private readonly http = inject(HttpClient);
  private readonly _state = signal<{ version: string | null; attribution: string | null } | null>(null);
  /** Null until known; `version` null when no extract is active. */
  readonly state = this._state.asReadonly();
  private loading: Promise<void> | null = null;

  ensureLoaded(): void {
    if (this._state() !== null || this.loading) return;
    this.loading = firstValueFrom(this.http.get(BASEMAP_LIST_PATH))
      .then((body) => {
        const list = basemapListSchema.parse(body);
        this._state.set({ version: list.tilesVersion, attribution: list.attribution });
      })
      // Without an answer the map shows the terrain alone; nothing to report.
      .catch(() => undefined)
      .finally(() => (this.loading = null));
  }

  report(version: string | null, attribution: string | null): void {
    this._state.set({ version, attribution });
  }
}

/** The base-map tile URL template for a version. */
export function basemapTileUrl(version: string): string {
  return `/api/tiles/base/{z}/{x}/{y}.pbf?v=${encodeURIComponent(version)}`;
}
