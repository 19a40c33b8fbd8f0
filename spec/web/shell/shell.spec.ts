import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter, type Routes } from '@angular/router';
import type { Role } from '@shared/domain/roles';
import { areaData } from '../../../web/app/core/areas';
import { Session } from '../../../web/app/core/session';
import Shell from '../../../web/app/shell/shell';
import { settle } from '../support/settle';

describe('Shell', () => {
  let httpTesting: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideRouter(ROUTES), provideHttpClient(), provideHttpClientTesting()],
    });
    httpTesting = TestBed.inject(HttpTestingController);
  });

  afterEach(() => httpTesting.verify());

  it('shows an administrator the administration areas, name and role', async () => {
    const fixture = await renderAs('admin', 'Agnes Wyler');

    expect(navigationLabels(fixture.nativeElement)).toEqual(['Home', 'Routes', 'People', 'Outgoing mail']);
    expect(fixture.nativeElement.querySelector('.nav-heading').textContent).toBe('Administration');
    expect(fixture.nativeElement.querySelector('[data-testid="signed-in-person"]').textContent).toContain('Administrator');
  });

  it('hides the administration areas from a board member', async () => {
    const fixture = await renderAs('board', 'Jonas Feldmoser');

    expect(navigationLabels(fixture.nativeElement)).toEqual(['Home', 'Routes']);
  });

  async function renderAs(role: Role, name: string) {
    const session = TestBed.inject(Session);
    void session.ensureLoaded();
    httpTesting.expectOne('/api/auth/session').flush({
      user: { id: '5a0d8a34-3f0e-4c55-9d7e-1b2c3d4e5f60', email: `${role}@descentry.example`, name, role },
    });
    await session.ensureLoaded();
    const fixture = TestBed.createComponent(Shell);
    await settle(fixture);
    return fixture;
  }
});

/** A router table shaped like the app's: areas declared on the shell's children. */
const ROUTES: Routes = [
  {
    path: '',
    children: [
      {
        path: 'admin/people',
        data: areaData({ label: 'People', icon: 'group', summary: 'People', roles: ['admin'], group: 'Administration' }),
        children: [],
      },
      {
        path: 'routes',
        data: areaData({ label: 'Routes', icon: 'route', summary: 'Routes', roles: ['planner', 'board', 'admin'] }),
        children: [],
      },
      {
        path: 'admin/mail',
        data: areaData({ label: 'Outgoing mail', icon: 'mail', summary: 'Mail', roles: ['admin'], group: 'Administration' }),
        children: [],
      },
    ],
  },
];

function navigationLabels(root: HTMLElement): string[] {
  return [...root.querySelectorAll('nav[aria-label="Main"] a [matListItemTitle], nav[aria-label="Main"] a .mdc-list-item__primary-text')]
    .map((element) => element.textContent?.trim() ?? '')
    .filter((label, index, all) => label && all.indexOf(label) === index);
}
