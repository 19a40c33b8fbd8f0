import { createHash } from 'node:crypto';
import { writeFile } from 'node:fs/promises';
import { join } from 'node:path';
import { eq } from 'drizzle-orm';
import type { AppDeps } from '../app-deps';
import { basemapImports, users } from '../db/schema/index';
import { acceptBasemapUpload, waitForInlineBasemapJobs } from '../basemap/basemap-service';
import { runtimeOf } from '../app-runtime';
import { demoOsmExtractXml } from './demo-osm-extract';

/** File name the demo extract is imported under. */
export const DEMO_EXTRACT_FILE_NAME = 'korvel-valley-demo.osm';
/** Credit shown on the map for the invented extract: it is not OpenStreetMap data. */
export const DEMO_EXTRACT_ATTRIBUTION = 'Korvel valley: invented demo region (not real OpenStreetMap data)';

/**
 * Imports the invented Korvel valley extract (demo-osm-extract.ts) through the same pipeline as
 * an upload, as the demo analyst, once: when any extract has been imported already, it is left
 * as it is. Run after the demo terrain, so the road graph gets its grades.
 */
export async function seedDemoBasemap(deps: AppDeps): Promise<void> {
  const [ready] = await deps.db.select({ id: basemapImports.id }).from(basemapImports).where(eq(basemapImports.status, 'ready')).limit(1);
  if (ready) return;
  const [analyst] = await deps.db.select().from(users).where(eq(users.role, 'analyst')).limit(1);
  if (!analyst) throw new Error('Seed the demo people before the demo base map');
  const xml = Buffer.from(demoOsmExtractXml(), 'utf8');
  const storage = runtimeOf(deps).basemapStorage;
  await storage.ensureFolders();
  const path = join(storage.uploadsDir, `demo-extract-${createHash('sha256').update(xml).digest('hex').slice(0, 12)}.part`);
  await writeFile(path, xml);
  await acceptBasemapUpload(
    deps,
    { id: analyst.id, email: analyst.email, name: analyst.name, role: analyst.role },
    {
      path,
      size: xml.length,
      originalFileName: DEMO_EXTRACT_FILE_NAME,
      attribution: DEMO_EXTRACT_ATTRIBUTION,
    },
  );
  await waitForInlineBasemapJobs(deps);
}
