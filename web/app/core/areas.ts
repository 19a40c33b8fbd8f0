import type { Route, Routes } from '@angular/router';
import type { Role } from '@shared/domain/roles';

/**
 * An area of the application as the navigation and the home page show it. Declared once, on the
 * route itself (`data.area`), so an area appears in the side navigation and on the home page of
 * exactly the roles that may open it, and only once its route exists.
 */
export interface Area {
  /** Short label in the side navigation, e.g. "People". */
  label: string;
  /** Material Symbols ligature, e.g. "group". */
  icon: string;
  /** One sentence for the home page card: what a person does there. */
  summary: string;
  /** Roles that see the area and may open it (the route's guard reads the same list). */
  roles: readonly Role[];
  /** Navigation group heading; areas without one are listed first. */
  group?: string;
}

/** An area together with the absolute link to it. */
export interface AreaLink extends Area {
  path: string;
}

const AREA_KEY = 'area';

/** Route data for an area: `{ path: 'admin/people', data: areaData({...}), ... }`. */
export function areaData(area: Area): { [AREA_KEY]: Area } {
  return { [AREA_KEY]: area };
}

/** The area declared on a route, if any. */
export function areaOf(route: Route): Area | undefined {
  const area: unknown = route.data?.[AREA_KEY];
  return isArea(area) ? area : undefined;
}

/**
 * Every area in the router configuration that `role` may open, in configuration order.
 * Walks eagerly declared children; areas must be declared on routes in the configuration
 * (their components and child routes may be lazy).
 */
export function areasFor(routes: Routes, role: Role | null, parentPath = ''): AreaLink[] {
  if (!role) return [];
  const links: AreaLink[] = [];
  for (const route of routes) {
    const path = joinPath(parentPath, route.path ?? '');
    const area = areaOf(route);
    if (area && area.roles.includes(role)) links.push({ ...area, path });
    if (route.children) links.push(...areasFor(route.children, role, path));
  }
  // Two routes may declare the same path (alternatives chosen by canMatch); list it once.
  return links.filter((link, index) => links.findIndex((other) => other.path === link.path) === index);
}

function joinPath(parent: string, child: string): string {
  const joined = [parent, child].filter((part) => part && part !== '/').join('/');
  return `/${joined.replace(/^\/+/, '')}`;
}

function isArea(value: unknown): value is Area {
  return (
    typeof value === 'object' &&
    value !== null &&
    'label' in value &&
    'roles' in value &&
    Array.isArray((value as { roles: unknown }).roles)
  );
}
