import type { LoadChildrenCallback, Route, Routes } from '@angular/router';
import { SESSION_PATH, readEarly, type FirstReads } from './early-reads';

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
 *
 * It also starts the API reads the page will make first (`readEarly`): the session, and once that
 * says someone is signed in, what the matched routes declare as `data.firstReads` (see
 * early-reads.ts), so their answers travel while the scripts load and run.
 */
export async function preloadFirstPage(routes: Routes, path: string): Promise<void> {
  let segments = path.split(/[?#]/)[0]!.split('/').filter(Boolean);
  let table: Routes | undefined = routes;
  const params: Record<string, string> = {};
  const reads: FirstReads[] = [];
  const session = readEarly(SESSION_PATH);
  // The table nests a few levels at most (shell → area → page); the bound only keeps a
  // malformed table from looping.
  for (let depth = 0; table && depth < 5; depth++) {
    const match = matchRoute(table, segments);
    if (!match) break;
    void match.route.loadComponent?.();
    Object.assign(params, match.params);
    const firstReads = match.route.data?.['firstReads'] as FirstReads | undefined;
    if (firstReads) reads.push(firstReads);
    table = match.route.children ?? (match.route.loadChildren ? routesOf(await match.route.loadChildren()) : undefined);
    segments = match.rest;
  }
  if (reads.length === 0 || !isSignedIn(await session)) return;
  await Promise.all(reads.map((firstReads) => firstReads(params, readEarly)));
}

function isSignedIn(session: unknown): boolean {
  return typeof session === 'object' && session !== null && 'user' in session && session.user !== null && session.user !== undefined;
}

/** The first route of `table` whose path matches the start of `segments` (all of them for a leaf). */
function matchRoute(table: Routes, segments: string[]): { route: Route; rest: string[]; params: Record<string, string> } | null {
  for (const route of table) {
    if (route.path === undefined || route.path === '**' || route.redirectTo !== undefined) continue;
    const pattern = route.path.split('/').filter(Boolean);
    const isLeaf = !route.children && !route.loadChildren;
    const mustEnd = isLeaf || route.pathMatch === 'full';
    if (pattern.length > segments.length || (mustEnd && pattern.length !== segments.length)) continue;
    if (pattern.every((part, i) => part.startsWith(':') || part === segments[i])) {
      const params = Object.fromEntries(pattern.flatMap((part, i) => (part.startsWith(':') ? [[part.slice(1), segments[i]!]] : [])));
      return { route, rest: segments.slice(pattern.length), params };
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
