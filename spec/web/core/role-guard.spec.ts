import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { Router, UrlTree, provideRouter, type Route, type UrlSegment } from '@angular/router';
import type { Role } from '@shared/domain/roles';
import { areaData } from '../../../web/app/core/areas';
import { allowRoles, areaRoleGuard, signedInGuard } from '../../../web/app/core/role-guard';

describe('role guards', () => {
  let httpTesting: HttpTestingController;

  beforeEach(() => {
    TestBed.configureTestingModule({
      providers: [provideRouter([]), provideHttpClient(), provideHttpClientTesting()],
    });
    httpTesting = TestBed.inject(HttpTestingController);
  });

  afterEach(() => httpTesting.verify());

  describe('allowRoles', () => {
    it('lets a person with an allowed role through', async () => {
      const decision = runGuard(allowRoles(['admin']), { path: 'admin/people' });
      answerMe('admin');

      expect(await decision).toBe(true);
    });

    it('refuses a signed-in person whose role is not allowed', async () => {
      const decision = runGuard(allowRoles(['admin']), { path: 'admin/people' });
      answerMe('planner');

      expect(await decision).toBe(false);
    });

    it('sends someone who is not signed in to sign-in, keeping the address', async () => {
      const decision = runGuard(
        allowRoles(['admin']),
        { path: 'admin/people' },
        {
          url: '/admin/people',
        },
      );
      httpTesting.expectOne('/api/auth/session').flush({ user: null });

      const result = await decision;
      expect(result).toBeInstanceOf(UrlTree);
      expect(TestBed.inject(Router).serializeUrl(result as UrlTree)).toBe('/sign-in?returnUrl=%2Fadmin%2Fpeople');
    });

    it('asks the API only once for several guards', async () => {
      const first = runGuard(allowRoles(['safety']), { path: 'a' });
      const second = runGuard(allowRoles(['board']), { path: 'b' });
      answerMe('safety');

      expect([await first, await second]).toEqual([true, false]);
    });
  });

  describe('areaRoleGuard', () => {
    it("takes the allowed roles from the route's area declaration", async () => {
      const route: Route = {
        path: 'descents',
        data: areaData({ label: 'Descents', icon: 'warning', summary: 'Review', roles: ['safety', 'planner'] }),
      };
      const decision = runGuard(areaRoleGuard, route);
      answerMe('planner');

      expect(await decision).toBe(true);
    });

    it('refuses everyone on a route without an area declaration', async () => {
      const decision = runGuard(areaRoleGuard, { path: 'nowhere' });
      answerMe('admin');

      expect(await decision).toBe(false);
    });
  });

  describe('signedInGuard', () => {
    it('lets any signed-in role through', async () => {
      const decision = runGuard(signedInGuard, { path: '' });
      answerMe('board');

      expect(await decision).toBe(true);
    });
  });

  function answerMe(role: Role): void {
    httpTesting.expectOne('/api/auth/session').flush({
      user: { id: '0b7f5a52-8d0e-4d0a-9a55-0c1c1a7d2e10', email: `${role}@descentry.example`, name: 'Noor Haddad', role },
    });
  }
});

function runGuard(guard: (route: Route, segments: UrlSegment[]) => unknown, route: Route, state?: { url: string }): Promise<unknown> {
  return TestBed.runInInjectionContext(() => Promise.resolve(guard(route, (state ?? []) as unknown as UrlSegment[])));
}
