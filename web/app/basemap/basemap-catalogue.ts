import { DatePipe, DecimalPipe, PercentPipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSnackBar } from '@angular/material/snack-bar';
import { DEFAULT_BASEMAP_ATTRIBUTION, type BasemapImport } from '@shared/domain/basemap';
import { describeApiError } from '../core/api-error-message';
import { Session } from '../core/session';
import { BasemapTilesVersion } from '../map/basemap-tiles-version';
import { TerrainMap, type MapOverlay, type MapPosition } from '../map/terrain-map';
import type { LoadState } from '../ui/load-state';
import { LoadStatus } from '../ui/load-status';
import { BasemapApi } from './basemap-api';
import { BASEMAP_PHASE_LABELS, BASEMAP_STATUS_LABELS, formatMegabytes, statusTone } from './basemap-format';

/** While an import is waiting or running the list refreshes itself this often. */
const REFRESH_WHILE_IMPORTING_MS = 2000;
const EXTENT_COLOUR = '#0b4f6c';

/**
 * The base map: the OpenStreetMap extracts imported for the map and the road graph, the active
 * one on the map, and (for analysts and administrators) an upload of a new extract, which
 * replaces the active one once its import is complete.
 */
@Component({
  selector: 'app-basemap-catalogue',
  imports: [
    DatePipe,
    DecimalPipe,
    PercentPipe,
    FormsModule,
    MatButtonModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatProgressBarModule,
    TerrainMap,
    LoadStatus,
  ],
  templateUrl: './basemap-catalogue.html',
  styleUrl: './basemap-catalogue.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class BasemapCatalogue {
  private readonly api = inject(BasemapApi);
  private readonly session = inject(Session);
  private readonly snackBar = inject(MatSnackBar);
  private readonly tilesVersion = inject(BasemapTilesVersion);

  protected readonly statusLabels = BASEMAP_STATUS_LABELS;
  protected readonly phaseLabels = BASEMAP_PHASE_LABELS;
  protected readonly statusTone = statusTone;
  protected readonly formatMegabytes = formatMegabytes;
  protected readonly defaultAttribution = DEFAULT_BASEMAP_ATTRIBUTION;

  protected readonly imports = signal<BasemapImport[]>([]);
  protected readonly loadState = signal<LoadState>({ status: 'loading' });
  protected readonly canManage = computed(() => this.session.can('basemap.manage'));
  protected readonly active = computed(() => this.imports().find((item) => item.active) ?? null);
  protected readonly running = computed(() => this.imports().filter((item) => item.status === 'queued' || item.status === 'importing'));
  protected readonly chosenFile = signal<File | null>(null);
  protected readonly isUploading = signal(false);
  protected readonly uploadError = signal<string | null>(null);
  protected attribution = '';

  protected readonly fitTo = computed<MapPosition[] | null>(() => {
    const bbox = this.active()?.bbox;
    return bbox
      ? [
          [bbox[0], bbox[1]],
          [bbox[2], bbox[3]],
        ]
      : null;
  });
  protected readonly overlays = computed<MapOverlay[]>(() => {
    const bbox = this.active()?.bbox;
    if (!bbox) return [];
    const [w, s, e, n] = bbox;
    return [
      {
        kind: 'line',
        id: 'extent',
        positions: [
          [w, s],
          [e, s],
          [e, n],
          [w, n],
          [w, s],
        ],
        color: EXTENT_COLOUR,
        weight: 2,
        dashed: true,
        label: 'Extent of the active extract',
      },
    ];
  });

  private refreshTimer: ReturnType<typeof setTimeout> | null = null;

  constructor() {
    void this.load();
    inject(DestroyRef).onDestroy(() => this.refreshTimer && clearTimeout(this.refreshTimer));
  }

  protected chooseFile(input: HTMLInputElement): void {
    this.chosenFile.set(input.files?.[0] ?? null);
    this.uploadError.set(null);
  }

  protected async upload(): Promise<void> {
    const file = this.chosenFile();
    if (!file || this.isUploading()) return;
    this.isUploading.set(true);
    this.uploadError.set(null);
    try {
      await this.api.upload(file, this.attribution);
      this.chosenFile.set(null);
      this.snackBar.open(`“${file.name}” is being imported; the map switches over when it is ready.`, 'Dismiss', { duration: 6000 });
      await this.load();
    } catch (error: unknown) {
      // Expected for a refused file (not OpenStreetMap, too large): say why, keep the form.
      this.uploadError.set(describeApiError(error));
    } finally {
      this.isUploading.set(false);
    }
  }

  protected async load(): Promise<void> {
    try {
      const list = await this.api.list();
      this.imports.set(list.items);
      this.tilesVersion.report(list.tilesVersion, list.attribution);
      this.loadState.set({ status: 'ready' });
    } catch (error: unknown) {
      // Expected when the server cannot be reached: show it in place of the list.
      this.loadState.set({ status: 'error', message: describeApiError(error) });
    }
    if (this.refreshTimer) clearTimeout(this.refreshTimer);
    if (this.running().length > 0) this.refreshTimer = setTimeout(() => void this.load(), REFRESH_WHILE_IMPORTING_MS);
  }
}
