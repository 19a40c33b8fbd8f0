import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatFormFieldHarness } from '@angular/material/form-field/testing';
import { provideRouter } from '@angular/router';
import type { AuditEvent } from '@shared/domain/audit';
import AuditLog from '../../../../web/app/admin/audit/audit-log';
import { apiErrorInterceptor } from '../../../../web/app/core/api-error-interceptor';
import { settle } from '../../support/settle';

describe('AuditLog (issue 11)', () => {
  let httpTesting: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideRouter([]), provideHttpClient(withInterceptors([apiErrorInterceptor])), provideHttpClientTesting()],
    });
    httpTesting = TestBed.inject(HttpTestingController);
  });

  afterEach(() => httpTesting.verify());

  it('shows who changed what, with the details in words', async () => {
    const fixture = TestBed.createComponent(AuditLog);
    fixture.detectChanges(); // the list loads once the page is first rendered
    httpTesting.expectOne((request) => request.url === '/api/audit-log').flush({ items: EVENTS, total: 2, page: 1, pageSize: 50 });
    await settle(fixture);

    const rows = rowTexts(fixture);
    expect(rows[0]).toMatch(/ \| Marta Oyelaran \| Deleted \| Route \| Mill Road loop \| —$/);
    expect(rows[1]).toMatch(
      / \| Descentry \(automatic\) \| Removed for good \| Terrain model \| Old valley model \| deleted by: Tomás Leclerc$/,
    );
  });

  it('asks the server again, from the first page, when a filter changes', async () => {
    const fixture = TestBed.createComponent(AuditLog);
    fixture.detectChanges(); // the list loads once the page is first rendered
    httpTesting.expectOne((request) => request.url === '/api/audit-log').flush({ items: EVENTS, total: 2, page: 1, pageSize: 50 });
    await settle(fixture);
    const loader = TestbedHarnessEnvironment.loader(fixture);

    const field = await loader.getHarness(MatFormFieldHarness.with({ floatingLabelText: 'Change' }));
    await (await field.getControl(MatSelectHarness))!.clickOptions({ text: 'Deleted' });
    await new Promise((resolve) => setTimeout(resolve, 300));
    const request = httpTesting.expectOne((candidate) => candidate.url === '/api/audit-log');

    expect(request.request.params.get('action')).toBe('delete');
    expect(request.request.params.get('page')).toBe('1');
    request.flush({ items: [EVENTS[0]], total: 1, page: 1, pageSize: 50 });
    await settle(fixture);
    expect(rowTexts(fixture)).toHaveLength(1);
  });
});

function rowTexts(fixture: ComponentFixture<unknown>): string[] {
  const rows = (fixture.nativeElement as HTMLElement).querySelectorAll('tr.mat-mdc-row:not(.no-rows)');
  return [...rows].map((row) =>
    [...row.querySelectorAll('td')].map((cell) => (cell.textContent ?? '').replace(/\s+/g, ' ').trim()).join(' | '),
  );
}

const EVENTS: AuditEvent[] = [
  {
    id: '11111111-1111-4111-8111-111111111111',
    at: '2026-03-02T10:00:00.000Z',
    actor: { id: '22222222-2222-4222-8222-222222222222', name: 'Marta Oyelaran' },
    action: 'delete',
    kind: 'route',
    entityId: '33333333-3333-4333-8333-333333333333',
    entityName: 'Mill Road loop',
    details: {},
  },
  {
    id: '44444444-4444-4444-8444-444444444444',
    at: '2026-03-01T03:00:00.000Z',
    actor: { id: null, name: 'Descentry (automatic)' },
    action: 'purge',
    kind: 'terrain',
    entityId: '55555555-5555-4555-8555-555555555555',
    entityName: 'Old valley model',
    details: { deletedBy: 'Tomás Leclerc' },
  },
];
