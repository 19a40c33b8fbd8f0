import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { Calibration } from '@shared/domain/calibrations';
import CalibrationDetail, { CALIBRATION_POLL_INTERVAL_MS } from '../../../web/app/calibration/calibration-detail';
import { apiErrorInterceptor } from '../../../web/app/core/api-error-interceptor';

const PROFILE_ID = '2b4f6a1c-8d3e-4f5a-9b7c-1d2e3f4a5b6c';
const FIRST_ID = '7c1d2e3f-4a5b-4c6d-8e9f-0a1b2c3d4e5f';
const SECOND_ID = '9e8d7c6b-5a4f-4e3d-8c2b-1a0f9e8d7c6b';
const PROFILE_URL = `/api/vehicles/${PROFILE_ID}`;
const calibrationUrl = (id: string) => `/api/calibrations/${id}`;
const PROFILE_MISSING = { error: { code: 'not_found', message: 'The vehicle profile was not found' } };

describe('CalibrationDetail', () => {
  let httpTesting: HttpTestingController;

  beforeEach(() => {
    vi.useFakeTimers();
    TestBed.configureTestingModule({
      providers: [provideRouter([]), provideHttpClient(withInterceptors([apiErrorInterceptor])), provideHttpClientTesting()],
    });
    httpTesting = TestBed.inject(HttpTestingController);
  });

  afterEach(() => {
    httpTesting.verify();
    vi.useRealTimers();
  });

  it('asks again while the fit is queued or running and stops once it has settled', async () => {
    const fixture = await render(FIRST_ID);
    httpTesting.expectOne(calibrationUrl(FIRST_ID)).flush(aCalibration({ status: 'queued' }));
    await tick(fixture, 0);
    httpTesting.expectOne(PROFILE_URL).flush(PROFILE_MISSING, { status: 404, statusText: 'Not Found' });
    await tick(fixture, 0);
    expect(text(fixture)).toContain('Waiting for a worker');

    await tick(fixture, CALIBRATION_POLL_INTERVAL_MS);
    httpTesting.expectOne(calibrationUrl(FIRST_ID)).flush(aCalibration({ status: 'running' }));
    await tick(fixture, 0);
    expect(text(fixture)).toContain('Replaying the trips and fitting');

    await tick(fixture, CALIBRATION_POLL_INTERVAL_MS);
    httpTesting
      .expectOne(calibrationUrl(FIRST_ID))
      .flush(aCalibration({ status: 'failed', failureReason: 'The trips hold too few steps to fit' }));
    await tick(fixture, 0);
    // The settled fit asks for the profile again: its version may have moved meanwhile.
    httpTesting.expectOne(PROFILE_URL).flush(PROFILE_MISSING, { status: 404, statusText: 'Not Found' });
    await tick(fixture, 0);
    expect(text(fixture)).toContain('The fit could not run: The trips hold too few steps to fit');

    await tick(fixture, CALIBRATION_POLL_INTERVAL_MS * 10);
    httpTesting.expectNone(calibrationUrl(FIRST_ID));
  });

  it('keeps showing the fit and goes on asking when one poll fails', async () => {
    const fixture = await render(FIRST_ID);
    httpTesting.expectOne(calibrationUrl(FIRST_ID)).flush(aCalibration({ status: 'running' }));
    await tick(fixture, 0);
    httpTesting.expectOne(PROFILE_URL).flush(PROFILE_MISSING, { status: 404, statusText: 'Not Found' });

    await tick(fixture, CALIBRATION_POLL_INTERVAL_MS);
    httpTesting.expectOne(calibrationUrl(FIRST_ID)).flush(null, { status: 0, statusText: 'Unknown Error' });
    await tick(fixture, 0);

    expect(text(fixture)).toContain('Replaying the trips and fitting');
    expect(text(fixture)).toContain('Still trying');
    await tick(fixture, CALIBRATION_POLL_INTERVAL_MS);
    httpTesting.expectOne(calibrationUrl(FIRST_ID)).flush(aCalibration({ status: 'failed', failureReason: 'No steps' }));
    await tick(fixture, 0);
    httpTesting.expectOne(PROFILE_URL).flush(PROFILE_MISSING, { status: 404, statusText: 'Not Found' });
    await tick(fixture, 0);
    expect(text(fixture)).not.toContain('Still trying');
  });

  it('never shows the answer for an earlier id once another fit is opened', async () => {
    const fixture = await render(FIRST_ID);
    const earlier = httpTesting.expectOne(calibrationUrl(FIRST_ID));

    fixture.componentRef.setInput('calibrationId', SECOND_ID);
    await tick(fixture, 0);
    httpTesting.expectOne(calibrationUrl(SECOND_ID)).flush(aCalibration({ id: SECOND_ID, status: 'failed', failureReason: 'Later fit' }));
    await tick(fixture, 0);
    httpTesting.expectOne(PROFILE_URL).flush(PROFILE_MISSING, { status: 404, statusText: 'Not Found' });
    await tick(fixture, 0);
    // The earlier request answers last: it must not replace what is shown.
    earlier.flush(aCalibration({ id: FIRST_ID, status: 'failed', failureReason: 'Earlier fit' }));
    await tick(fixture, 0);

    expect(text(fixture)).toContain('The fit could not run: Later fit');
    expect(text(fixture)).not.toContain('Earlier fit');
  });

  it('offers Try again when the first load fails, and loads on it', async () => {
    const fixture = await render(FIRST_ID);
    httpTesting.expectOne(calibrationUrl(FIRST_ID)).flush(null, { status: 0, statusText: 'Unknown Error' });
    await tick(fixture, 0);
    const retry = [...(fixture.nativeElement as HTMLElement).querySelectorAll('button')].find((b) => b.textContent?.includes('Try again'));
    expect(retry).toBeDefined();

    retry!.click();
    await tick(fixture, 0);
    httpTesting.expectOne(calibrationUrl(FIRST_ID)).flush(aCalibration({ status: 'failed', failureReason: 'No steps' }));
    await tick(fixture, 0);
    httpTesting.expectOne(PROFILE_URL).flush(PROFILE_MISSING, { status: 404, statusText: 'Not Found' });
    await tick(fixture, 0);

    expect(text(fixture)).toContain('The fit could not run: No steps');
  });

  it('stops asking when the page is left', async () => {
    const fixture = await render(FIRST_ID);
    httpTesting.expectOne(calibrationUrl(FIRST_ID)).flush(aCalibration({ status: 'running' }));
    await tick(fixture, 0);
    httpTesting.expectOne(PROFILE_URL).flush(PROFILE_MISSING, { status: 404, statusText: 'Not Found' });

    fixture.destroy();
    await vi.advanceTimersByTimeAsync(CALIBRATION_POLL_INTERVAL_MS * 5);

    httpTesting.expectNone(calibrationUrl(FIRST_ID));
  });

  async function render(calibrationId: string): Promise<ComponentFixture<CalibrationDetail>> {
    const fixture = TestBed.createComponent(CalibrationDetail);
    fixture.componentRef.setInput('vehicleProfileId', PROFILE_ID);
    fixture.componentRef.setInput('calibrationId', calibrationId);
    await tick(fixture, 0);
    return fixture;
  }
});

function aCalibration(overrides: Partial<Calibration> = {}): Calibration {
  return {
    id: FIRST_ID,
    vehicleProfileId: PROFILE_ID,
    vehicleProfileName: 'Highpass 12 m battery bus',
    profileVersion: 1,
    status: 'queued',
    failureReason: null,
    loggedTrips: [{ id: 'trip-1', name: 'Morning run' }],
    fit: ['rollingResistanceCoefficient'],
    fitted: null,
    intervals: null,
    rmsErrorW: null,
    energyErrorPercent: null,
    residuals: null,
    result: null,
    decision: null,
    decidedAt: null,
    decidedBy: null,
    acceptedVersion: null,
    rerunBatchId: null,
    createdBy: 'Analyst One',
    createdAt: '2026-11-30T10:00:00.000Z',
    finishedAt: null,
    ...overrides,
  };
}

/** Moves the fake clock, lets promise chains finish, and renders. */
async function tick(fixture: ComponentFixture<unknown>, ms: number): Promise<void> {
  await vi.advanceTimersByTimeAsync(ms);
  fixture.detectChanges();
  await vi.advanceTimersByTimeAsync(0);
  fixture.detectChanges();
}

function text(fixture: ComponentFixture<unknown>): string {
  return ((fixture.nativeElement as HTMLElement).textContent ?? '').replace(/\s+/g, ' ');
}
