import { DatePipe } from '@angular/common';
import { ChangeDetectionStrategy, Component, computed, effect, inject, input, resource, signal, untracked, viewChild } from '@angular/core';
import { toObservable, toSignal } from '@angular/core/rxjs-interop';
import { FormControl, FormGroup, ReactiveFormsModule, Validators } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatDialog } from '@angular/material/dialog';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatMenuModule } from '@angular/material/menu';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { MatSnackBar } from '@angular/material/snack-bar';
import { MatTooltipModule } from '@angular/material/tooltip';
import { Router, RouterLink } from '@angular/router';
import { ROUTE_MODES, type RoadRoute, type RoadRouteDraftInput } from '@shared/domain/road-routes';
import { catchError, debounce, firstValueFrom, map, of, startWith, switchMap, timer } from 'rxjs';
import { describeApiError } from '../core/api-error-message';
import { confirmDelete } from '../ui/confirm-delete-dialog';
import { Session } from '../core/session';
import { DistanceChart, type ChartSeries } from '../charts/distance-chart';
import { BasemapTilesVersion } from '../map/basemap-tiles-version';
import { TerrainMap, type MapOverlay, type MapOverlayEvent, type MapPosition } from '../map/terrain-map';
import { QuantityPipe } from '../units/quantity-pipe';
import { formatQuantity, fromDisplay, toDisplay, unitLabel } from '../units/unit-format';
import { speedLimitValidator } from '../units/speed-limit-validator';
import { DEFAULT_SPEED_LIMIT_KPH, SERVICE_DAYS_PER_YEAR, TRIPS_PER_DAY } from '@shared/domain/limits';
import { SERVICE_DAYS_RANGE, TRIPS_PER_DAY_RANGE, speedLimitKphOf, speedLimitRange } from '@shared/presentation/index';
import { UnitPreference } from '../units/unit-preference';
import { UnitSwitch } from '../units/unit-switch';
import { LOADING, loadFailed, loadStateOf } from '../ui/load-state';
import { LoadStatus } from '../ui/load-status';
import { RouteElevationBanners, RouteVersionBanner, type RouteProfileState } from './route-banners';
import { RoadRoutesApi, type RoadNetwork, type RouteVersionInfo } from './road-routes-api';
import { RouteDraftStore } from './route-draft-store';
import { RouteVertexTable, type CoordinateChange } from './tables/route-vertex-table';
import { RouteStopTable, type StopChange } from './tables/route-stop-table';
import { RouteLimitTable, type LimitChange } from './tables/route-limit-table';
import { speedShown } from './tables/cell-format';
import { ROUTE_COLOR, lonLatOf, pointAt, routeOverlays, type EditorTool } from './route-overlays';
import {
  EMPTY_DRAFT,
  addSpeedLimit,
  addStopNear,
  appendVertices,
  deleteVertex,
  insertVertex,
  insertVertexAfter,
  moveStopTo,
  moveVertex,
  replaceVertex,
  roundDegrees,
  polylineLengthM,
  projectOnLine,
  removeSpeedLimit,
  removeStop,
  segmentMidpoints,
  dropRecordedElevations,
  draftOfRoute,
  positionOf,
  recordedElevations,
  setVertexCoordinate,
  updateSpeedLimit,
  updateStop,
  type RouteDraftState,
} from './route-draft';

export type { EditorTool } from './route-overlays';

/** The live elevation profile: none yet (fewer than two vertices), or loading as any page data. */
type ProfileState = RouteProfileState;

const MODE_LABELS: Readonly<Record<(typeof ROUTE_MODES)[number], string>> = {
  bus: 'Bus',
  trolleybus: 'Trolleybus',
  tram: 'Tram',
};

/** Planners draw and edit a route on the terrain map; everyone else reads it. */
@Component({
  selector: 'app-route-editor',
  imports: [
    DatePipe,
    RouteVersionBanner,
    RouteElevationBanners,
    ReactiveFormsModule,
    RouterLink,
    MatButtonModule,
    MatButtonToggleModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    MatMenuModule,
    MatProgressBarModule,
    MatSelectModule,
    MatSlideToggleModule,
    MatTooltipModule,
    TerrainMap,
    DistanceChart,
    QuantityPipe,
    UnitSwitch,
    LoadStatus,
    RouteVertexTable,
    RouteStopTable,
    RouteLimitTable,
  ],
  templateUrl: './route-editor.html',
  styleUrl: './route-editor.scss',
  host: { '(document:keydown)': 'handleShortcut($event)' },
  providers: [RouteDraftStore],
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class RouteEditor {
  private readonly api = inject(RoadRoutesApi);
  private readonly dialog = inject(MatDialog);
  private readonly session = inject(Session);
  private readonly router = inject(Router);
  private readonly snackBar = inject(MatSnackBar);

  /** Route being edited, from `routes/:routeId`; absent on `routes/new`. */
  readonly routeId = input<string | undefined>();

  protected readonly units = inject(UnitPreference).system;
  protected readonly modes = ROUTE_MODES;
  protected readonly modeLabels = MODE_LABELS;

  private readonly store = inject(RouteDraftStore);
  protected readonly draft = this.store.draft;
  protected readonly canUndo = this.store.canUndo;
  protected readonly canRedo = this.store.canRedo;
  protected readonly tool = signal<EditorTool>('draw');
  protected readonly selectedVertex = signal<number | null>(null);
  private readonly terrainMap = viewChild<TerrainMap>('terrainMap');
  /** Whether new and moved vertices follow the roads (on by default wherever there are roads). */
  protected readonly snapToNetwork = signal(true);
  private readonly basemap = inject(BasemapTilesVersion);
  /** Whether there is a road graph to snap to: an imported extract or a reference network. */
  protected readonly canSnap = computed(() => this.network() !== null || (this.basemap.state()?.version ?? null) !== null);
  /** Whether a path along the roads is being found; clicks made meanwhile wait their turn. */
  protected readonly isRouting = this.store.isWorking;
  protected readonly queuedClicks = this.store.queued;
  protected readonly network = signal<RoadNetwork | null>(null);
  /** The route's current version as the server last answered it. */
  protected readonly saved = signal<RoadRoute | null>(null);
  /** An older version being looked at (read-only), or null for the current one. */
  protected readonly olderVersion = signal<RoadRoute | null>(null);
  protected readonly versions = signal<RouteVersionInfo[]>([]);
  /**
   * The route shown, asked for by id: opening another route drops the earlier answer. Without an
   * id the page is a new route over the uploaded terrain.
   */
  private readonly routeLoad = resource({
    params: () => ({ routeId: this.routeId() }),
    loader: async ({ params: { routeId }, abortSignal }): Promise<RoadRoute | null> => {
      this.olderVersion.set(null);
      if (!routeId) {
        this.saved.set(null);
        this.savedLine.set(null);
        this.store.reset(EMPTY_DRAFT);
        void this.fitToTerrain();
        return null;
      }
      const route = await this.api.get(routeId);
      // Another route was opened meanwhile: its own load shows it, this answer is dropped.
      if (abortSignal.aborted) return route;
      this.showSaved(route, true);
      void this.loadVersions(routeId);
      return route;
    },
  });
  protected readonly loadState = loadStateOf(this.routeLoad);
  protected readonly isSaving = signal(false);
  protected readonly saveError = signal<string | null>(null);
  /** First end of a speed-limit stretch placed on the map, m along the route. */
  protected readonly pendingLimitFromM = signal<number | null>(null);
  protected readonly fitTo = signal<MapPosition[] | null>(null);
  /**
   * Whether the map waits for the route's place before it asks for tiles: while a saved route is
   * being read (a failed read leaves the map where it is, with its tiles).
   */
  protected readonly mapPlacing = computed(
    () => this.routeId() !== undefined && this.fitTo() === null && this.loadState().status !== 'error',
  );
  protected readonly hoverX = signal<number | null>(null);

  protected readonly isPlanner = computed(() => this.session.can('routes.edit'));
  /** Whether this person may change what is on screen now. */
  protected readonly canEdit = computed(() => this.isPlanner() && this.olderVersion() === null);
  protected readonly vertices = this.store.vertices;
  protected readonly lengthM = computed(() => polylineLengthM(this.vertices()));

  protected readonly details = new FormGroup({
    name: new FormControl('', { nonNullable: true, validators: [Validators.required, Validators.maxLength(120)] }),
    mode: new FormControl<(typeof ROUTE_MODES)[number]>('bus', { nonNullable: true }),
    description: new FormControl('', { nonNullable: true, validators: [Validators.maxLength(2000)] }),
    defaultSpeedLimit: new FormControl(DEFAULT_SPEED_LIMIT_KPH, {
      nonNullable: true,
      validators: [Validators.required, speedLimitValidator(() => this.units())],
    }),
    tripsPerDay: new FormControl<number>(TRIPS_PER_DAY.default, {
      nonNullable: true,
      validators: [Validators.required, Validators.min(TRIPS_PER_DAY.min), Validators.max(TRIPS_PER_DAY.max)],
    }),
    serviceDaysPerYear: new FormControl<number>(SERVICE_DAYS_PER_YEAR.default, {
      nonNullable: true,
      validators: [Validators.required, Validators.min(SERVICE_DAYS_PER_YEAR.min), Validators.max(SERVICE_DAYS_PER_YEAR.max)],
    }),
  });

  /** Speed given to a stretch placed on the map, in the displayed unit. */
  protected readonly newLimitSpeed = new FormControl(30, { nonNullable: true, validators: [speedLimitValidator(() => this.units())] });

  protected readonly tripsRange = TRIPS_PER_DAY_RANGE;
  protected readonly serviceDaysRange = SERVICE_DAYS_RANGE;

  /** The contract's speed-limit range in the displayed unit, for the inputs and their messages. */
  protected readonly speedRange = computed(() => speedLimitRange(this.units()));

  /** How many vertices carry their own recorded elevation (an imported track), of how many. */
  protected readonly recorded = computed(() => recordedElevations(this.draft()));

  /** Drops the route's recorded elevations (one undoable step): the terrain supplies them instead. */
  protected useTerrainElevations(): void {
    this.edit((state) => dropRecordedElevations(state));
  }

  /**
   * The saved version whose line is in the draft as the server answered it (set on opening and
   * after a save), or null for a new route. While the draft's vertices are still that very list,
   * the profile is the saved version's.
   */
  private readonly savedLine = signal<{ routeId: string; version: number; vertices: RouteDraftState['vertices'] } | null>(null);

  /**
   * Live elevation profile: settles 300 ms after the last change; a newer path cancels the
   * request. The line of a saved version, unedited (as on opening), is asked for at once with
   * the version's GET, which the browser revalidates; an edited line with the POST.
   */
  protected readonly profile = toSignal(
    toObservable(this.vertices).pipe(
      debounce((vertices) => timer(this.savedLine()?.vertices === vertices ? 0 : 300)),
      switchMap((vertices) => {
        if (vertices.length < 2) return of<ProfileState>({ status: 'idle' });
        const saved = untracked(this.savedLine);
        const request =
          saved?.vertices === vertices
            ? this.api.savedProfile(saved.routeId, saved.version)
            : this.api.profile({ type: 'LineString', coordinates: vertices.map(positionOf) });
        return request.pipe(
          map((profile): ProfileState => ({ status: 'ready', value: profile })),
          startWith<ProfileState>(LOADING),
          catchError((error: unknown) => of<ProfileState>(loadFailed(error))),
        );
      }),
    ),
    { initialValue: { status: 'idle' } as ProfileState },
  );

  protected readonly profileSeries = computed<ChartSeries[]>(() => {
    const state = this.profile();
    if (state.status !== 'ready') return [];
    const system = this.units();
    return [
      {
        label: 'Elevation',
        x: state.value.distanceM.map((m) => toDisplay('distance', m, system)),
        y: state.value.elevationM.map((m) => (m === null ? null : toDisplay('elevation', m, system))),
        color: ROUTE_COLOR,
        fill: true,
      },
    ];
  });

  protected readonly hasTerrainGaps = computed(() => {
    const state = this.profile();
    return state.status === 'ready' && state.value.elevationM.some((value) => value === null);
  });

  protected readonly profileCursor = computed<MapPosition | null>(() => {
    const x = this.hoverX();
    if (x === null) return null;
    const atM = fromDisplay('distance', x, this.units());
    return pointAt(this.draft().vertices, atM);
  });

  protected readonly overlays = computed<MapOverlay[]>(() => {
    const older = this.olderVersion();
    return routeOverlays({
      draft: older ? draftOfRoute(older) : this.draft(),
      network: this.network(),
      editing: this.canEdit(),
      tool: this.tool(),
      selectedVertex: this.selectedVertex(),
      pendingLimitFromM: this.pendingLimitFromM(),
      units: this.units(),
    });
  });

  protected readonly versionShown = computed(() => this.olderVersion()?.version ?? this.saved()?.version ?? null);

  constructor() {
    effect(() => {
      // A selection past the end (after an undo or a deletion) is no selection.
      const count = this.vertices().length;
      if ((untracked(this.selectedVertex) ?? -1) >= count) this.selectedVertex.set(null);
    });
    effect(() => {
      // Everyone reads; only planners change details. Older versions are read-only for all.
      if (this.canEdit()) this.details.enable({ emitEvent: false });
      else this.details.disable({ emitEvent: false });
    });
    void this.loadNetwork();
    this.basemap.ensureLoaded();
  }

  // ---- Map ----

  /**
   * Map clicks and drags go through the store's queue: each is applied in order, after any path
   * still being found for an earlier one. The tool is the one chosen when the click was made.
   */
  protected mapClicked(at: MapPosition): void {
    if (!this.canEdit()) return;
    const tool = this.tool();
    this.store.enqueue(() => {
      if (tool === 'draw') return this.addVertex(at);
      if (this.draft().vertices.length >= 2) this.placeOnLine(at, tool);
      return undefined;
    });
  }

  protected overlayClicked(event: MapOverlayEvent): void {
    if (!this.canEdit()) return;
    const [kind, indexText] = event.id.split(':');
    const index = Number(indexText);
    const tool = this.tool();
    if (kind === 'vertex' && tool === 'draw') {
      this.selectedVertex.update((current) => (current === index ? null : index));
      return;
    }
    this.store.enqueue(() => {
      // A midpoint handle inserts a vertex only with the draw tool. The handles are drawn for that
      // tool alone, but a click can reach one still on screen right after another tool was chosen:
      // then it is a click on the line like any other.
      if (kind === 'mid' && tool === 'draw') this.edit((state) => insertVertex(state, index, segmentMidpoints(state.vertices)[index]!));
      else if (kind === 'route' || kind === 'vertex' || kind === 'mid') this.placeOnLine(event.at, tool);
    });
  }

  protected overlayMoved(event: MapOverlayEvent): void {
    if (!this.canEdit()) return;
    const [kind, indexText] = event.id.split(':');
    if (kind !== 'vertex') return;
    this.store.enqueue(() => this.moveVertexTo(Number(indexText), event.at));
  }

  private async moveVertexTo(index: number, at: MapPosition): Promise<void> {
    const vertices = this.draft().vertices;
    if (index >= vertices.length) return;
    const previous = vertices[index - 1];
    const next = vertices[index + 1];
    if (!this.snapToNetwork() || !this.canSnap() || (!previous && !next)) {
      this.edit((state) => moveVertex(state, index, at));
      return;
    }
    // Snapped: the route runs along the roads from the vertex before, through where the vertex
    // was dropped, to the vertex after.
    const event = { at };
    const ticket = this.store.ticket();
    try {
      const path = await firstValueFrom(
        previous && next
          ? this.api.pathAlongNetwork(previous, next, [event.at])
          : previous
            ? this.api.pathAlongNetwork(previous, event.at)
            : this.api.pathAlongNetwork(event.at, next!),
      );
      if (!this.store.isCurrent(ticket)) return;
      const coordinates = path.geometry.coordinates.map(lonLatOf);
      const inner = coordinates.slice(previous ? 1 : 0, next ? -1 : undefined);
      this.edit((state) => replaceVertex(state, index, inner.length > 0 ? inner : [event.at]));
    } catch (error: unknown) {
      if (!this.store.isCurrent(ticket)) return;
      // Expected when the dropped point is far from the roads or not connected: move it as dropped.
      this.snackBar.open(`${describeApiError(error)} The vertex was moved without snapping.`, 'Dismiss');
      this.edit((state) => moveVertex(state, index, event.at));
    }
  }

  private async addVertex(at: MapPosition): Promise<void> {
    const vertices = this.draft().vertices;
    const last = vertices[vertices.length - 1];
    if (!this.snapToNetwork() || !this.canSnap()) {
      this.edit((state) => appendVertices(state, [at]));
      return;
    }
    const ticket = this.store.ticket();
    try {
      // The first vertex goes to the nearest road; the next ones follow the roads from the last.
      const path = await firstValueFrom(this.api.pathAlongNetwork(last ?? at, at));
      if (!this.store.isCurrent(ticket)) return;
      const routed = (last ? path.geometry.coordinates.slice(1) : path.geometry.coordinates.slice(0, 1)).map(lonLatOf);
      this.edit((state) => appendVertices(state, routed.length > 0 ? routed : [at]));
    } catch (error: unknown) {
      if (!this.store.isCurrent(ticket)) return;
      // Expected when the two points are not connected by the network: add the point directly.
      this.snackBar.open(`${describeApiError(error)} The point was added without snapping.`, 'Dismiss');
      this.edit((state) => appendVertices(state, [at]));
    }
  }

  /**
   * Starts a route without the mouse: its first vertex at the centre of the map's view, to be
   * typed over in the vertex table, where "insert after" adds the next ones.
   */
  protected addFirstVertex(): void {
    const centre = this.terrainMap()?.centre();
    if (!centre || this.draft().vertices.length > 0) return;
    this.edit((state) => appendVertices(state, [[roundDegrees(centre[0]), roundDegrees(centre[1])]]));
  }

  private placeOnLine(at: MapPosition, tool: EditorTool): void {
    const vertices = this.draft().vertices;
    if (tool === 'stop') {
      // Named by where it is, so names read in order along the route whatever order they are placed in.
      const placed = projectOnLine(vertices, at);
      if (!placed) return;
      const name = `Stop at ${formatQuantity('distance', placed.atM, this.units())}`;
      this.edit((state) => addStopNear(state, at, name));
      return;
    }
    const projection = projectOnLine(vertices, at);
    if (!projection) return;
    const fromM = this.pendingLimitFromM();
    if (fromM === null) {
      this.pendingLimitFromM.set(Math.round(projection.atM));
      return;
    }
    const toM = Math.round(projection.atM);
    this.pendingLimitFromM.set(null);
    if (Math.abs(toM - fromM) < 1 || this.newLimitSpeed.invalid) return;
    const speedKph = this.speedKphFromDisplay(this.newLimitSpeed.value);
    this.edit((state) => addSpeedLimit(state, { fromM: Math.min(fromM, toM), toM: Math.max(fromM, toM), speedKph }));
  }

  protected chooseTool(tool: EditorTool): void {
    this.tool.set(tool);
    this.pendingLimitFromM.set(null);
    this.selectedVertex.set(null);
  }

  // ---- Edits, undo and redo ----

  protected edit(change: (state: RouteDraftState) => RouteDraftState): void {
    if (!this.canEdit()) return;
    this.store.apply(change);
  }

  protected undo(): void {
    this.store.undo();
  }

  protected redo(): void {
    this.store.redo();
  }

  protected deleteSelectedVertex(): void {
    const index = this.selectedVertex();
    if (index === null) return;
    this.edit((state) => deleteVertex(state, index));
    this.selectedVertex.set(null);
  }

  protected clearRoute(): void {
    this.edit(() => EMPTY_DRAFT);
  }

  /** Ctrl+Z / Ctrl+Y (and Ctrl+Shift+Z) anywhere but in a text field; Delete removes the selected vertex. */
  protected handleShortcut(event: KeyboardEvent): void {
    const target = event.target as HTMLElement | null;
    if (target && (target.closest('input, textarea, select, [contenteditable="true"]') || !this.canEdit())) return;
    const key = event.key.toLowerCase();
    if ((event.ctrlKey || event.metaKey) && key === 'z' && !event.shiftKey) {
      event.preventDefault();
      this.undo();
    } else if ((event.ctrlKey || event.metaKey) && (key === 'y' || (key === 'z' && event.shiftKey))) {
      event.preventDefault();
      this.redo();
    } else if ((key === 'delete' || key === 'backspace') && this.selectedVertex() !== null) {
      event.preventDefault();
      this.deleteSelectedVertex();
    } else if (key === 'escape') {
      this.pendingLimitFromM.set(null);
      this.selectedVertex.set(null);
    }
  }

  // ---- Tables ----

  /** A coordinate typed in the vertex table (checked there): one undoable step. */
  protected setVertexCoordinate({ index, axis, degrees }: CoordinateChange): void {
    if (index >= this.draft().vertices.length) return;
    this.edit((state) => setVertexCoordinate(state, index, axis, degrees));
  }

  protected insertVertexAfter(index: number): void {
    this.edit((state) => insertVertexAfter(state, index));
    this.selectedVertex.set(null);
  }

  protected deleteVertex(index: number): void {
    this.edit((state) => deleteVertex(state, index));
    this.selectedVertex.set(null);
  }

  /** A stop's name, position or dwell typed in the stops table (checked there): one undoable step. */
  protected changeStop(change: StopChange): void {
    const { index } = change;
    if (index >= this.draft().stops.length) return;
    if (change.field === 'name') this.edit((state) => updateStop(state, index, { name: change.name }));
    else if (change.field === 'dwell') this.edit((state) => updateStop(state, index, { dwellS: change.dwellS }));
    else this.edit((state) => moveStopTo(state, index, change.atM));
  }

  protected removeStop(index: number): void {
    this.edit((state) => removeStop(state, index));
  }

  /** The ends or the limit of a stretch typed in the limits table (checked there): one undoable step. */
  protected changeLimit({ index, change }: LimitChange): void {
    if (index >= this.draft().speedLimits.length) return;
    this.edit((state) => updateSpeedLimit(state, index, change));
  }

  protected addLimitFromTable(): void {
    const lengthM = Math.round(this.lengthM());
    if (lengthM < 2 || this.newLimitSpeed.invalid) return;
    const last = this.draft().speedLimits.at(-1);
    const fromM = last && last.toM < lengthM ? last.toM : 0;
    const speedKph = this.speedKphFromDisplay(this.newLimitSpeed.value);
    this.edit((state) => addSpeedLimit(state, { fromM, toM: lengthM, speedKph }));
  }

  protected removeLimit(index: number): void {
    this.edit((state) => removeSpeedLimit(state, index));
  }

  protected unit(quantity: 'distance' | 'speed'): string {
    return unitLabel(quantity, this.units());
  }

  private speedKphFromDisplay(shown: number): number {
    return speedLimitKphOf(shown, this.units());
  }

  // ---- Loading and saving ----

  protected async showVersion(version: number): Promise<void> {
    const routeId = this.routeId();
    const current = this.saved();
    if (!routeId || !current) return;
    if (version === current.version) {
      this.olderVersion.set(null);
      this.fitTo.set([...current.geometry.coordinates.map(lonLatOf)]);
      return;
    }
    try {
      const older = await this.api.get(routeId, version);
      this.olderVersion.set(older);
      this.fitTo.set(older.geometry.coordinates.map(lonLatOf));
    } catch (error: unknown) {
      this.snackBar.open(describeApiError(error), 'Dismiss');
    }
  }

  protected async save(): Promise<void> {
    if (!this.canEdit() || this.draft().vertices.length < 2) return;
    this.details.markAllAsTouched();
    if (this.details.invalid) {
      this.saveError.set('Give the route a name and check the highlighted details.');
      return;
    }
    this.isSaving.set(true);
    this.saveError.set(null);
    try {
      const body = this.requestBody();
      const routeId = this.routeId();
      const route = routeId ? await this.api.saveVersion(routeId, body) : await this.api.create(body);
      this.showSaved(route, false);
      this.snackBar.open(`Saved version ${route.version} of “${route.name}”.`, 'Dismiss');
      if (!routeId) await this.router.navigate(['/routes', route.id], { replaceUrl: true });
      else void this.loadVersions(route.id);
    } catch (error: unknown) {
      this.saveError.set(describeApiError(error));
    } finally {
      this.isSaving.set(false);
    }
  }

  protected async deleteRoute(): Promise<void> {
    const route = this.saved();
    if (!route) return;
    const confirmed = await confirmDelete(this.dialog, {
      what: 'route',
      name: route.name,
      consequence: 'The route and every saved version of it leave the route list. Scenarios that use it must be deleted first.',
    });
    if (!confirmed) return;
    try {
      await this.api.remove(route.id);
      await this.router.navigate(['/routes']);
    } catch (error: unknown) {
      // The interceptor has shown why (e.g. scenarios still use the route).
      console.warn('Route not deleted', error);
    }
  }

  protected exportUrl(format: 'geojson' | 'gpx'): string | null {
    const routeId = this.routeId();
    return routeId ? this.api.exportUrl(routeId, format) : null;
  }

  /** The request body a save sends: SI units; the server recomputes the stops' `atM`. */
  private requestBody(): RoadRouteDraftInput {
    const { vertices, stops, speedLimits } = this.draft();
    const details = this.details.getRawValue();
    return {
      name: details.name.trim(),
      description: details.description.trim(),
      mode: details.mode,
      geometry: { type: 'LineString', coordinates: vertices.map(positionOf) },
      stops: stops.map((stop) => ({ name: stop.name, lon: stop.lon, lat: stop.lat, dwellS: stop.dwellS })),
      speedLimits: speedLimits.map((stretch) => ({ ...stretch })),
      defaultSpeedLimitKph: this.speedKphFromDisplay(details.defaultSpeedLimit),
      tripsPerDay: details.tripsPerDay,
      serviceDaysPerYear: details.serviceDaysPerYear,
    };
  }

  /** "Try again" after the route failed to load. */
  protected reload(): void {
    this.routeLoad.reload();
  }

  private async loadVersions(routeId: string): Promise<void> {
    try {
      this.versions.set(await this.api.versions(routeId));
    } catch {
      // Expected while the version list is unavailable: the current version still shows.
      this.versions.set([]);
    }
  }

  /** Shows the server's answer (its `atM` for every stop) and starts a fresh undo history. */
  private showSaved(route: RoadRoute, fit: boolean): void {
    this.saved.set(route);
    this.olderVersion.set(null);
    const state = draftOfRoute(route);
    this.store.reset(state);
    this.savedLine.set({ routeId: route.id, version: route.version, vertices: state.vertices });
    this.details.setValue({
      name: route.name,
      mode: route.mode,
      description: route.description,
      defaultSpeedLimit: Number(speedShown(route.defaultSpeedLimitKph, this.units())),
      tripsPerDay: route.tripsPerDay,
      serviceDaysPerYear: route.serviceDaysPerYear,
    });
    this.details.markAsPristine();
    if (fit) this.fitTo.set(state.vertices.map((v) => [v[0], v[1]]));
  }

  private async loadNetwork(): Promise<void> {
    try {
      const network = await this.api.roadNetwork();
      this.network.set(network);
    } catch {
      // Expected when no reference network has been uploaded yet: draw freely.
      this.network.set(null);
    }
  }

  /** A new route starts over the terrain that has been uploaded, or over the road network. */
  private async fitToTerrain(): Promise<void> {
    const network = this.network() ?? (await this.api.roadNetwork().catch(() => null));
    const positions = network?.features.flatMap((feature) => feature.geometry.coordinates.map(lonLatOf)) ?? [];
    if (positions.length > 0 && this.draft().vertices.length === 0) this.fitTo.set(positions);
  }
}
