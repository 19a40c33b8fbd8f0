import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { ServiceDay } from '@shared/domain/service-days';
import { DistanceChart } from '../../../web/app/charts/distance-chart';
import { apiErrorInterceptor } from '../../../web/app/core/api-error-interceptor';
import { RoadRoutesApi } from '../../../web/app/road-routes/road-routes-api';
import ServiceDayResultScreen from '../../../web/app/service-days/service-day-result';
import { DAY_ID, ROUTES, ROUTE_A, block, blockResult, result } from './fixtures';
import { ChartStub } from './stubs';

const h = (hours: number, minutes = 0) => hours * 3600 + minutes * 60;

const DAY: ServiceDay = {
  id: DAY_ID,
  name: 'Winter weekday, end of life',
  dayType: 'weekday',
  season: 'winter',
  batteryAge: 'end-of-life',
  reserveSoc: 0.15,
  inService: true,
  chargers: [
    {
      key: 'tarn',
      name: 'Upper Tarn terminus',
      kind: 'terminus',
      position: [10.2, 46.6],
      powerW: 150_000,
      efficiency: 0.92,
      targetSoc: 0.9,
      connectS: 30,
    },
  ],
  blocks: [block('B1', [[ROUTE_A, h(7), 'outbound']]), block('B2', [[ROUTE_A, h(8), 'outbound']])],
  status: 'done',
  failureReason: null,
  isStale: true,
  staleReasons: ['The vehicle profile “Valley e-bus 12 m” changed.'],
  computedAt: '2026-12-01T08:00:00.000Z',
  createdBy: 'Analyst',
  updatedAt: '2026-12-01T08:00:00.000Z',
};

describe('ServiceDayResultScreen', () => {
  let httpTesting: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [
        provideRouter([]),
        provideHttpClient(withInterceptors([apiErrorInterceptor])),
        provideHttpClientTesting(),
        { provide: RoadRoutesApi, useValue: { list: async () => ROUTES } },
      ],
    });
    TestBed.overrideComponent(ServiceDayResultScreen, { remove: { imports: [DistanceChart] }, add: { imports: [ChartStub] } });
    httpTesting = TestBed.inject(HttpTestingController);
  });

  afterEach(() => httpTesting.verify());

  it('lists the block that cannot be worked first with its reasons, charging, peak power, the stale reason and the cautions', async () => {
    const fixture = TestBed.createComponent(ServiceDayResultScreen);
    fixture.componentRef.setInput('serviceDayId', DAY_ID);
    await settle(fixture);
    httpTesting.expectOne(`/api/service-days/${DAY_ID}`).flush(DAY);
    await settle(fixture);
    const run = result([
      blockResult('B1', {
        chargingEvents: [
          { chargerKey: 'tarn', startS: h(7, 30), endS: h(7, 40), energyWh: 23_000, gridEnergyWh: 25_000, socBefore: 0.55, socAfter: 0.63 },
        ],
      }),
      blockResult('B2', {
        feasible: false,
        minSoc: 0.09,
        endSoc: 0.09,
        problems: ['SOC falls to 9 % at 16:40, below the 15 % reserve.'],
        vehicle: {
          usableCapacityWh: 280_000,
          maxChargePowerW: 255_000,
          auxiliarySource: 'climate',
          tripAuxPowerW: { mean: 14_260, max: 15_000 },
          standingAuxPowerW: 20_460,
          standingHeatingPowerW: 17_460,
          preconditioningEnergyWh: 12_300,
        },
      }),
    ]);
    run.peakChargingPowerW = [{ chargerKey: 'tarn', powerW: 150_000 }];
    httpTesting.expectOne(`/api/service-days/${DAY_ID}/result`).flush(run);
    await settle(fixture);

    const element = fixture.nativeElement as HTMLElement;
    expect(element.querySelector('[data-testid="verdict"] h2')?.textContent).toContain('1 of 2 blocks cannot be worked');
    expect(element.querySelector('[data-testid="verdict"] li')?.textContent).toBe('SOC falls to 9 % at 16:40, below the 15 % reserve.');
    const firstRow = element.querySelector('[data-testid="block-table"] tbody tr')!;
    expect(firstRow.textContent).toContain('B2');
    // Why: the battery at the day's age and what the auxiliaries drew, in the block's row and under its verdict.
    expect(firstRow.querySelector('[data-testid="usable-capacity"]')?.textContent?.trim()).toBe('280.0 kWh');
    expect(firstRow.querySelector('[data-testid="standing-heating"]')?.textContent?.trim()).toBe('17.5 kW');
    expect(element.querySelector('[data-testid="block-why"]')?.textContent?.trim()).toBe(
      'At the end of its life the battery holds 280 kWh usable and charges at up to 255 kW. Auxiliaries drew 14.3 kW on the trips ' +
        '(cabin climate: heating 17.5 kW at a stop, pre-conditioning 12.3 kWh).',
    );
    expect(
      element
        .querySelectorAll('[data-testid="block-table"] tbody tr')[1]
        ?.querySelector('[data-testid="standing-heating"]')
        ?.textContent?.trim(),
    ).toBe('season constant');
    expect(firstRow.textContent).toContain('Cannot be worked');
    const charging = element.querySelector('[data-testid="charging-table"] tbody tr')!.textContent!;
    expect(charging).toContain('Upper Tarn terminus');
    expect(charging).toContain('07:30–07:40');
    expect(charging).toContain('23.0 kWh');
    expect(element.querySelector('[data-testid="peak-table"] tbody tr')?.textContent).toContain('150 kW');
    expect(element.querySelector('[data-testid="stale-banner"]')?.textContent).toContain(
      'The vehicle profile “Valley e-bus 12 m” changed.',
    );
    expect(element.querySelector('[data-testid="advice-cautions"]')).not.toBeNull();
    expect([...element.querySelectorAll('.series')].map((span) => span.textContent)).toEqual([
      'Block B1',
      'Block B2 (cannot be worked)',
      'Reserve (15 %)',
    ]);
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
