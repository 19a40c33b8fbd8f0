import { inject } from '@angular/core';
import { Router, type CanActivateFn, type CanMatchFn, type Route, type UrlSegment, type UrlTree } from '@angular/router';
import type { Role } from '@shared/domain/roles';
import { areaOf } from './areas';
import { Session } from './session';

/**
 * Lets a route match only for the given roles. Someone not signed in goes to the sign-in page
 * (with the address to come back to); a signed-in person without the role does not match, so
 * the router falls through to "page not found". The server enforces the same rule.
 */
export function allowRoles(roles: readonly Role[]): CanMatchFn & CanActivateFn {
  return async (_route: unknown, second: unknown) => {
    const session = inject(Session);
    const router = inject(Router);
    await session.ensureLoaded();

    const role = session.role();
    if (!role) return signInTree(router, attemptedUrl(router, second));
    return roles.includes(role);
  };
}

/** Allows the roles named in the route's own `data.area` (see areas.ts): one list, one place. */
export const areaRoleGuard: CanMatchFn = (route: Route, segments: UrlSegment[]) => {
  const area = areaOf(route);
  return allowRoles(area?.roles ?? [])(route, segments);
};

/** Lets any signed-in person through; sends everyone else to the sign-in page. */
export const signedInGuard: CanMatchFn & CanActivateFn = async (_route: unknown, second: unknown) => {
  const session = inject(Session);
  const router = inject(Router);
  await session.ensureLoaded();
  return session.role() ? true : signInTree(router, attemptedUrl(router, second));
};

function signInTree(router: Router, returnUrl: string): UrlTree {
  return router.createUrlTree(['/sign-in'], {
    queryParams: { returnUrl: returnUrl === '/' ? undefined : returnUrl },
  });
}

/** canActivate gets the router state (with its url); canMatch gets the URL segments. */
function attemptedUrl(router: Router, second: unknown): string {
  if (second && typeof second === 'object' && 'url' in second && typeof second.url === 'string') {
    return second.url;
  }
  const navigation = router.currentNavigation();
  return navigation ? router.serializeUrl(navigation.extractedUrl) : '/';
}
