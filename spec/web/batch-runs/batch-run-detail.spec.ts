import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import BatchRunDetail from '../../../web/app/batch-runs/batch-run-detail';
import { BATCH_POLL_INTERVAL_MS } from '../../../web/app/batch-runs/batch-run-poller';
import { apiErrorInterceptor } from '../../../web/app/core/api-error-interceptor';
import { aBatchRun } from '../support/review-builders';

const RUN_URL = `/api/batch-runs/${aBatchRun().id}`;

describe('BatchRunDetail', () => {
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

  it('shows the progress, asks again while the run is going and stops once it is done', async () => {
    const fixture = await render();
    httpTesting.expectOne(RUN_URL).flush(aBatchRun({ status: 'running', done: 1 }));
    await tick(fixture, 0);
    expect(progressText(fixture)).toMatch(/Running: 1 of 3 scenarios done \(33 %\)/);

    await tick(fixture, BATCH_POLL_INTERVAL_MS);
    httpTesting.expectOne(RUN_URL).flush(aBatchRun({ status: 'running', done: 2 }));
    await tick(fixture, 0);
    expect(progressText(fixture)).toMatch(/2 of 3 scenarios done \(67 %\)/);

    await tick(fixture, BATCH_POLL_INTERVAL_MS);
    httpTesting.expectOne(RUN_URL).flush(
      aBatchRun({
        status: 'done',
        done: 2,
        failed: 1,
        finishedAt: '2026-11-30T10:03:00.000Z',
        items: [
          { scenarioId: aBatchRun().items[0]!.scenarioId, scenarioName: 'Pass road, winter', status: 'done', error: null },
          { scenarioId: aBatchRun().items[1]!.scenarioId, scenarioName: 'Valley line, summer', status: 'done', error: null },
          {
            scenarioId: aBatchRun().items[2]!.scenarioId,
            scenarioName: 'Ridge loop, winter',
            status: 'failed',
            error: 'No terrain covers 2.0–3.1 km',
          },
        ],
      }),
    );
    await tick(fixture, 0);
    expect(progressText(fixture)).toMatch(/Finished: 2 of 3 scenarios done, 1 failed \(100 %\)/);
    expect(fixture.nativeElement.textContent).toContain('No terrain covers 2.0–3.1 km');

    await tick(fixture, BATCH_POLL_INTERVAL_MS * 10);
    httpTesting.expectNone(RUN_URL);
  });

  it('does not ask again for a run that was already done', async () => {
    const fixture = await render();
    httpTesting.expectOne(RUN_URL).flush(aBatchRun({ status: 'done', done: 3 }));
    await tick(fixture, 0);

    await tick(fixture, BATCH_POLL_INTERVAL_MS * 5);

    httpTesting.expectNone(RUN_URL);
  });

  it('stops asking when the page is left', async () => {
    const fixture = await render();
    httpTesting.expectOne(RUN_URL).flush(aBatchRun({ status: 'running' }));
    await tick(fixture, 0);

    fixture.destroy();
    await vi.advanceTimersByTimeAsync(BATCH_POLL_INTERVAL_MS * 5);

    httpTesting.expectNone(RUN_URL);
  });

  async function render(): Promise<ComponentFixture<BatchRunDetail>> {
    const fixture = TestBed.createComponent(BatchRunDetail);
    fixture.componentRef.setInput('batchRunId', aBatchRun().id);
    await tick(fixture, 0);
    return fixture;
  }
});

/** Moves the fake clock, lets promise chains finish, and renders. */
async function tick(fixture: ComponentFixture<unknown>, ms: number): Promise<void> {
  await vi.advanceTimersByTimeAsync(ms);
  fixture.detectChanges();
  await vi.advanceTimersByTimeAsync(0);
  fixture.detectChanges();
}

function progressText(fixture: ComponentFixture<unknown>): string {
  return ((fixture.nativeElement as HTMLElement).querySelector('[data-testid="batch-progress"]')?.textContent ?? '')
    .replace(/\s+/g, ' ')
    .replace(/ ,/g, ',')
    .trim();
}
