import { HttpClient } from '@angular/common/http';
import { Injectable, inject, signal } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import { terrainListSchema } from '@shared/domain/terrain';
import { TERRAIN_CATALOGUE_PATH } from './map-paths';

/**
 * The terrain catalogue's version, which tile URLs carry so that browsers may keep tiles for a
 * day and still see new ones as soon as a model is added or removed. Loaded once on first use;
 * the terrain screen reports newer versions as it refreshes its list.
 */
@Injectable({ providedIn: 'root' })
export class TerrainTilesVersion {
  private readonly http = inject(HttpClient);
  private readonly _version = signal<string | null>(null);
  private readonly _settled = signal(false);
  /** Current catalogue version; null until known. */
  readonly version = this._version.asReadonly();
  /**
   * Whether the first answer is in (with a version, or none when the request failed). Maps ask for
   * tiles only from then on, so they never fetch a first batch unversioned and then all again.
   */
  readonly settled = this._settled.asReadonly();
  private loading: Promise<void> | null = null;

  /** Asks the server for the version unless it is already known or being asked for. */
  ensureLoaded(): void {
    if (this._version() !== null || this.loading) return;
    this.loading = firstValueFrom(this.http.get(TERRAIN_CATALOGUE_PATH))
      .then((body) => this._version.set(terrainListSchema.parse(body).tilesVersion))
      // Without a version the map keeps unversioned tile URLs, which still revalidate; nothing to report.
      .catch(() => undefined)
      .finally(() => {
        this.loading = null;
        this._settled.set(true);
      });
  }

  /** Records the version a fresher catalogue answer carried. */
  report(version: string): void {
    this._version.set(version);
    this._settled.set(true);
  }
}

/** The tile URL template for a catalogue version (unversioned while it is unknown). */
export function terrainTileUrl(version: string | null): string {
  const base = '/api/tiles/terrain/{z}/{x}/{y}.png';
  return version ? `${base}?v=${encodeURIComponent(version)}` : base;
}
