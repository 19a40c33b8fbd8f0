import {
  ChangeDetectionStrategy,
  Component,
  computed,
  inject,
  input,
  linkedSignal,
  resource,
  signal,
  type ResourceRef,
  type WritableSignal,
} from '@angular/core';
import { FormsModule } from '@angular/forms';
import { MatButtonModule } from '@angular/material/button';
import { MatButtonToggleModule } from '@angular/material/button-toggle';
import { MatFormFieldModule } from '@angular/material/form-field';
import { MatIconModule } from '@angular/material/icon';
import { MatInputModule } from '@angular/material/input';
import { MatProgressBarModule } from '@angular/material/progress-bar';
import { MatSelectModule } from '@angular/material/select';
import { MatSlideToggleModule } from '@angular/material/slide-toggle';
import { Router, RouterLink } from '@angular/router';
import { SERVICE_DAY_LIMITS, type NumberRange } from '@shared/domain/limits';
import { LoadStatus } from '../ui/load-status';
import { loadStateOf } from '../ui/load-state';
import type { RoadRoute, RoadRouteSummary } from '@shared/domain/road-routes';
import { LOAD_CASES, SEASONS, type LoadCase, type VehicleProfile } from '@shared/domain/vehicle-profiles';
import {
  BATTERY_AGES,
  CHARGER_KINDS,
  TRIP_DIRECTIONS,
  DAY_TYPES,
  type Block,
  type BlockTrip,
  type Charger,
  type ChargerKind,
  type ServiceDayDraft,
} from '@shared/domain/service-days';
import {
  BATTERY_AGE_LABELS,
  CHARGER_KIND_LABELS,
  DAY_TYPE_LABELS,
  DIRECTION_LABELS,
  LOAD_LABELS,
  SEASON_LABELS,
  formatServiceTime,
  parseServiceTime,
} from '@shared/presentation/index';
import { apiErrorBody, describeApiError } from '../core/api-error-message';
import { TerrainMap, type MapOverlay, type MapOverlayEvent, type MapPosition } from '../map/terrain-map';
import { RoadRoutesApi } from '../road-routes/road-routes-api';
import { VehicleProfilesApi } from '../vehicles/vehicle-profiles-api';
import { checkDraft, draftOf, emptyDraft, fieldErrors, hasErrorWithin, newBlock, newCharger, nextTrip } from './service-day-editor-model';
import { ServiceDayTimeline } from './service-day-timeline';
import { timelineRows } from './service-day-timeline-model';
import { ServiceDaysApi, type GtfsBlocksAnswer, type GtfsService } from './service-days-api';

/** Colours of the chargers on the map, by kind, and of the routes the blocks run. */
const CHARGER_COLOURS: Readonly<Record<ChargerKind, string>> = { depot: '#6a4c93', terminus: '#3f7f4f' };
const ROUTE_COLOUR = '#0b5567';

/**
 * Analysts and administrators build a service day: the kind of day, season and battery age;
 * chargers placed on the map; blocks on a timeline, each a vehicle's trips from saved routes.
 * The draft lives in this page until it is saved: a refused save keeps every entry and shows
 * each problem beside the field it concerns.
 */
/** A share's range (0–1) in percent, as the editor's fields show it. */
function percentRange(range: NumberRange): { min: number; max: number } {
  return { min: Math.round(range.min * 100), max: Math.round(range.max * 100) };
}

/** The editor's number fields in the units they show, from the contract's limits. */
const FIELD_RANGES = {
  chargerPowerKw: { min: SERVICE_DAY_LIMITS.chargerPowerW.min / 1000, max: SERVICE_DAY_LIMITS.chargerPowerW.max / 1000 },
  chargerEfficiencyPercent: percentRange(SERVICE_DAY_LIMITS.chargerEfficiency),
  chargerTargetSocPercent: percentRange(SERVICE_DAY_LIMITS.chargerTargetSoc),
  reservePercent: percentRange(SERVICE_DAY_LIMITS.reserveSoc),
  startSocPercent: percentRange(SERVICE_DAY_LIMITS.startSoc),
} as const;

@Component({
  selector: 'app-service-day-editor',
  imports: [
    FormsModule,
    RouterLink,
    MatButtonModule,
    MatButtonToggleModule,
    MatFormFieldModule,
    MatIconModule,
    MatInputModule,
    LoadStatus,
    MatProgressBarModule,
    MatSelectModule,
    MatSlideToggleModule,
    ServiceDayTimeline,
    TerrainMap,
  ],
  templateUrl: './service-day-editor.html',
  styleUrl: './service-day-editor.scss',
  changeDetection: ChangeDetectionStrategy.OnPush,
})
export default class ServiceDayEditor {
  private readonly api = inject(ServiceDaysApi);
  private readonly routesApi = inject(RoadRoutesApi);
  private readonly vehiclesApi = inject(VehicleProfilesApi);
  private readonly router = inject(Router);

  /** From `service-days/:serviceDayId/edit`; absent for a new one. */
  readonly serviceDayId = input<string | undefined>();

  protected readonly ranges = FIELD_RANGES;
  protected readonly dayTypes = DAY_TYPES;
  protected readonly seasons = SEASONS;
  protected readonly batteryAges = BATTERY_AGES;
  protected readonly chargerKinds = CHARGER_KINDS;
  protected readonly loadCases = LOAD_CASES;
  protected readonly dayTypeLabels = DAY_TYPE_LABELS;
  protected readonly seasonLabels = SEASON_LABELS;
  protected readonly batteryAgeLabels = BATTERY_AGE_LABELS;
  protected readonly chargerKindLabels = CHARGER_KIND_LABELS;
  protected readonly directionLabels = DIRECTION_LABELS;
  protected readonly loadLabels = LOAD_LABELS;
  protected readonly chargerColours = CHARGER_COLOURS;

  protected readonly draft = signal<ServiceDayDraft>(emptyDraft());
  protected readonly routes = signal<RoadRouteSummary[]>([]);
  protected readonly profiles = signal<VehicleProfile[]>([]);
  /**
   * The routes, the vehicle profiles and (when editing) the service day, asked for by id: a new id
   * starts a new load and an answer for an earlier one is never used. The draft is filled in the
   * loader, once per answer, so nothing the person typed since is overwritten.
   */
  protected readonly data = resource({
    params: () => ({ serviceDayId: this.serviceDayId() ?? null }),
    loader: async ({ params, abortSignal }) => {
      const [routes, profiles, day] = await Promise.all([
        this.routesApi.list(),
        this.vehiclesApi.list(),
        params.serviceDayId ? this.api.get(params.serviceDayId) : Promise.resolve(null),
      ]);
      if (!abortSignal.aborted) {
        this.routes.set(routes);
        this.profiles.set(profiles);
        this.tripRouteId.set(routes[0]?.id ?? null);
        if (day) {
          this.draft.set(draftOf(day));
          const positions = day.chargers.map((charger) => charger.position);
          if (positions.length > 0) this.fitTo.set(positions);
        }
      }
      return { routes, profiles, day };
    },
  });
  protected readonly loadState = loadStateOf(this.data);
  protected readonly isLoading = computed(() => this.loadState().status !== 'ready');
  /** Every route the blocks run and the one chosen for the next trip, sorted; a new array only when the set changes. */
  private readonly usedRouteIds = computed(
    () => {
      const used = new Set(this.draft().blocks.flatMap((block) => block.trips.map((trip) => trip.routeId)));
      const chosen = this.tripRouteId();
      if (chosen) used.add(chosen);
      return [...used].sort();
    },
    { equal: (a, b) => a.join() === b.join() },
  );
  /** The lines of every route the blocks run (and the one chosen for the next trip), so chargers can be placed at its ends. */
  private readonly shapesData: ResourceRef<ReadonlyMap<string, RoadRoute> | undefined> = resource({
    params: () => ({ routeIds: this.usedRouteIds() }),
    loader: async ({ params }): Promise<ReadonlyMap<string, RoadRoute>> => {
      const known: ReadonlyMap<string, RoadRoute> = this.routeShapes();
      const missing = params.routeIds.filter((id) => !known.has(id));
      if (missing.length === 0) return known;
      const loaded = await Promise.all(missing.map((id) => this.routesApi.get(id)));
      const next = new Map<string, RoadRoute>(known);
      for (const route of loaded) next.set(route.id, route);
      if (this.draft().chargers.length === 0 || !this.fitTo()) {
        this.fitTo.set([...next.values()].flatMap((route) => route.geometry.coordinates.map(([lon, lat]) => [lon, lat] as MapPosition)));
      }
      return next;
    },
  });
  /** The route lines drawn: every line loaded so far (a failed load leaves a line out; the editor still works). */
  protected readonly routeShapes: WritableSignal<ReadonlyMap<string, RoadRoute>> = linkedSignal<
    ReadonlyMap<string, RoadRoute> | undefined,
    ReadonlyMap<string, RoadRoute>
  >({
    source: () => (this.shapesData.hasValue() ? this.shapesData.value() : undefined),
    computation: (shapes, previous) => shapes ?? previous?.value ?? new Map(),
  });
  protected readonly isSaving = signal(false);
  protected readonly saveError = signal<string | null>(null);
  /** Problems by field path (`blocks.0.trips.1.departureS`), from the last check or refused save. */
  protected readonly errors = signal<ReadonlyMap<string, string>>(new Map());
  /** Entries that could not be read (a time, a percentage); the draft keeps the last good value. */
  protected readonly inputErrors = signal<ReadonlyMap<string, string>>(new Map());
  protected readonly selectedBlockIndex = signal(0);
  /** The kind of charger the next click on the map places, or null when not placing. */
  protected readonly placing = signal<ChargerKind | null>(null);
  /** Route the next "Add trip" uses. */
  protected readonly tripRouteId = signal<string | null>(null);
  protected readonly fitTo = signal<MapPosition[] | null>(null);

  /** The "Import blocks from GTFS" panel: the feed, its services, the choices and the preview. */
  protected readonly gtfsOpen = signal(false);
  protected readonly gtfsFile = signal<File | null>(null);
  protected readonly gtfsServices = signal<GtfsService[]>([]);
  protected readonly gtfsServiceId = signal<string | null>(null);
  protected readonly gtfsProfileId = signal<string | null>(null);
  protected readonly gtfsDepotKey = signal<string>('');
  protected readonly gtfsPreview = signal<GtfsBlocksAnswer | null>(null);
  protected readonly gtfsBusy = signal(false);
  protected readonly gtfsError = signal<string | null>(null);

  protected readonly selectedBlock = computed<Block | null>(() => this.draft().blocks[this.selectedBlockIndex()] ?? null);

  protected readonly timeline = computed(() =>
    timelineRows(this.draft().blocks, (routeId) => this.routes().find((route) => route.id === routeId)),
  );

  protected readonly depotChargers = computed(() => this.draft().chargers.filter((charger) => charger.kind === 'depot'));

  protected readonly overlays = computed<MapOverlay[]>(() => {
    const overlays: MapOverlay[] = [];
    for (const route of this.routeShapes().values()) {
      overlays.push({
        kind: 'line',
        id: `route:${route.id}`,
        positions: route.geometry.coordinates.map(([lon, lat]) => [lon, lat] as MapPosition),
        color: ROUTE_COLOUR,
        weight: 4,
        opacity: 0.8,
        label: route.name,
      });
    }
    this.draft().chargers.forEach((charger) => {
      overlays.push({
        kind: 'pin',
        id: `charger:${charger.key}`,
        at: charger.position,
        color: CHARGER_COLOURS[charger.kind],
        label: charger.name,
        draggable: true,
      });
    });
    return overlays;
  });

  protected routeName(routeId: string): string {
    return this.routes().find((route) => route.id === routeId)?.name ?? 'Unknown route';
  }

  protected error(path: string): string | null {
    return this.inputErrors().get(path) ?? this.errors().get(path) ?? null;
  }

  protected blockHasError(index: number): boolean {
    return hasErrorWithin(this.errors(), `blocks.${index}`) || hasErrorWithin(this.inputErrors(), `blocks.${index}`);
  }

  protected time(timeS: number): string {
    return formatServiceTime(timeS);
  }

  protected percent(fraction: number): number {
    return Math.round(fraction * 1000) / 10;
  }

  // The day

  protected setDay<K extends 'name' | 'dayType' | 'season' | 'batteryAge' | 'inService'>(key: K, value: ServiceDayDraft[K]): void {
    this.draft.update((draft) => ({ ...draft, [key]: value }));
    this.clearError(key);
  }

  protected setReserve(text: string): void {
    this.setFraction(text, 'reserveSoc', SERVICE_DAY_LIMITS.reserveSoc, (fraction) =>
      this.draft.update((draft) => ({ ...draft, reserveSoc: fraction })),
    );
  }

  // Chargers

  protected togglePlacing(kind: ChargerKind): void {
    this.placing.update((current) => (current === kind ? null : kind));
  }

  protected mapClicked(at: MapPosition): void {
    const kind = this.placing();
    if (!kind) return;
    this.draft.update((draft) => ({ ...draft, chargers: [...draft.chargers, newCharger(draft.chargers, [at[0], at[1]], kind)] }));
    this.placing.set(null);
  }

  protected chargerMoved(event: MapOverlayEvent): void {
    if (!event.id.startsWith('charger:')) return;
    const key = event.id.slice('charger:'.length);
    this.updateCharger(
      this.draft().chargers.findIndex((charger) => charger.key === key),
      { position: [event.at[0], event.at[1]] },
    );
  }

  protected setChargerKind(index: number, text: string): void {
    const kind = CHARGER_KINDS.find((known) => known === text);
    if (kind) this.updateCharger(index, { kind });
  }

  protected updateCharger(index: number, change: Partial<Charger>): void {
    if (index < 0) return;
    this.draft.update((draft) => ({
      ...draft,
      chargers: draft.chargers.map((charger, i) => (i === index ? { ...charger, ...change } : charger)),
    }));
  }

  protected setChargerNumber(index: number, field: 'powerW' | 'efficiency' | 'targetSoc', text: string): void {
    const path = `chargers.${index}.${field}`;
    if (field === 'powerW') {
      const kw = Number(text);
      const { min, max } = FIELD_RANGES.chargerPowerKw;
      if (text.trim() === '' || !Number.isFinite(kw) || kw < min || kw > max) return this.setError(path, `Power from ${min} to ${max} kW.`);
      this.clearError(path);
      return this.updateCharger(index, { powerW: kw * 1000 });
    }
    const range = field === 'efficiency' ? SERVICE_DAY_LIMITS.chargerEfficiency : SERVICE_DAY_LIMITS.chargerTargetSoc;
    this.setFraction(text, path, range, (fraction) => this.updateCharger(index, { [field]: fraction }));
  }

  protected removeCharger(index: number): void {
    const removed = this.draft().chargers[index];
    if (!removed) return;
    this.draft.update((draft) => ({
      ...draft,
      chargers: draft.chargers.filter((_, i) => i !== index),
      blocks: draft.blocks.map((block) => (block.depotChargerKey === removed.key ? withoutDepot(block) : block)),
    }));
  }

  // Blocks from a GTFS feed

  protected toggleGtfs(): void {
    this.gtfsOpen.update((open) => !open);
    if (!this.gtfsProfileId()) this.gtfsProfileId.set(this.profiles()[0]?.id ?? null);
  }

  /** A feed was picked: list its services (the first with blocks is chosen). */
  protected async gtfsFilePicked(input: HTMLInputElement): Promise<void> {
    const file = input.files?.[0] ?? null;
    this.gtfsFile.set(file);
    this.gtfsServices.set([]);
    this.gtfsServiceId.set(null);
    this.gtfsPreview.set(null);
    this.gtfsError.set(null);
    if (!file) return;
    this.gtfsBusy.set(true);
    try {
      const services = await this.api.gtfsServices(file);
      this.gtfsServices.set(services);
      this.gtfsServiceId.set(services.find((service) => service.blocks > 0)?.serviceId ?? services[0]?.serviceId ?? null);
      if (services.every((service) => service.blocks === 0))
        this.gtfsError.set(`${file.name}: no trip in trips.txt has a block_id, so there are no blocks to import.`);
    } catch (error) {
      this.gtfsError.set(describeApiError(error));
    } finally {
      this.gtfsBusy.set(false);
    }
  }

  protected setGtfsChoice(change: { serviceId?: string; profileId?: string; depotKey?: string }): void {
    if (change.serviceId !== undefined) this.gtfsServiceId.set(change.serviceId);
    if (change.profileId !== undefined) this.gtfsProfileId.set(change.profileId);
    if (change.depotKey !== undefined) this.gtfsDepotKey.set(change.depotKey);
    this.gtfsPreview.set(null);
  }

  /** Asks for the chosen service's blocks and shows them, without touching the draft. */
  protected async previewGtfs(): Promise<void> {
    const file = this.gtfsFile();
    const serviceId = this.gtfsServiceId();
    const vehicleProfileId = this.gtfsProfileId();
    if (!file || !serviceId || !vehicleProfileId) return;
    this.gtfsBusy.set(true);
    this.gtfsError.set(null);
    this.gtfsPreview.set(null);
    try {
      const depotChargerKey = this.depotChargers().some((charger) => charger.key === this.gtfsDepotKey()) ? this.gtfsDepotKey() : undefined;
      this.gtfsPreview.set(await this.api.gtfsBlocks(file, { serviceId, vehicleProfileId, depotChargerKey }));
    } catch (error) {
      this.gtfsError.set(describeApiError(error));
    } finally {
      this.gtfsBusy.set(false);
    }
  }

  /** Adds the previewed blocks to the draft; a block id already in the draft gets a suffix. */
  protected addGtfsBlocks(): void {
    const preview = this.gtfsPreview();
    if (!preview) return;
    this.draft.update((draft) => {
      const taken = new Set(draft.blocks.map((block) => block.blockId));
      const added = preview.blocks.map((block) => {
        let blockId = block.blockId;
        for (let n = 2; taken.has(blockId); n++) blockId = `${block.blockId} (${n})`;
        taken.add(blockId);
        return { ...block, blockId };
      });
      return { ...draft, blocks: [...draft.blocks, ...added] };
    });
    this.selectedBlockIndex.set(Math.max(0, this.draft().blocks.length - preview.blocks.length));
    this.clearError('blocks');
    this.gtfsOpen.set(false);
    this.gtfsPreview.set(null);
  }

  /** The saved routes a block's trips run on, by name. */
  protected routeNames(block: Block): string {
    const ids = [...new Set(block.trips.map((trip) => trip.routeId))];
    return ids.map((id) => this.routes().find((route) => route.id === id)?.name ?? 'a saved route').join(', ');
  }

  protected clock(seconds: number): string {
    const h = Math.floor(seconds / 3600);
    const m = Math.floor((seconds % 3600) / 60);
    return `${String(h).padStart(2, '0')}:${String(m).padStart(2, '0')}`;
  }

  // Blocks

  protected addBlock(): void {
    const vehicle = this.profiles()[0];
    if (!vehicle) return;
    this.draft.update((draft) => ({ ...draft, blocks: [...draft.blocks, newBlock(draft.blocks, vehicle.id, draft.chargers)] }));
    this.selectedBlockIndex.set(this.draft().blocks.length - 1);
  }

  protected selectBlock(blockId: string): void {
    const index = this.draft().blocks.findIndex((block) => block.blockId === blockId);
    if (index >= 0) this.selectedBlockIndex.set(index);
  }

  protected removeBlock(index: number): void {
    this.draft.update((draft) => ({ ...draft, blocks: draft.blocks.filter((_, i) => i !== index) }));
    this.selectedBlockIndex.set(Math.max(0, Math.min(index, this.draft().blocks.length - 1)));
  }

  protected updateBlock(change: Partial<Block>): void {
    const index = this.selectedBlockIndex();
    this.draft.update((draft) => ({ ...draft, blocks: draft.blocks.map((block, i) => (i === index ? { ...block, ...change } : block)) }));
  }

  protected setDepot(key: string | null): void {
    const block = this.selectedBlock();
    if (!block) return;
    this.updateBlock(key ? { depotChargerKey: key } : withoutDepot(block));
  }

  protected setBlockTime(field: 'pullOutS' | 'pullInS', text: string): void {
    const path = `blocks.${this.selectedBlockIndex()}.${field}`;
    const timeS = parseServiceTime(text);
    if (timeS === null) return this.setError(path, 'A time as HH:MM, up to 36:00 for after midnight.');
    this.clearError(path);
    this.updateBlock({ [field]: timeS });
  }

  protected setStartSoc(text: string): void {
    this.setFraction(text, `blocks.${this.selectedBlockIndex()}.startSoc`, SERVICE_DAY_LIMITS.startSoc, (fraction) =>
      this.updateBlock({ startSoc: fraction }),
    );
  }

  protected addTrip(): void {
    const block = this.selectedBlock();
    const routeId = this.tripRouteId() ?? block?.trips.at(-1)?.routeId ?? this.routes()[0]?.id;
    if (!block || !routeId) return;
    const trip = nextTrip(block, routeId, (id) => this.routes().find((route) => route.id === id)?.lengthM);
    this.updateBlock({ trips: [...block.trips, trip] });
    this.clearError(`blocks.${this.selectedBlockIndex()}.trips`);
  }

  protected updateTrip(tripIndex: number, change: Partial<BlockTrip>): void {
    const block = this.selectedBlock();
    if (!block) return;
    this.updateBlock({ trips: block.trips.map((trip, i) => (i === tripIndex ? { ...trip, ...change } : trip)) });
  }

  protected setTripRoute(tripIndex: number, routeId: string): void {
    const block = this.selectedBlock();
    const trip = block?.trips[tripIndex];
    if (!trip) return;
    const { routeVersion: _version, ...rest } = trip;
    this.updateBlock({ trips: block.trips.map((other, i) => (i === tripIndex ? { ...rest, routeId } : other)) });
  }

  protected setTripTime(tripIndex: number, text: string): void {
    const path = `blocks.${this.selectedBlockIndex()}.trips.${tripIndex}.departureS`;
    const timeS = parseServiceTime(text);
    if (timeS === null) return this.setError(path, 'A time as HH:MM, up to 36:00 for after midnight.');
    this.clearError(path);
    this.updateTrip(tripIndex, { departureS: timeS });
  }

  protected setTripLoad(tripIndex: number, text: string): void {
    const loadCase = LOAD_CASES.find((known) => known === text);
    if (loadCase) this.updateTrip(tripIndex, { load: { kind: 'case', case: loadCase } });
  }

  protected setTripDirection(tripIndex: number, text: string): void {
    const direction = TRIP_DIRECTIONS.find((known) => known === text);
    if (direction) this.updateTrip(tripIndex, { direction });
  }

  protected tripLoadCase(trip: BlockTrip): LoadCase | null {
    return trip.load.kind === 'case' ? trip.load.case : null;
  }

  protected removeTrip(tripIndex: number): void {
    const block = this.selectedBlock();
    if (!block) return;
    this.updateBlock({ trips: block.trips.filter((_, i) => i !== tripIndex) });
  }

  // Saving

  protected async save(andRun: boolean): Promise<void> {
    this.saveError.set(null);
    const draft = this.draft();
    const problems = checkDraft(draft);
    for (const [path, message] of this.inputErrors()) if (!problems.has(path)) problems.set(path, message);
    if (problems.size > 0) {
      this.errors.set(problems);
      this.saveError.set('Some entries need attention; each is marked beside its field.');
      this.openFirstProblemBlock(problems);
      return;
    }
    this.isSaving.set(true);
    try {
      const id = this.serviceDayId();
      const saved = id ? await this.api.update(id, draft) : await this.api.create(draft);
      if (andRun) await this.api.run(saved.id);
      await this.router.navigate(['/service-days', saved.id]);
    } catch (error: unknown) {
      // The draft stays as it was: nothing typed is lost, the problems are shown beside their fields.
      const body = apiErrorBody(error);
      const message = describeApiError(error);
      const errors = body ? fieldErrors(body.details, body.message) : new Map<string, string>();
      this.errors.set(errors);
      this.saveError.set(message);
      this.openFirstProblemBlock(errors);
    } finally {
      this.isSaving.set(false);
    }
  }

  private openFirstProblemBlock(problems: ReadonlyMap<string, string>): void {
    for (const path of problems.keys()) {
      const match = /^blocks\.(\d+)/.exec(path);
      if (match) {
        this.selectedBlockIndex.set(Number(match[1]));
        return;
      }
    }
  }

  /** A percentage typed for a share in `range` (0–1): applied as a fraction, or refused with the range in %. */
  private setFraction(text: string, path: string, range: NumberRange, apply: (fraction: number) => void): void {
    const { min, max } = percentRange(range);
    const value = Number(text);
    if (text.trim() === '' || !Number.isFinite(value) || value < min || value > max) {
      this.setError(path, `${min} to ${max} %.`);
      return;
    }
    this.clearError(path);
    apply(value / 100);
  }

  private setError(path: string, message: string): void {
    this.inputErrors.update((errors) => new Map(errors).set(path, message));
  }

  /** The entry at `path` is good again: forget what was said about it. */
  private clearError(path: string): void {
    for (const store of [this.inputErrors, this.errors]) {
      if (!store().has(path)) continue;
      store.update((errors) => {
        const next = new Map(errors);
        next.delete(path);
        return next;
      });
    }
  }
}

function withoutDepot(block: Block): Block {
  const { depotChargerKey: _key, ...rest } = block;
  return rest;
}
