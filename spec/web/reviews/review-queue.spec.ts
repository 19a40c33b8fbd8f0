import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import type { HarnessLoader } from '@angular/cdk/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { signal } from '@angular/core';
import { TestBed } from '@angular/core/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatTableHarness } from '@angular/material/table/testing';
import { provideRouter } from '@angular/router';
import type { ReviewItem } from '@shared/domain/reviews';
import { can, type Permission } from '@shared/domain/permissions';
import type { Role } from '@shared/domain/roles';
import { apiErrorInterceptor } from '../../../web/app/core/api-error-interceptor';
import { Session } from '../../../web/app/core/session';
import ReviewQueue from '../../../web/app/reviews/review-queue';
import { BUS_12M, ROUTE_PASS, ROUTE_VALLEY, TROLLEY, aReviewItem } from '../support/review-builders';
import { settle } from '../support/settle';

describe('ReviewQueue', () => {
  let httpTesting: HttpTestingController;
  const role = signal<Role | null>('safety');

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [
        provideRouter([]),
        provideHttpClient(withInterceptors([apiErrorInterceptor])),
        provideHttpClientTesting(),
        {
          provide: Session,
          useValue: { role, can: (permission: Permission) => can(role(), permission), user: signal(null), clear: () => undefined },
        },
      ],
    });
    httpTesting = TestBed.inject(HttpTestingController);
  });

  afterEach(() => httpTesting.verify());

  it('lists the items worst risk first, with our state labels', async () => {
    const { loader } = await renderWith(QUEUE);

    const cells = await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName();

    expect(cells['risk']?.text.map((text) => text.replace(/raised as.*/, '').trim())).toEqual(['Critical', 'High', 'High', 'Elevated']);
    expect(cells['state']?.text.join(' ')).toContain('Risk accepted');
  });

  it('shows the risk an item was raised with when a mitigation changed it', async () => {
    const { loader } = await renderWith(QUEUE);

    const cells = await (await loader.getHarness(MatTableHarness)).getCellTextByColumnName();

    expect(cells['risk']?.text.at(-1)).toContain('raised as high');
  });

  it('counts the items per state', async () => {
    const { fixture } = await renderWith(QUEUE);

    expect(countText(fixture.nativeElement, 'raised')).toBe('2 Raised');
    expect(countText(fixture.nativeElement, 'accepted')).toBe('1 Risk accepted');
    expect(countText(fixture.nativeElement, 'reopened')).toBe('0 Reopened');
  });

  it('narrows the table by risk and by route together', async () => {
    const { fixture, loader } = await renderWith(QUEUE);

    await (await filterSelect(loader, 'Risk')).clickOptions({ text: 'High' });
    await fixture.whenStable();
    expect(await routeNames(loader)).toHaveLength(2);

    await (await filterSelect(loader, 'Route')).clickOptions({ text: 'Valley line' });
    await fixture.whenStable();

    expect(await routeNames(loader)).toEqual(['Valley line']);
    expect(fixture.nativeElement.querySelector('[data-testid="review-count"]').textContent).toContain('1 of 4 review items');
  });

  it('filters by state when a state count is pressed, and back when pressed again', async () => {
    const { fixture, loader } = await renderWith(QUEUE);
    const raisedButton: HTMLButtonElement = fixture.nativeElement.querySelector('[data-testid="count-raised"]');

    raisedButton.click();
    await fixture.whenStable();
    expect(await routeNames(loader)).toHaveLength(2);
    expect(raisedButton.getAttribute('aria-pressed')).toBe('true');

    raisedButton.click();
    await fixture.whenStable();
    expect(await routeNames(loader)).toHaveLength(4);
  });

  it('says so when nothing matches the filters', async () => {
    const { fixture, loader } = await renderWith(QUEUE);

    await (await filterSelect(loader, 'State')).clickOptions({ text: 'Reopened' });
    await fixture.whenStable();

    expect(fixture.nativeElement.textContent).toContain('No review item matches these filters.');
  });

  async function renderWith(items: ReviewItem[]) {
    const fixture = TestBed.createComponent(ReviewQueue);
    fixture.detectChanges(); // the list loads once the page is first rendered
    httpTesting.expectOne('/api/reviews').flush({ items, caution: 'Figures are engineering estimates.' });
    await settle(fixture);
    return { fixture, loader: TestbedHarnessEnvironment.loader(fixture) };
  }
});

const QUEUE: ReviewItem[] = [
  aReviewItem({ risk: 'high', raisedRisk: 'high', state: 'raised', ...ROUTE_PASS, ...BUS_12M }),
  aReviewItem({ risk: 'critical', raisedRisk: 'critical', state: 'raised', ...ROUTE_PASS, ...TROLLEY }),
  aReviewItem({ risk: 'elevated', raisedRisk: 'high', state: 'mitigated', ...ROUTE_VALLEY, ...BUS_12M }),
  aReviewItem({ risk: 'high', raisedRisk: 'high', state: 'accepted', ...ROUTE_VALLEY, ...TROLLEY }),
];

function countText(root: HTMLElement, state: string): string {
  return root.querySelector(`[data-testid="count-${state}"]`)?.getAttribute('aria-label') ?? '';
}

async function routeNames(loader: HarnessLoader): Promise<string[]> {
  const table = await loader.getHarness(MatTableHarness);
  const rows = await table.getRows();
  const names: string[] = [];
  for (const row of rows) {
    const [cell] = await row.getCells({ columnName: 'route' });
    names.push(((await cell?.getText()) ?? '').split(/Outbound|Inbound|Round trip/)[0]!.trim());
  }
  return names;
}

async function filterSelect(loader: HarnessLoader, label: string): Promise<MatSelectHarness> {
  const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: label }));
  return (await field.getControl(MatSelectHarness))!;
}
