import { provideHttpClient, withInterceptors } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed, type ComponentFixture } from '@angular/core/testing';
import { TestbedHarnessEnvironment } from '@angular/cdk/testing/testbed';
import type { HarnessLoader } from '@angular/cdk/testing';
import { MatInputHarness } from '@angular/material/input/testing';
import { MatSelectHarness } from '@angular/material/select/testing';
import { MatSortHarness } from '@angular/material/sort/testing';
import { provideRouter } from '@angular/router';
import type { Person } from '@shared/domain/people';
import People from '../../../../web/app/admin/people/people';
import { apiErrorInterceptor } from '../../../../web/app/core/api-error-interceptor';
import { settle } from '../../support/settle';

describe('People', () => {
  let httpTesting: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideRouter([]), provideHttpClient(withInterceptors([apiErrorInterceptor])), provideHttpClientTesting()],
    });
    httpTesting = TestBed.inject(HttpTestingController);
  });

  afterEach(() => httpTesting.verify());

  it('lists everyone sorted by name', async () => {
    const { fixture } = await renderWith(EVERYONE);

    expect(names(fixture)).toEqual(['Ada Brennan', 'Jonas Pfeifer', 'Marta Oyelaran', 'Tomás Leclerc']);
  });

  it('filters by text in the name or the e-mail address', async () => {
    const { fixture, loader } = await renderWith(EVERYONE);

    await (await loader.getHarness(MatInputHarness)).setValue('leclerc');
    await fixture.whenStable();

    expect(names(fixture)).toEqual(['Tomás Leclerc']);
    expect(fixture.nativeElement.querySelector('[data-testid="people-count"]').textContent).toContain('1 of 4 people');
  });

  it('filters by role and by status together', async () => {
    const { fixture, loader } = await renderWith(EVERYONE);

    await (await filterSelect(loader, 'Role')).clickOptions({ text: 'Safety officer' });
    await fixture.whenStable();
    expect(names(fixture)).toEqual(['Jonas Pfeifer', 'Marta Oyelaran']);

    await (await filterSelect(loader, 'Status')).clickOptions({ text: 'Disabled' });
    await fixture.whenStable();
    expect(names(fixture)).toEqual(['Jonas Pfeifer']);
  });

  it('says so when nobody matches', async () => {
    const { fixture, loader } = await renderWith(EVERYONE);

    await (await loader.getHarness(MatInputHarness)).setValue('nobody-by-this-name');
    await fixture.whenStable();

    expect(fixture.nativeElement.textContent).toContain('Nobody matches these filters.');
  });

  it('sorts by name in reverse when the name header is clicked twice', async () => {
    const { fixture, loader } = await renderWith(EVERYONE);

    const sort = await loader.getHarness(MatSortHarness);
    const [nameHeader] = await sort.getSortHeaders({ label: 'Name and e-mail' });
    await nameHeader!.click();
    await fixture.whenStable();

    expect(await nameHeader!.getSortDirection()).toBe('desc');
    expect(names(fixture)).toEqual(['Tomás Leclerc', 'Marta Oyelaran', 'Jonas Pfeifer', 'Ada Brennan']);
  });

  it('changes a role with PATCH and shows the answer', async () => {
    const { fixture, loader } = await renderWith(EVERYONE);
    const roleSelect = await loader.getHarness(MatSelectHarness.with({ selector: '[aria-label="Role of Ada Brennan"]' }));

    await roleSelect.clickOptions({ text: 'Energy & terrain analyst' });
    const request = httpTesting.expectOne({ method: 'PATCH', url: `/api/people/${EVERYONE[0]!.id}` });
    request.flush({ ...EVERYONE[0], role: 'analyst' });
    await settle(fixture);

    expect(request.request.body).toEqual({ role: 'analyst' });
    expect(await roleSelect.getValueText()).toBe('Energy & terrain analyst');
  });

  it('shows an account slowed down by failed sign-ins and lifts it from the row menu (issue 11)', async () => {
    const slowed = { ...EVERYONE[0]!, signIn: { failedAttempts: 7, slowedUntil: '2026-03-02T10:45:00.000Z' } };
    const { fixture, loader } = await renderWith([slowed, ...EVERYONE.slice(1)]);
    const chip = (fixture.nativeElement as HTMLElement).querySelector('[data-testid="sign-in-slowed"]');

    const menuButton = await loader.getHarness(
      (await import('@angular/material/button/testing')).MatButtonHarness.with({ selector: '[aria-label="Actions for Ada Brennan"]' }),
    );
    await menuButton.click();
    const { MatMenuHarness } = await import('@angular/material/menu/testing');
    const menu = await TestbedHarnessEnvironment.documentRootLoader(fixture).getHarness(MatMenuHarness);
    await menu.clickItem({ text: /Lift sign-in slow-down/ });
    const request = httpTesting.expectOne({ method: 'POST', url: `/api/people/${slowed.id}/unblock-sign-in` });
    request.flush({ ...slowed, signIn: { failedAttempts: 0, slowedUntil: null } });
    await settle(fixture);

    expect(chip?.textContent).toMatch(/Sign-in slowed until/);
    expect((fixture.nativeElement as HTMLElement).querySelector('[data-testid="sign-in-slowed"]')).toBeNull();
  });

  async function renderWith(people: Person[]) {
    const fixture = TestBed.createComponent(People);
    fixture.detectChanges(); // the list loads once the page is first rendered
    httpTesting.expectOne('/api/people').flush({ items: people });
    await settle(fixture);
    return { fixture, loader: TestbedHarnessEnvironment.loader(fixture) };
  }
});

/** The names in the table's rows, in display order. */
function names(fixture: ComponentFixture<unknown>): string[] {
  const cells = (fixture.nativeElement as HTMLElement).querySelectorAll('tr.mat-mdc-row .person-name');
  return [...cells].map((cell) => cell.textContent?.trim() ?? '');
}

async function filterSelect(loader: HarnessLoader, label: string): Promise<MatSelectHarness> {
  const field = loader.getHarness(
    (await import('@angular/material/form-field/testing')).MatFormFieldHarness.with({ floatingLabelText: label }),
  );
  return (await (await field).getControl(MatSelectHarness))!;
}

const EVERYONE: Person[] = [
  aPerson({
    id: '11111111-1111-4111-8111-111111111111',
    name: 'Ada Brennan',
    email: 'a.brennan@descentry.example',
    role: 'planner',
    status: 'active',
  }),
  aPerson({
    id: '22222222-2222-4222-8222-222222222222',
    name: 'Tomás Leclerc',
    email: 't.leclerc@descentry.example',
    role: 'analyst',
    status: 'invited',
  }),
  aPerson({
    id: '33333333-3333-4333-8333-333333333333',
    name: 'Marta Oyelaran',
    email: 'm.oyelaran@descentry.example',
    role: 'safety',
    status: 'active',
  }),
  aPerson({
    id: '44444444-4444-4444-8444-444444444444',
    name: 'Jonas Pfeifer',
    email: 'j.pfeifer@descentry.example',
    role: 'safety',
    status: 'disabled',
  }),
];

function aPerson(overrides: Partial<Person>): Person {
  return {
    id: '00000000-0000-4000-8000-000000000000',
    email: 'someone@descentry.example',
    name: 'Someone',
    role: 'planner',
    status: 'active',
    createdAt: '2026-03-01T08:00:00.000Z',
    lastSignInAt: null,
    signIn: { failedAttempts: 0, slowedUntil: null },
    ...overrides,
  };
}
