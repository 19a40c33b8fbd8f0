import { eq } from 'drizzle-orm';
import type { Database } from '../db/client';
import { basemapImports } from '../db/schema/index';

/** The extract the map and the road graph use now. */
export interface ActiveBasemap {
  importId: string;
  schemaName: string;
  /** Tile version: changes whenever another import becomes active. */
  version: string;
  attribution: string;
}

/** How long a process trusts its copy; an activation in another process shows after this. */
const ACTIVE_TTL_MS = 2_000;

/**
 * The active import as this process knows it: read at most every two seconds, forgotten at once
 * when this process changes which import is active. One per process, kept by the process's
 * runtime (`runtimeOf(deps).activeBasemap`, api/app-runtime.ts).
 */
export class ActiveBasemapReader {
  private cached: { value: Promise<ActiveBasemap | null>; loadedAt: number } | null = null;

  constructor(private readonly db: Database) {}

  /** The active import (null when none). */
  current(): Promise<ActiveBasemap | null> {
    const entry = this.cached;
    if (entry && Date.now() - entry.loadedAt <= ACTIVE_TTL_MS) return entry.value;
    const value = this.db
      .select({ id: basemapImports.id, schemaName: basemapImports.schemaName, attribution: basemapImports.attribution })
      .from(basemapImports)
      .where(eq(basemapImports.isActive, true))
      .limit(1)
      .then(([row]) =>
        row
          ? { importId: row.id, schemaName: row.schemaName, version: row.id.replaceAll('-', '').slice(0, 16), attribution: row.attribution }
          : null,
      );
    const fresh = { value, loadedAt: Date.now() };
    this.cached = fresh;
    value.catch(() => {
      if (this.cached === fresh) this.cached = null;
    });
    return value;
  }

  /** Call after this process changed which import is active. */
  forget(): void {
    this.cached = null;
  }
}

/**
 * Whether a query failed because an import's tables are gone: what a process sees in the moment
 * after another process switched to a new import and dropped the old one's schema.
 */
export function isMissingRelation(error: unknown): boolean {
  const { code, cause } = (error ?? {}) as { code?: unknown; cause?: { code?: unknown } };
  const found = code ?? cause?.code;
  return found === '42P01' || found === '3F000';
}
