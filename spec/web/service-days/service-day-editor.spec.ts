import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { apiErrorInterceptor } from '../../../web/app/core/api-error-interceptor';
import { TerrainMap } from '../../../web/app/map/terrain-map';
import { RoadRoutesApi } from '../../../web/app/road-routes/road-routes-api';
import ServiceDayEditor from '../../../web/app/service-days/service-day-editor';
import { VehicleProfilesApi } from '../../../web/app/vehicles/vehicle-profiles-api';
import { ROUTES, ROUTE_A, VEHICLE } from './fixtures';
import { MapStub } from './stubs';

describe('ServiceDayEditor', () => {
  let httpTesting: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [
        provideRouter([]),
        provideHttpClient(withInterceptors([apiErrorInterceptor])),
        provideHttpClientTesting(),
        {
          provide: RoadRoutesApi,
          useValue: {
            list: async () => ROUTES,
            get: async (id: string) => ({
              ...ROUTES.find((route) => route.id === id),
              geometry: {
                type: 'LineString',
                coordinates: [
                  [10.1, 46.5],
                  [10.2, 46.6],
                ],
              },
            }),
          },
        },
        { provide: VehicleProfilesApi, useValue: { list: async () => [{ id: VEHICLE, name: 'Valley e-bus 12 m' }] } },
      ],
    });
    TestBed.overrideComponent(ServiceDayEditor, { remove: { imports: [TerrainMap] }, add: { imports: [MapStub] } });
    httpTesting = TestBed.inject(HttpTestingController);
  });

  afterEach(() => httpTesting.verify());

  async function openNew(): Promise<ComponentFixture<ServiceDayEditor>> {
    const fixture = TestBed.createComponent(ServiceDayEditor);
    await settle(fixture);
    await settle(fixture);
    return fixture;
  }

  function type(element: HTMLElement, selector: string, value: string, event: 'input' | 'change'): void {
    const input = element.querySelector<HTMLInputElement>(selector)!;
    input.value = value;
    input.dispatchEvent(new Event(event));
  }

  it('keeps every entry when the server refuses the save, and shows the problem beside the trip it concerns', async () => {
    const fixture = await openNew();
    const element = fixture.nativeElement as HTMLElement;
    type(element, '[data-testid="day-name"]', 'Winter weekday, worn batteries', 'input');
    element.querySelector<HTMLButtonElement>('[data-testid="add-block"]')!.click();
    await settle(fixture);
    element.querySelector<HTMLButtonElement>('[data-testid="add-trip"]')!.click();
    element.querySelector<HTMLButtonElement>('[data-testid="add-trip"]')!.click();
    await settle(fixture);
    expect(element.querySelectorAll('.bar.trip')).toHaveLength(2);

    element.querySelector<HTMLButtonElement>('[data-testid="save"]')!.click();
    const request = httpTesting.expectOne((candidate) => candidate.method === 'POST' && candidate.url === '/api/service-days');
    expect(request.request.body).toMatchObject({
      name: 'Winter weekday, worn batteries',
      blocks: [
        {
          blockId: 'Block 1',
          vehicleProfileId: VEHICLE,
          trips: [
            { routeId: ROUTE_A, direction: 'outbound', departureS: 6 * 3600 + 600 },
            { routeId: ROUTE_A, direction: 'inbound' },
          ],
        },
      ],
    });
    request.flush(
      {
        error: {
          code: 'invalid_request',
          message: 'Block “Block 1”, trip 2: the route has no version 7.',
          details: { path: ['blocks', 0, 'trips', 1, 'routeId'] },
        },
      },
      { status: 422, statusText: 'Unprocessable Entity' },
    );
    await settle(fixture);

    expect(element.querySelector('[data-testid="save-error"]')?.textContent).toContain('trip 2: the route has no version 7');
    const tripRows = [...element.querySelectorAll('table[aria-label^="Trips of block"] tbody tr')];
    expect(tripRows).toHaveLength(2);
    expect(tripRows[1]!.querySelector('.field-error')?.textContent).toContain('the route has no version 7');
    expect(tripRows[0]!.querySelector('.field-error')).toBeNull();
    expect(element.querySelector<HTMLInputElement>('[data-testid="day-name"]')!.value).toBe('Winter weekday, worn batteries');
  });

  it('does not send a draft with an unreadable time, and says so beside the field', async () => {
    const fixture = await openNew();
    const element = fixture.nativeElement as HTMLElement;
    type(element, '[data-testid="day-name"]', 'Sunday summer', 'input');
    element.querySelector<HTMLButtonElement>('[data-testid="add-block"]')!.click();
    await settle(fixture);
    element.querySelector<HTMLButtonElement>('[data-testid="add-trip"]')!.click();
    await settle(fixture);
    type(element, 'input[aria-label="Departure of trip 1, HH:MM"]', '7.15', 'change');
    await settle(fixture);

    element.querySelector<HTMLButtonElement>('[data-testid="save"]')!.click();
    await settle(fixture);
    httpTesting.expectNone('/api/service-days');
    expect(element.querySelector('table[aria-label^="Trips of block"] .field-error')?.textContent).toContain('HH:MM');
    expect(element.querySelector('[data-testid="save-error"]')?.textContent).toContain('need attention');
  });
});

/**
 * Lets the answers flushed so far reach the page and renders it. Not `whenStable`: a resource
 * whose request is still open holds the application unstable until the test answers it.
 */
async function settle(fixture: ComponentFixture<unknown>): Promise<void> {
  for (let round = 0; round < 3; round++) {
    await new Promise((resolve) => setTimeout(resolve, 0));
    fixture.detectChanges();
  }
}
