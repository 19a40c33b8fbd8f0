import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, DestroyRef, computed, inject, signal } from '@angular/core';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatIconModule } from '@angular/material/icon';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTableModule } from '@angular/material/table';
import type { TerrainModel, TerrainStatus } from '@shared/domain/terrain';
import { apiErrorBody, describeApiError } from '../core/api-error-message';
import { Session } from '../core/session';
import { TerrainMap, type MapOverlay, type MapPosition } from '../map/terrain-map';
import { confirmDelete } from '../ui/confirm-delete-dialog';
import { TerrainApi } from './terrain-api';
import {
  TERRAIN_STATUS_LABELS,
  formatElevationRange,
  formatFileSize,
  formatNodataShare,
  formatPixelSize,
  formatModelResolution,
  formatResolution,
} from './terrain-format';
import { TerrainUpload } from './terrain-upload';
import type { LoadState } from '../ui/load-state';
import { LoadStatus } from '../ui/load-status';

/** Outline colours on the map: our own, readable over the hillshade tint. */
const FOOTPRINT_COLOURS = { ready: '#0b4f6c', processing: '#8a5a00', failed: '#b3261e', selected: '#e0561b' } as const;
/** While a model is processing the catalogue refreshes itself this often. */
const REFRESH_WHILE_PROCESSING_MS = 2000;

/**
 * The terrain catalogue: every elevation model on a map of their outlines over our own terrain
 * tiles, a table with the figures analysts compare, and a detail panel with quality notes.
 * Analysts and administrators also upload and delete here (the server enforces it).
 */
@Component({
  selector: 'app-terrain-catalogue',
  imports: [LoadStatus, DatePipe, MatButtonModule, MatIconModule, MatTableModule, TerrainMap, TerrainUpload],
  templateUrl: './terrain-catalogue.html',
  styleUrl: './terrain-catalogue.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class TerrainCatalogue {
  private readonly terrainApi = inject(TerrainApi);
  private readonly dialog = inject(MatDialog);
  private readonly snackBar = inject(MatSnackBar);
  private readonly session = inject(Session);

  protected readonly columns = ['name', 'status', 'crs', 'resolution', 'size', 'elevation', 'uploaded'];
  protected readonly statusLabels = TERRAIN_STATUS_LABELS;
  protected readonly format = {
    formatElevationRange,
    formatFileSize,
    formatNodataShare,
    formatPixelSize,
    formatResolution,
    formatModelResolution,
  };

  protected readonly models = signal<TerrainModel[]>([]);
  protected readonly loadState = signal<LoadState>({ status: 'loading' });
  protected readonly selectedId = signal<string | null>(null);
  protected readonly selected = computed(() => this.models().find((model) => model.id === this.selectedId()) ?? null);
  /** Whether this person may upload and delete (analysts, administrators). */
  protected readonly canManage = computed(() => this.session.can('terrain.manage'));
  protected readonly isAdmin = computed(() => this.session.can('terrain.force-delete'));
  protected readonly overlays = computed<MapOverlay[]>(() =>
    this.models()
      .filter((model) => model.footprint)
      .map((model) => {
        const isSelected = model.id === this.selectedId();
        return {
          kind: 'line' as const,
          id: model.id,
          positions: outline(model),
          color: isSelected ? FOOTPRINT_COLOURS.selected : FOOTPRINT_COLOURS[model.status],
          weight: isSelected ? 4 : 2,
          dashed: model.status !== 'ready',
          interactive: true,
          label: `${model.name} (${TERRAIN_STATUS_LABELS[model.status].toLowerCase()})`,
        };
      }),
  );
  /** Where the map fits its view: every outline once loaded, one outline on "Show on map". */
  protected readonly fitTo = signal<MapPosition[] | null>(null);

  private refreshTimer: ReturnType<typeof setTimeout> | null = null;

  constructor() {
    inject(DestroyRef).onDestroy(() => this.clearRefresh());
    void this.load();
  }

  /** Counts the list's loads: only the newest one's answer is shown (see `load`). */
  private listRequest = 0;

  /**
   * Loads the catalogue. An answer that arrives after a newer load was started (say a refresh
   * still under way when a model was deleted) is dropped, so a deleted model never comes back.
   */
  protected async load(): Promise<void> {
    if (this.models().length === 0) this.loadState.set({ status: 'loading' });
    this.clearRefresh();
    const request = ++this.listRequest;
    try {
      const { items } = await this.terrainApi.list();
      if (request !== this.listRequest) return;
      this.models.set(items);
      this.loadState.set({ status: 'ready' });
      if (this.fitTo() === null && items.some((m) => m.footprint)) this.fitTo.set(items.flatMap(outline));
      if (items.some((model) => model.status === 'processing')) {
        this.refreshTimer = setTimeout(() => void this.load(), REFRESH_WHILE_PROCESSING_MS);
      }
    } catch (error: unknown) {
      // Expected: server unreachable or an answer that fails the shared schema.
      if (request !== this.listRequest) return;
      this.loadState.set({ status: 'error', message: describeApiError(error) });
    }
  }

  protected statusLabel(status: TerrainStatus): string {
    return TERRAIN_STATUS_LABELS[status];
  }

  protected select(id: string): void {
    this.selectedId.set(id);
  }

  protected showOnMap(model: TerrainModel): void {
    this.select(model.id);
    this.fitTo.set(outline(model));
  }

  protected uploadAccepted(id: string): void {
    this.selectedId.set(id);
    this.fitTo.set(null);
    void this.load();
  }

  protected ingestionFinished(model: TerrainModel): void {
    this.selectedId.set(model.id);
    void this.load();
  }

  protected async confirmDelete(model: TerrainModel): Promise<void> {
    const confirmed = await confirmDelete(this.dialog, {
      what: 'terrain model',
      name: model.name,
      consequence:
        'It leaves the catalogue, the map and elevation sampling at once. Routes sampled on it keep their stored ' +
        'elevations; new samples use the remaining models. Its file is kept while it can be restored.',
    });
    if (confirmed) await this.delete(model, false);
  }

  private async delete(model: TerrainModel, force: boolean): Promise<void> {
    try {
      await this.terrainApi.delete(model.id, force);
      this.models.update((models) => models.filter((m) => m.id !== model.id));
      if (this.selectedId() === model.id) this.selectedId.set(null);
      // Supersedes a refresh that was under way (its answer may still list the model).
      void this.load();
      this.snackBar.open(`“${model.name}” was deleted; restore it under Recently deleted if that was a mistake.`, 'OK');
    } catch (error: unknown) {
      // Expected: 409 while saved scenarios use the model; administrators may force it.
      const body = apiErrorBody(error);
      if (body?.code === 'terrain_in_use' && this.isAdmin()) {
        const answer = this.snackBar.open(body.message, 'Delete anyway', { duration: 15000 });
        answer.onAction().subscribe(() => void this.delete(model, true));
        return;
      }
      this.snackBar.open(describeApiError(error), 'OK');
    }
  }

  private clearRefresh(): void {
    if (this.refreshTimer) clearTimeout(this.refreshTimer);
    this.refreshTimer = null;
  }
}

/** A model's outline as map positions (empty while it has none). */
function outline(model: TerrainModel): MapPosition[] {
  return model.footprint ? model.footprint.coordinates[0]!.map(([lon, lat]) => [lon, lat] as const) : [];
}
