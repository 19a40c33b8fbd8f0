import type { LoadChildrenCallback, Route, Routes } from '@angular/router';

/**
 * Starts loading the scripts of the page at `path` while Angular is still starting, instead of
 * only after the router has matched the address: when the router asks for the same modules later
 * they are loaded already (the browser loads each module once). On a first visit this takes the
 * page's own scripts off the critical path to its first paint.
 *
 * It walks the router's own table (so a page added there is covered without a word here),
 * following `loadChildren` into each area. Guards are not asked — the router still decides what
 * is shown — so at worst the scripts of a page are fetched that the router then does not show.
 * Failures are left to the router, which loads again and reports them.
 */
export async function preloadFirstPage(routes: Routes, path: string): Promise<void> {
  let segments = path.split(/[?#]/)[0]!.split('/').filter(Boolean);
  let table: Routes | undefined = routes;
  // The table nests a few levels at most (shell → area → page); the bound only keeps a
  // malformed table from looping.
  for (let depth = 0; table && depth < 5; depth++) {
    const match = matchRoute(table, segments);
    if (!match) return;
    void match.route.loadComponent?.();
    table = match.route.children ?? (match.route.loadChildren ? routesOf(await match.route.loadChildren()) : undefined);
    segments = match.rest;
  }
}

/** The first route of `table` whose path matches the start of `segments` (all of them for a leaf). */
function matchRoute(table: Routes, segments: string[]): { route: Route; rest: string[] } | null {
  for (const route of table) {
    if (route.path === undefined || route.path === '**' || route.redirectTo !== undefined) continue;
    const pattern = route.path.split('/').filter(Boolean);
    const isLeaf = !route.children && !route.loadChildren;
    const mustEnd = isLeaf || route.pathMatch === 'full';
    if (pattern.length > segments.length || (mustEnd && pattern.length !== segments.length)) continue;
    if (pattern.every((part, i) => part.startsWith(':') || part === segments[i])) {
      return { route, rest: segments.slice(pattern.length) };
    }
  }
  return null;
}

/** The routes a `loadChildren` gave: an array, or a module whose default export is one. */
function routesOf(loaded: Awaited<ReturnType<LoadChildrenCallback>>): Routes | undefined {
  if (Array.isArray(loaded)) return loaded;
  const module = loaded as { default?: unknown } | null;
  return module && Array.isArray(module.default) ? (module.default as Routes) : undefined;
}
