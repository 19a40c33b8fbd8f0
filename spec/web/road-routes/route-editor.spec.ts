import { provideHttpClient } from '@angular/common/http';
import { provideHttpClientTesting } from '@angular/common/http/testing';
import { signal } from '@angular/core';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { By } from '@angular/platform-browser';
import { provideRouter } from '@angular/router';
import type { RoadRoute } from '@shared/domain/road-routes';
import { NEVER } from 'rxjs';
import { Session } from '../../../web/app/core/session';
import { DistanceChart } from '../../../web/app/charts/distance-chart';
import { BasemapTilesVersion } from '../../../web/app/map/basemap-tiles-version';
import { TerrainMap } from '../../../web/app/map/terrain-map';
import { RoadRoutesApi } from '../../../web/app/road-routes/road-routes-api';
import RouteEditor from '../../../web/app/road-routes/route-editor';
import { RouteDraftStore } from '../../../web/app/road-routes/route-draft-store';
import type { RouteDraftState } from '../../../web/app/road-routes/route-draft';
import { UnitPreference } from '../../../web/app/units/unit-preference';
import { ChartStub, MapStub } from '../service-days/stubs';
import { settle } from '../support/settle';

const ROUTE_ID = '6f1c2a43-0d5e-4b7a-9c1e-2b8f4d6a7c10';

/** An invented line up the Korvel valley: three vertices, one stop, one speed-limit stretch. */
const ROUTE: RoadRoute = {
  id: ROUTE_ID,
  version: 3,
  versionId: '0b6a7c2d-4e1f-4a3b-8c9d-5e6f7a8b9c0d',
  name: 'Korvel valley line',
  description: 'Station to the upper village',
  mode: 'bus',
  geometry: {
    type: 'LineString',
    coordinates: [
      [10.85, 46.55],
      [10.86, 46.56],
      [10.87, 46.55],
    ],
  },
  stops: [{ name: 'Upper square', lon: 10.855, lat: 46.555, atM: 650, dwellS: 20 }],
  speedLimits: [{ fromM: 200, toM: 1200, speedKph: 30 }],
  defaultSpeedLimitKph: 50,
  tripsPerDay: 24,
  serviceDaysPerYear: 360,
  lengthM: 2690,
  createdBy: 'planner@descentry.example',
  updatedAt: '2026-11-20T08:00:00.000Z',
};

/** Which profile the editor asked for, in order: the saved version's GET or the edited line's POST. */
let profileRequests: string[];

describe('RouteEditor', () => {
  beforeEach(async () => {
    profileRequests = [];
    TestBed.configureTestingModule({
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        {
          provide: RoadRoutesApi,
          useValue: {
            get: async () => structuredClone(ROUTE),
            versions: async () => [],
            // No reference network and no base map: vertices go where they are clicked.
            roadNetwork: async () => null,
            profile: (geometry: RoadRoute['geometry']) => {
              profileRequests.push(`POST ${JSON.stringify(geometry.coordinates)}`);
              return NEVER;
            },
            savedProfile: (routeId: string, version: number) => {
              profileRequests.push(`GET ${routeId} version ${version}`);
              return NEVER;
            },
            exportUrl: (routeId: string, format: string) => `/api/routes/${routeId}/export.${format}`,
          },
        },
        { provide: BasemapTilesVersion, useValue: { state: signal(null), ensureLoaded: () => undefined } },
        { provide: Session, useValue: { can: () => true } },
      ],
    });
    // jsdom has no layout or canvas: the map and the chart are stand-ins with the same inputs and outputs.
    TestBed.overrideComponent(RouteEditor, { remove: { imports: [TerrainMap, DistanceChart] }, add: { imports: [MapStub, ChartStub] } });
    await TestBed.compileComponents();
    TestBed.inject(UnitPreference).choose('metric');
  });

  async function open(): Promise<{ fixture: ComponentFixture<RouteEditor>; element: HTMLElement; store: RouteDraftStore }> {
    const fixture = TestBed.createComponent(RouteEditor);
    fixture.componentRef.setInput('routeId', ROUTE_ID);
    await settle(fixture);
    await settle(fixture);
    const store = fixture.debugElement.injector.get(RouteDraftStore);
    return { fixture, element: fixture.nativeElement as HTMLElement, store };
  }

  function field(element: HTMLElement, label: string): HTMLInputElement {
    const input = element.querySelector<HTMLInputElement>(`input[aria-label="${label}"]`);
    if (!input) throw new Error(`No field labelled “${label}”`);
    return input;
  }

  /** Types `text` into a field as a person does: input events while typing, then change when committing it. */
  async function type(fixture: ComponentFixture<RouteEditor>, input: HTMLInputElement, text: string): Promise<void> {
    input.focus();
    input.value = text;
    input.dispatchEvent(new Event('input'));
    input.dispatchEvent(new Event('change'));
    input.blur();
    await settle(fixture);
  }

  function errorOf(element: HTMLElement, input: HTMLInputElement): string | null {
    const id = input.getAttribute('aria-describedby');
    return id ? (element.querySelector(`#${id}`)?.textContent?.trim() ?? null) : null;
  }

  function button(element: HTMLElement, label: string): HTMLButtonElement {
    const found = element.querySelector<HTMLButtonElement>(`button[aria-label="${label}"]`);
    if (!found) throw new Error(`No button labelled “${label}”`);
    return found;
  }

  it('holds the map back from asking for tiles while the route is read, then gives it the route to fit', async () => {
    const fixture = TestBed.createComponent(RouteEditor);
    fixture.componentRef.setInput('routeId', ROUTE_ID);
    fixture.detectChanges();
    const map = fixture.debugElement.query(By.directive(MapStub)).componentInstance as MapStub;
    expect(map.placing()).toBe(true);
    expect(map.fitTo()).toBeNull();

    await settle(fixture);
    await settle(fixture);

    expect(map.placing()).toBe(false);
    expect(map.fitTo()).toEqual(ROUTE.geometry.coordinates.map(([lon, lat]) => [lon, lat]));
  });

  it('shows the loaded route in the tables as before: six decimals of a degree, km to the metre, whole seconds and km/h', async () => {
    const { element } = await open();

    expect(field(element, 'Longitude of vertex 1').value).toBe('10.850000');
    expect(field(element, 'Latitude of vertex 2').value).toBe('46.560000');
    expect(field(element, 'Name of stop 1').value).toBe('Upper square');
    expect(field(element, 'Position of stop 1 in km').value).toBe('0.65');
    expect(field(element, 'Dwell time of stop 1 in seconds').value).toBe('20');
    expect(field(element, 'Start of stretch 1').value).toBe('0.2');
    expect(field(element, 'End of stretch 1').value).toBe('1.2');
    expect(field(element, 'Limit of stretch 1').value).toBe('30');
  });

  it('moves a vertex when its coordinate is typed, as one undoable step, and prints the value as the table does', async () => {
    const { fixture, element, store } = await open();

    await type(fixture, field(element, 'Latitude of vertex 2'), '46.5625');

    expect(store.draft().vertices[1]).toEqual([10.86, 46.5625]);
    expect(field(element, 'Latitude of vertex 2').value).toBe('46.562500');
    expect(store.canUndo()).toBe(true);
  });

  it('refuses a latitude beyond 90°, says why beside the field and leaves the route as it was', async () => {
    const { fixture, element, store } = await open();
    const before = store.draft();

    const latitude = field(element, 'Latitude of vertex 1');
    await type(fixture, latitude, '95');

    expect(store.draft()).toBe(before);
    expect(store.canUndo()).toBe(false);
    expect(latitude.value).toBe('95');
    expect(latitude.getAttribute('aria-invalid')).toBe('true');
    expect(errorOf(element, latitude)).toBe('A latitude is between −90 and 90 degrees.');

    // Typed right, the message goes and the vertex moves.
    await type(fixture, latitude, '46.551');
    expect(errorOf(element, latitude)).toBeNull();
    expect(store.draft().vertices[0]).toEqual([10.85, 46.551]);
  });

  it('renames a stop, changes its dwell and refuses a dwell of more than an hour', async () => {
    const { fixture, element, store } = await open();

    await type(fixture, field(element, 'Name of stop 1'), '  Korvel upper square ');
    await type(fixture, field(element, 'Dwell time of stop 1 in seconds'), '45');
    expect(store.draft().stops[0]).toMatchObject({ name: 'Korvel upper square', dwellS: 45 });

    const afterValid = store.draft();
    const dwell = field(element, 'Dwell time of stop 1 in seconds');
    await type(fixture, dwell, '4000');
    expect(store.draft()).toBe(afterValid);
    expect(errorOf(element, dwell)).toBe('Between 0 and 3600 s.');

    const name = field(element, 'Name of stop 1');
    await type(fixture, name, '   ');
    expect(store.draft()).toBe(afterValid);
    expect(errorOf(element, name)).toBe('Give the stop a name of at most 120 characters.');
  });

  it('moves a stop to a position typed in km, in metres along the line', async () => {
    const { fixture, element, store } = await open();

    await type(fixture, field(element, 'Position of stop 1 in km'), '1.5');

    expect(store.draft().stops[0]!.atM).toBe(1500);
    expect(field(element, 'Position of stop 1 in km').value).toBe('1.5');
  });

  it('changes a stretch typed in the table and refuses an end before its start or a limit out of range', async () => {
    const { fixture, element, store } = await open();

    await type(fixture, field(element, 'Limit of stretch 1'), '40');
    await type(fixture, field(element, 'End of stretch 1'), '1.45');
    expect(store.draft().speedLimits[0]).toEqual({ fromM: 200, toM: 1450, speedKph: 40 });

    const afterValid = store.draft();
    const end = field(element, 'End of stretch 1');
    await type(fixture, end, '0.1');
    expect(store.draft()).toBe(afterValid);
    expect(errorOf(element, end)).toBe('A stretch must end after it starts.');

    const limit = field(element, 'Limit of stretch 1');
    await type(fixture, limit, '200');
    expect(store.draft()).toBe(afterValid);
    expect(errorOf(element, limit)).toBe('Between 5 and 130 km/h.');
  });

  it('takes a refused start together with the end that makes it valid, as one step', async () => {
    const { fixture, element, store } = await open();

    await type(fixture, field(element, 'Start of stretch 1'), '1.5');
    expect(store.draft().speedLimits[0]).toEqual({ fromM: 200, toM: 1200, speedKph: 30 });
    await type(fixture, field(element, 'End of stretch 1'), '2');

    expect(store.draft().speedLimits[0]).toEqual({ fromM: 1500, toM: 2000, speedKph: 30 });
    button(element, 'Undo (Ctrl+Z)').click();
    await settle(fixture);
    expect(store.draft().speedLimits[0]).toEqual({ fromM: 200, toM: 1200, speedKph: 30 });
  });

  it('brings back the previous route with Undo, in the draft and in the tables', async () => {
    const { fixture, element, store } = await open();
    const loaded: RouteDraftState = store.draft();

    await type(fixture, field(element, 'Longitude of vertex 3'), '10.875');
    await type(fixture, field(element, 'Dwell time of stop 1 in seconds'), '30');
    expect(store.draft()).not.toBe(loaded);

    button(element, 'Undo (Ctrl+Z)').click();
    await settle(fixture);
    expect(field(element, 'Dwell time of stop 1 in seconds').value).toBe('20');
    button(element, 'Undo (Ctrl+Z)').click();
    await settle(fixture);

    expect(store.draft()).toBe(loaded);
    expect(field(element, 'Longitude of vertex 3').value).toBe('10.870000');
    expect(store.canUndo()).toBe(false);
    expect(store.canRedo()).toBe(true);
  });

  it('asks for the saved version’s profile on opening, for the edited line’s after an edit, and the saved one again after Undo', async () => {
    const { fixture, element } = await open();
    const opened = [...profileRequests];

    await type(fixture, field(element, 'Longitude of vertex 3'), '10.875');
    await new Promise((resolve) => setTimeout(resolve, 350));
    await settle(fixture);
    const edited = [...profileRequests];
    button(element, 'Undo (Ctrl+Z)').click();
    await settle(fixture);
    await new Promise((resolve) => setTimeout(resolve, 50));
    await settle(fixture);

    expect(opened).toEqual([`GET ${ROUTE_ID} version 3`]);
    expect(edited).toEqual([...opened, 'POST [[10.85,46.55],[10.86,46.56],[10.875,46.55]]']);
    expect(profileRequests).toEqual([...edited, `GET ${ROUTE_ID} version 3`]);
  });

  it('keeps the text being typed in a field while a map edit changes the route', async () => {
    const { fixture, element, store } = await open();
    const map = fixture.debugElement.query(By.directive(MapStub)).componentInstance as MapStub;

    const longitude = field(element, 'Longitude of vertex 1');
    longitude.focus();
    longitude.value = '10.8512';
    longitude.dispatchEvent(new Event('input'));
    map.mapClicked.emit([10.88, 46.54]);
    await settle(fixture);

    expect(store.draft().vertices).toHaveLength(4);
    expect(field(element, 'Latitude of vertex 4').value).toBe('46.540000');
    expect(longitude.value).toBe('10.8512');

    longitude.dispatchEvent(new Event('change'));
    longitude.blur();
    await settle(fixture);
    expect(store.draft().vertices[0]).toEqual([10.8512, 46.55]);
  });

  it('switches tools: a map click places a stop with the stop tool and two clicks a stretch with the speed-limit tool', async () => {
    const { fixture, element, store } = await open();
    const map = fixture.debugElement.query(By.directive(MapStub)).componentInstance as MapStub;
    const hint = (): string => element.querySelector('p.hint[aria-live]')!.textContent!.replace(/\s+/g, ' ').trim();

    const toolButton = (name: string): HTMLButtonElement =>
      [...element.querySelectorAll<HTMLButtonElement>('mat-button-toggle button')].find((candidate) =>
        candidate.textContent!.includes(name),
      )!;

    toolButton('Stop').click();
    await settle(fixture);
    expect(hint()).toBe('Click on the route where the stop is.');
    map.mapClicked.emit([10.865, 46.555]);
    await settle(fixture);
    expect(store.draft().vertices).toHaveLength(3);
    expect(store.draft().stops).toHaveLength(2);
    expect(element.querySelectorAll('[data-testid="stops-table"] tbody tr')).toHaveLength(2);

    toolButton('Speed limit').click();
    await settle(fixture);
    expect(hint()).toBe('Click on the route where the stretch starts.');
    map.mapClicked.emit([10.851, 46.551]);
    await settle(fixture);
    expect(hint()).toBe('Now click where it ends (Esc cancels).');
    map.mapClicked.emit([10.869, 46.551]);
    await settle(fixture);
    expect(store.draft().speedLimits).toHaveLength(2);
    expect(element.querySelectorAll('[data-testid="limits-table"] tbody tr')).toHaveLength(2);

    toolButton('Draw').click();
    await settle(fixture);
    map.mapClicked.emit([10.88, 46.54]);
    await settle(fixture);
    expect(store.draft().vertices).toHaveLength(4);
  });
});
