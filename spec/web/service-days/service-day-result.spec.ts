import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { ServiceDay } from '@shared/domain/service-days';
import { DistanceChart } from '../../../web/app/charts/distance-chart';
import { apiErrorInterceptor } from '../../../web/app/core/api-error-interceptor';
import { RoadRoutesApi } from '../../../web/app/road-routes/road-routes-api';
import ServiceDayResultScreen from '../../../web/app/service-days/service-day-result';
import { settle } from '../support/settle';
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
      blockResult('B2', { feasible: false, minSoc: 0.09, endSoc: 0.09, problems: ['SOC falls to 9 % at 16:40, below the 15 % reserve.'] }),
    ]);
    run.peakChargingPowerW = [{ chargerKey: 'tarn', powerW: 150_000 }];
    httpTesting.expectOne(`/api/service-days/${DAY_ID}/result`).flush(run);
    await settle(fixture);

    const element = fixture.nativeElement as HTMLElement;
    expect(element.querySelector('[data-testid="verdict"] h2')?.textContent).toContain('1 of 2 blocks cannot be worked');
    expect(element.querySelector('[data-testid="verdict"] li')?.textContent).toBe('SOC falls to 9 % at 16:40, below the 15 % reserve.');
    const firstRow = element.querySelector('[data-testid="block-table"] tbody tr')!;
    expect(firstRow.textContent).toContain('B2');
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
