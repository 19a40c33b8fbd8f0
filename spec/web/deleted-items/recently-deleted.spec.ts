import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import type { DeletedItem } from '@shared/domain/deleted-items';
import type { Role } from '@shared/domain/roles';
import { apiErrorInterceptor } from '../../../web/app/core/api-error-interceptor';
import { Session } from '../../../web/app/core/session';
import RecentlyDeleted from '../../../web/app/deleted-items/recently-deleted';
import { settle } from '../support/settle';

describe('RecentlyDeleted (issue 11)', () => {
  let httpTesting: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideRouter([]), provideHttpClient(withInterceptors([apiErrorInterceptor])), provideHttpClientTesting()],
    });
    httpTesting = TestBed.inject(HttpTestingController);
  });

  afterEach(() => httpTesting.verify());

  it('lists what was deleted with who deleted it, and offers a planner to restore routes and scenarios only', async () => {
    const fixture = await renderAs('planner', ITEMS);

    expect(rowTexts(fixture)).toEqual([
      expect.stringMatching(/^Route \| Mill Road loop \| .* \| Marta Oyelaran \| .* \| restore_from_trash Restore$/),
      expect.stringMatching(/^Vehicle profile \| Valley bus \| .* \| Restored by energy & terrain analysts$/),
      expect.stringMatching(/^Scenario \| Summit, winter \| .* \| Cannot be restored yet: its route is deleted too/),
    ]);
  });

  it('restores with the kind’s own endpoint and takes the row off the list', async () => {
    const fixture = await renderAs('planner', ITEMS);

    button(fixture, 'Restore Mill Road loop').click();
    httpTesting.expectOne({ method: 'POST', url: `/api/routes/${ITEMS[0]!.id}/restore` }).flush(null);
    await settle(fixture);

    expect(rowTexts(fixture)).toHaveLength(2);
  });

  it('says so when nothing was deleted', async () => {
    const fixture = await renderAs('analyst', []);

    expect((fixture.nativeElement as HTMLElement).textContent).toContain('Nothing was deleted in the last 30 days.');
  });

  async function renderAs(role: Role, items: DeletedItem[]) {
    const session = TestBed.inject(Session);
    (session as unknown as { setUser(user: object): void }).setUser({
      id: '99999999-9999-4999-8999-999999999999',
      email: 'p@x.example',
      name: 'P',
      role,
    });
    const fixture = TestBed.createComponent(RecentlyDeleted);
    httpTesting.expectOne('/api/deleted-items').flush({ items, retentionDays: 30 });
    await settle(fixture);
    return fixture;
  }
});

function rowTexts(fixture: ComponentFixture<unknown>): string[] {
  const rows = (fixture.nativeElement as HTMLElement).querySelectorAll('tr.mat-mdc-row:not(.no-rows)');
  return [...rows].map((row) =>
    [...row.querySelectorAll('td')].map((cell) => (cell.textContent ?? '').replace(/\s+/g, ' ').trim()).join(' | '),
  );
}

function button(fixture: ComponentFixture<unknown>, label: string): HTMLButtonElement {
  return (fixture.nativeElement as HTMLElement).querySelector(`button[aria-label="${label}"]`) as HTMLButtonElement;
}

const ITEMS: DeletedItem[] = [
  {
    kind: 'route',
    id: '11111111-1111-4111-8111-111111111111',
    name: 'Mill Road loop',
    deletedAt: '2026-03-02T10:00:00.000Z',
    deletedBy: 'Marta Oyelaran',
    removedAfter: '2026-04-01T10:00:00.000Z',
    blockedBy: null,
  },
  {
    kind: 'vehicle-profile',
    id: '22222222-2222-4222-8222-222222222222',
    name: 'Valley bus',
    deletedAt: '2026-03-01T10:00:00.000Z',
    deletedBy: 'Tomás Leclerc',
    removedAfter: '2026-03-31T10:00:00.000Z',
    blockedBy: null,
  },
  {
    kind: 'scenario',
    id: '33333333-3333-4333-8333-333333333333',
    name: 'Summit, winter',
    deletedAt: '2026-02-28T10:00:00.000Z',
    deletedBy: 'Marta Oyelaran',
    removedAfter: '2026-03-30T10:00:00.000Z',
    blockedBy: 'its route is deleted too: restore the route first',
  },
];
