import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatInputHarness } from '@angular/material/input/testing';
import { DEFAULT_CO2_REFERENCE_VEHICLE, DEFAULT_DAY_COUNTS, type NetworkSettingsView } from '@shared/domain/board-summary';
import NetworkSettings from '../../../../web/app/admin/network/network-settings';
import { apiErrorInterceptor } from '../../../../web/app/core/api-error-interceptor';
import { settle } from '../../support/settle';

const STORED: NetworkSettingsView = {
  energyTariffPerKWh: 0.21,
  currency: 'EUR',
  tariffSource: 'Highpass Valley supply contract, clause 7',
  gridEmissionFactorKgPerKWh: 0.25,
  emissionFactorSource: 'Valley grid operator disclosure',
  worstCaseAmbientC: 38,
  fadeMarginK: 60,
  maxRoadGradePercent: 14,
  crawlSpeedKph: 6,
  crawlDistanceM: 250,
  dayCounts: DEFAULT_DAY_COUNTS,
  co2ReferenceVehicle: DEFAULT_CO2_REFERENCE_VEHICLE,
  isPlaceholder: false,
  updatedAt: '2026-11-02T09:30:00.000Z',
  updatedByName: 'Ada Brennan',
};

describe('NetworkSettings', () => {
  let httpTesting: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideHttpClient(withInterceptors([apiErrorInterceptor])), provideHttpClientTesting()],
    });
    httpTesting = TestBed.inject(HttpTestingController);
  });

  afterEach(() => httpTesting.verify());

  async function render() {
    const fixture = TestBed.createComponent(NetworkSettings);
    fixture.detectChanges();
    httpTesting.expectOne({ method: 'GET', url: '/api/settings/network' }).flush(STORED);
    await settle(fixture);
    return { fixture, loader: TestbedHarnessEnvironment.loader(fixture) };
  }

  it('shows the stored safety settings and sends all five with the factors when saved', async () => {
    const { fixture, loader } = await render();
    const ambient = await loader.getHarness(MatInputHarness.with({ selector: '[formControlName="worstCaseAmbientC"]' }));

    expect(await ambient.getValue()).toBe('38');
    await ambient.setValue('40');
    (fixture.nativeElement as HTMLElement).querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
    const request = httpTesting.expectOne({ method: 'PUT', url: '/api/settings/network' });
    request.flush({ ...STORED, worstCaseAmbientC: 40 });
    await settle(fixture);

    expect(request.request.body).toMatchObject({
      worstCaseAmbientC: 40,
      fadeMarginK: 60,
      maxRoadGradePercent: 14,
      crawlSpeedKph: 6,
      crawlDistanceM: 250,
    });
  });

  it('refuses a margin outside the contract’s range without sending anything', async () => {
    const { fixture, loader } = await render();

    await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName="fadeMarginK"]' }))).setValue('400');
    (fixture.nativeElement as HTMLElement).querySelector<HTMLButtonElement>('button[type="submit"]')!.click();
    await settle(fixture);

    httpTesting.expectNone({ method: 'PUT', url: '/api/settings/network' });
    expect((fixture.nativeElement as HTMLElement).textContent).toContain('Between 0 and 300 K.');
  });
});
