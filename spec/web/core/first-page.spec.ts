import type { Routes } from '@angular/router';
import { describe, expect, it, vi } from 'vitest';
import { forgetEarlyReads, type FirstReads } from '../../../web/app/core/early-reads';
import { preloadFirstPage } from '../../../web/app/core/first-page';

/** The API as the early reads see it: the session answer given, every other address echoed. */
function stubApi(user: { id: string } | null): string[] {
  const asked: string[] = [];
  vi.stubGlobal(
    'fetch',
    vi.fn(async (url: string) => {
      asked.push(url);
      return new Response(JSON.stringify(url === '/api/auth/session' ? { user } : { url, computedAt: '2026-12-01T10:00:00Z' }));
    }),
  );
  return asked;
}

/** A route table shaped like the app's: public pages, a shell with areas loaded as children. */
function table() {
  const load = {
    signIn: vi.fn(async () => ({ default: class {} })),
    shell: vi.fn(async () => ({ default: class {} })),
    home: vi.fn(async () => ({ default: class {} })),
    routeList: vi.fn(async () => ({ default: class {} })),
    routeEditor: vi.fn(async () => ({ default: class {} })),
    routeEditorReads: vi.fn<FirstReads>(async ({ routeId }, read) => {
      const route = (await read(`/api/routes/${routeId}`)) as { computedAt: string };
      if (route.computedAt) void read(`/api/routes/${routeId}/versions`);
    }),
    review: vi.fn(async () => ({ default: class {} })),
    notFound: vi.fn(async () => ({ default: class {} })),
  };
  const roadRoutes: Routes = [
    { path: '', loadComponent: load.routeList },
    { path: ':routeId', data: { firstReads: load.routeEditorReads }, loadComponent: load.routeEditor },
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
  beforeEach(() => {
    forgetEarlyReads();
    stubApi({ id: 'someone' });
  });
  afterEach(() => vi.unstubAllGlobals());

  it('loads a public page alone', async () => {
    const { routes, load } = table();
    await preloadFirstPage(routes, '/sign-in?returnUrl=%2Froutes');
    expect(called(load)).toEqual(['signIn']);
  });

  it('follows the shell into an area loaded as children, down to the page', async () => {
    const { routes, load } = table();
    await preloadFirstPage(routes, '/routes/2dc90750-a73b-49e3-8309-81a1cd5915c2');
    expect(called(load)).toEqual(['shell', 'routeEditor', 'routeEditorReads']);
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

  it('starts the page’s first reads with the address’s parameters once the session says someone is signed in', async () => {
    const asked = stubApi({ id: 'someone' });
    const { routes, load } = table();
    await preloadFirstPage(routes, '/routes/2dc90750-a73b-49e3-8309-81a1cd5915c2?version=2');
    expect(load.routeEditorReads).toHaveBeenCalledWith({ routeId: '2dc90750-a73b-49e3-8309-81a1cd5915c2' }, expect.any(Function));
    expect(asked).toEqual([
      '/api/auth/session',
      '/api/routes/2dc90750-a73b-49e3-8309-81a1cd5915c2',
      '/api/routes/2dc90750-a73b-49e3-8309-81a1cd5915c2/versions',
    ]);
  });

  it('reads only the session for a person not signed in (the page’s reads would be refused)', async () => {
    const asked = stubApi(null);
    const { routes, load } = table();
    await preloadFirstPage(routes, '/routes/2dc90750-a73b-49e3-8309-81a1cd5915c2');
    expect(load.routeEditorReads).not.toHaveBeenCalled();
    expect(asked).toEqual(['/api/auth/session']);
  });
});
