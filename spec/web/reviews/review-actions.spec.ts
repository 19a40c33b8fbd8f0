import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { TestBed } from '@angular/core/testing';
import { MatButtonHarness } from '@angular/material/button/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { provideRouter } from '@angular/router';
import type { ReviewItem, ReviewTransitionResult } from '@shared/domain/reviews';
import { apiErrorInterceptor } from '../../../web/app/core/api-error-interceptor';
import { Session } from '../../../web/app/core/session';
import { ReviewActions } from '../../../web/app/reviews/review-actions';
import { aReviewItem, anAuditEvent } from '../support/review-builders';
import { settle } from '../support/settle';

describe('ReviewActions', () => {
  let httpTesting: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideRouter([]), provideHttpClient(withInterceptors([apiErrorInterceptor])), provideHttpClientTesting()],
    });
    httpTesting = TestBed.inject(HttpTestingController);
  });

  afterEach(() => httpTesting.verify());

  it('offers only the moves open from the state', async () => {
    const { fixture, loader } = await render(aReviewItem({ state: 'raised' }));
    expect(await buttonTexts(loader)).toEqual(['Acknowledge']);

    fixture.componentRef.setInput('item', aReviewItem({ state: 'in-review' }));
    await fixture.whenStable();
    expect(await buttonTexts(loader)).toEqual(['Record mitigation', 'Propose risk acceptance']);
  });

  it('offers the sign-off to a second safety officer, and only the send-back to the one who proposed it', async () => {
    const session = TestBed.inject(Session);
    vi.spyOn(session, 'user').mockReturnValue(aUser({ id: PROPOSER_ID }));
    const { fixture, loader } = await render(aReviewItem({ state: 'awaiting-sign-off', acceptanceProposedById: OTHER_ID }));
    expect(await buttonTexts(loader)).toEqual(['Sign off acceptance', 'Send back']);

    fixture.componentRef.setInput('item', aReviewItem({ state: 'awaiting-sign-off', acceptanceProposedById: PROPOSER_ID }));
    await fixture.whenStable();
    expect(await buttonTexts(loader)).toEqual(['Send back']);
    expect(fixture.nativeElement.querySelector('[data-testid="awaiting-second-officer"]')?.textContent).toContain(
      'Another safety officer must sign it off',
    );
  });

  it('signs off with one click', async () => {
    const item = aReviewItem({ state: 'awaiting-sign-off', acceptanceProposedById: OTHER_ID });
    const { fixture, loader, emitted } = await render(item);

    await (await loader.getHarness(MatButtonHarness.with({ text: /Sign off acceptance/ }))).click();
    const request = httpTesting.expectOne({ method: 'POST', url: `/api/reviews/${item.id}/transitions` });
    request.flush(resultFor({ ...item, state: 'accepted' }));
    await settle(fixture);

    expect(request.request.body).toEqual({ action: 'sign-off' });
    expect(emitted[0]?.result.item.state).toBe('accepted');
  });

  it('acknowledges with one click and reports the server answer', async () => {
    const item = aReviewItem({ state: 'raised' });
    const { fixture, loader, emitted } = await render(item);

    await (await loader.getHarness(MatButtonHarness.with({ text: /Acknowledge/ }))).click();
    const request = httpTesting.expectOne({ method: 'POST', url: `/api/reviews/${item.id}/transitions` });
    request.flush(resultFor({ ...item, state: 'in-review' }));
    await settle(fixture);

    expect(request.request.body).toEqual({ action: 'acknowledge' });
    expect(emitted[0]?.result.item.state).toBe('in-review');
  });

  it('does not send a mitigation without a measure and says what is missing', async () => {
    const { fixture, loader } = await render(aReviewItem({ state: 'in-review' }));

    await (await loader.getHarness(MatButtonHarness.with({ text: /Record mitigation/ }))).click();
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Re-run and save mitigation' }))).click();
    await fixture.whenStable();

    httpTesting.expectNone(() => true);
    expect(fixture.nativeElement.querySelector('[data-testid="no-measure"]')?.textContent).toContain(
      'Name a descent speed cap or an SOC ceiling',
    );
  });

  it('does not send a mitigation that is only a vehicle restriction, and points to risk acceptance', async () => {
    const { fixture, loader } = await render(aReviewItem({ state: 'in-review' }));

    await (await loader.getHarness(MatButtonHarness.with({ text: /Record mitigation/ }))).click();
    await (
      await loader.getHarness(MatInputHarness.with({ selector: '[formControlName="vehicleRestriction"]' }))
    ).setValue('Midibuses only');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Re-run and save mitigation' }))).click();
    await fixture.whenStable();

    httpTesting.expectNone(() => true);
    expect(fixture.nativeElement.querySelector('[data-testid="no-measure"]')?.textContent).toContain('propose accepting the risk');
  });

  it('sends a mitigation to be re-run', async () => {
    const item = aReviewItem({ state: 'in-review' });
    const { fixture, loader, emitted } = await render(item);

    await (await loader.getHarness(MatButtonHarness.with({ text: /Record mitigation/ }))).click();
    await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName="descentSpeedCapKph"]' }))).setValue('25');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Re-run and save mitigation' }))).click();
    const request = httpTesting.expectOne(`/api/reviews/${item.id}/transitions`);
    request.flush(resultFor({ ...item, state: 'mitigated' }));
    await settle(fixture);

    expect(request.request.body).toEqual({ action: 'mitigate', mitigation: { descentSpeedCapKph: 25 }, rerun: true });
    expect(emitted[0]?.rerunRequested).toBe(true);
  });

  it('does not accept a risk with a reason under 10 characters', async () => {
    const { fixture, loader } = await render(aReviewItem({ state: 'in-review' }));

    await (await loader.getHarness(MatButtonHarness.with({ text: /Propose risk acceptance/ }))).click();
    await (await loader.getHarness(MatInputHarness.with({ selector: '[formControlName="reason"]' }))).setValue('Fine.');
    await (await loader.getHarness(MatButtonHarness.with({ text: 'Propose acceptance', selector: '[type="submit"]' }))).click();
    await fixture.whenStable();

    httpTesting.expectNone(() => true);
    expect(fixture.nativeElement.textContent).toContain('Give a reason of at least 10 characters.');
  });

  it('shows the server refusal inline', async () => {
    const item = aReviewItem({ state: 'raised' });
    const { fixture, loader } = await render(item);

    await (await loader.getHarness(MatButtonHarness.with({ text: /Acknowledge/ }))).click();
    httpTesting
      .expectOne(`/api/reviews/${item.id}/transitions`)
      .flush({ error: { code: 'conflict', message: 'Someone else moved this item first.' } }, { status: 409, statusText: 'Conflict' });
    await settle(fixture);

    expect(fixture.nativeElement.querySelector('[role="alert"]')?.textContent).toContain('Someone else moved this item first.');
  });

  async function render(item: ReviewItem) {
    const fixture = TestBed.createComponent(ReviewActions);
    fixture.componentRef.setInput('item', item);
    const emitted: { result: ReviewTransitionResult; rerunRequested: boolean }[] = [];
    fixture.componentInstance.transitioned.subscribe((change) => emitted.push(change));
    await fixture.whenStable();
    return { fixture, loader: TestbedHarnessEnvironment.loader(fixture), emitted };
  }
});

const PROPOSER_ID = '11111111-1111-4111-8111-111111111111';
const OTHER_ID = '22222222-2222-4222-8222-222222222222';

function aUser(overrides: { id: string }) {
  return { id: overrides.id, email: 'officer@example.test', name: 'Spec Officer', role: 'safety' as const };
}

function resultFor(item: ReviewItem): ReviewTransitionResult {
  return {
    item,
    event: anAuditEvent({ reviewId: item.id, toState: item.state }),
    caution: 'Figures are engineering estimates.',
  };
}

async function buttonTexts(loader: HarnessLoader): Promise<string[]> {
  const buttons = await loader.getAllHarnesses(MatButtonHarness);
  const texts = await Promise.all(buttons.map((button) => button.getText()));
  // Drop the icon ligature that precedes each label.
  return texts.map((text) => text.replace(/^[a-z_]+\s*/, '').trim());
}
