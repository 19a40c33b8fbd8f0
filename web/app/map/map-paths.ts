/**
 * The two catalogue reads every map makes before it asks for tiles (their versions go into the
 * tile addresses). Kept apart from the map's code so pages can read them ahead (`firstReads`).
 */
export const TERRAIN_CATALOGUE_PATH = '/api/terrain';
export const BASEMAP_LIST_PATH = '/api/basemap';

/** Starts the reads a map makes first (for a page's `firstReads`). */
export function readMapCatalogues(read: (url: string) => Promise<unknown>): void {
  void read(TERRAIN_CATALOGUE_PATH);
  void read(BASEMAP_LIST_PATH);
}
