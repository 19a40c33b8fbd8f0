import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, inject, signal, viewChild } from '@angular/core';
import { toSignal } from '@angular/core/rxjs-interop';
import { FormControl, ReactiveFormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatPaginator, MatPaginatorModule } from '@angular/material/paginator';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatRadioModule } from '@angular/material/radio';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatSort, MatSortModule } from '@angular/material/sort';
import { MatTableModule } from '@angular/material/table';
import { RouterLink } from '@angular/router';
import { map } from 'rxjs';
import type { RoadRouteSummary, RouteImportElevations } from '@shared/domain/road-routes';
import { apiErrorBody, describeApiError } from '../core/api-error-message';
import { Session } from '../core/session';
import { QuantityPipe } from '../units/quantity-pipe';
import { UnitPreference } from '../units/unit-preference';
import { RoadRoutesApi } from './road-routes-api';
import { listTable } from '../ui/list-table';
import { LoadStatus } from '../ui/load-status';

const MODE_LABELS: Readonly<Record<RoadRouteSummary['mode'], string>> = { bus: 'Bus', trolleybus: 'Trolleybus', tram: 'Tram' };

/** Every route of the authority: search, sort, page; planners import, analysts load the road network. */
/** Where an imported route's elevations came from, in a sentence. */
function describeImportElevations(source: RouteImportElevations, fileHadThem: boolean): string {
  if (source === 'file') return 'Elevations: the file’s own, at every point.';
  return fileHadThem
    ? 'Elevations: from the terrain models, as chosen (the file’s own were set aside).'
    : 'Elevations: from the terrain models (the file does not give one at every point).';
}

@Component({
  selector: 'app-route-list',
  imports: [
    LoadStatus,
    DatePipe,
    ReactiveFormsModule,
    RouterLink,
    MatTableModule,
    MatSortModule,
    MatPaginatorModule,
    MatFormFieldModule,
    MatInputModule,
    MatButtonModule,
    MatIconModule,
    MatProgressBarModule,
    MatRadioModule,
    QuantityPipe,
  ],
  templateUrl: './route-list.html',
  styleUrl: './route-list.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class RouteList {
  private readonly api = inject(RoadRoutesApi);
  private readonly session = inject(Session);
  private readonly snackBar = inject(MatSnackBar);

  private readonly sort = viewChild(MatSort);
  private readonly paginator = viewChild(MatPaginator);

  protected readonly units = inject(UnitPreference).system;
  protected readonly columns = ['name', 'mode', 'version', 'lengthM', 'stopCount', 'tripsPerDay', 'scenarioCount', 'updatedAt'];
  protected readonly isUploading = signal(false);
  protected readonly uploadError = signal<string | null>(null);
  /** The route an earlier import of the same file made (409), to open instead. */
  protected readonly existingRoute = signal<{ id: string; name: string } | null>(null);
  /** Whether the import panel (file, elevation choice) is open. */
  protected readonly importOpen = signal(false);
  protected readonly importElevations = signal<RouteImportElevations>('file');
  /** What the last import made, shown above the list with links to the new routes. */
  protected readonly imported = signal<{ fileName: string; routes: { id: string; name: string }[]; elevations: string | null } | null>(
    null,
  );
  protected readonly isPlanner = computed(() => this.session.can('routes.edit'));
  protected readonly isAnalyst = computed(() => this.session.can('road-network.upload'));

  protected readonly search = new FormControl('', { nonNullable: true });
  protected readonly table = listTable({
    load: () => this.api.list(),
    filter: toSignal(this.search.valueChanges.pipe(map((text) => text.trim().toLowerCase())), { initialValue: '' }),
    matches: (route: RoadRouteSummary, text: string) => route.name.toLowerCase().includes(text),
    sort: this.sort,
    paginator: this.paginator,
  });

  protected modeLabel(mode: RoadRouteSummary['mode']): string {
    return MODE_LABELS[mode];
  }

  /**
   * Imports the chosen file: a GeoJSON or GPX route with the chosen elevations, or a GTFS feed.
   * The new routes are listed above the table (which is reloaded), so a second click does not
   * make a duplicate; the very same file again is refused by the server (409) with a link to the
   * route it made.
   */
  protected async importRoutes(input: HTMLInputElement, kind: 'file' | 'gtfs'): Promise<void> {
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    this.isUploading.set(true);
    this.uploadError.set(null);
    this.existingRoute.set(null);
    this.imported.set(null);
    try {
      if (kind === 'gtfs') {
        const routes = await this.api.importGtfs(file);
        this.imported.set({ fileName: file.name, routes: routes.map(({ id, name }) => ({ id, name })), elevations: null });
      } else {
        const result = await this.api.importFile(file, this.importElevations());
        this.imported.set({
          fileName: file.name,
          routes: [{ id: result.route.id, name: result.route.name }],
          elevations: describeImportElevations(result.elevationSource, result.fileHasElevations),
        });
        this.importOpen.set(false);
      }
      this.table.reload();
    } catch (error: unknown) {
      this.uploadError.set(describeApiError(error));
      const details = apiErrorBody(error)?.details as { routeId?: unknown; routeName?: unknown } | undefined;
      if (typeof details?.routeId === 'string' && typeof details.routeName === 'string') {
        this.existingRoute.set({ id: details.routeId, name: details.routeName });
      }
    } finally {
      this.isUploading.set(false);
    }
  }

  protected async uploadNetwork(input: HTMLInputElement): Promise<void> {
    const file = input.files?.[0];
    input.value = '';
    if (!file) return;
    this.isUploading.set(true);
    this.uploadError.set(null);
    try {
      const answer = await this.api.uploadRoadNetwork(file);
      this.snackBar.open(`Road network loaded: ${answer.lineCount} lines. Planners can now snap routes to it.`, 'Dismiss');
    } catch (error: unknown) {
      this.uploadError.set(describeApiError(error));
    } finally {
      this.isUploading.set(false);
    }
  }

  protected chooseElevations(value: RouteImportElevations): void {
    this.importElevations.set(value);
  }
}
