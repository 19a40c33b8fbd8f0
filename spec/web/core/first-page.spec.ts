import type { Routes } from '@angular/router';
import { describe, expect, it, vi } from 'vitest';
import { preloadFirstPage } from '../../../web/app/core/first-page';

/** A route table shaped like the app's: public pages, a shell with areas loaded as children. */
function table() {
  const load = {
    signIn: vi.fn(async () => ({ default: class {} })),
    shell: vi.fn(async () => ({ default: class {} })),
    home: vi.fn(async () => ({ default: class {} })),
    routeList: vi.fn(async () => ({ default: class {} })),
    routeEditor: vi.fn(async () => ({ default: class {} })),
    review: vi.fn(async () => ({ default: class {} })),
    notFound: vi.fn(async () => ({ default: class {} })),
  };
  const roadRoutes: Routes = [
    { path: '', loadComponent: load.routeList },
    { path: ':routeId', loadComponent: load.routeEditor },
  ];
  const routes: Routes = [
    { path: 'sign-in', loadComponent: load.signIn },
    {
      path: '',
      loadComponent: load.shell,
      children: [
        { path: '', pathMatch: 'full', loadComponent: load.home },
        { path: 'routes', loadChildren: async () => ({ default: roadRoutes }) },
        { path: 'reviews/:reviewId', loadComponent: load.review },
        { path: '**', loadComponent: load.notFound },
      ],
    },
    { path: '**', redirectTo: 'sign-in' },
  ];
  return { routes, load };
}

function called(load: Record<string, { mock: { calls: unknown[] } }>): string[] {
  return Object.entries(load)
    .filter(([, fn]) => fn.mock.calls.length > 0)
    .map(([name]) => name);
}

describe('preloadFirstPage', () => {
  it('loads a public page alone', async () => {
    const { routes, load } = table();
    await preloadFirstPage(routes, '/sign-in?returnUrl=%2Froutes');
    expect(called(load)).toEqual(['signIn']);
  });

  it('follows the shell into an area loaded as children, down to the page', async () => {
    const { routes, load } = table();
    await preloadFirstPage(routes, '/routes/2dc90750-a73b-49e3-8309-81a1cd5915c2');
    expect(called(load)).toEqual(['shell', 'routeEditor']);
  });

  it('matches parameters inside a path and the full-match home page', async () => {
    const { routes, load } = table();
    await preloadFirstPage(routes, '/reviews/abc');
    expect(called(load)).toEqual(['shell', 'review']);
    const home = table();
    await preloadFirstPage(home.routes, '/');
    expect(called(home.load)).toEqual(['shell', 'home']);
  });

  it('loads nothing for an address no page owns (the router redirects or shows not-found)', async () => {
    const { routes, load } = table();
    await preloadFirstPage(routes, '/routes/a/b/c');
    expect(called(load)).toEqual(['shell']);
  });
});
