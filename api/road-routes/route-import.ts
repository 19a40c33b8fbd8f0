import { roadRouteDraftSchema, type RoadRoute, type RoadRouteDraft, type RoadRouteDraftInput } from '@shared/domain/road-routes';
import type { Database } from '../db/client';
import { BadRequestError } from '../http/http-error';
import { gtfsToDrafts } from './gtfs-import';
import { ImportError } from './import-error';
import { createRoutes, prepareVersion, type Author } from './road-routes-service';
import { geoJsonToDraft } from './route-geojson';
import { gpxToDraft } from './route-gpx';

/** Imports one route from a GeoJSON or GPX file: all checks pass before anything is written. */
export async function importRouteFile(db: Database, author: Author, file: { originalname: string; buffer: Buffer }, name?: string): Promise<RoadRoute> {
  const fileName = file.originalname || 'upload';
  const text = file.buffer.toString('utf8').replace(/^\uFEFF/, '');
  let draftInput: RoadRouteDraftInput;
  if (/\.gpx$/i.test(fileName) || (!/\.(geo)?json$/i.test(fileName) && text.trimStart().startsWith('<'))) {
    draftInput = gpxToDraft(fileName, text);
  } else if (/\.(geo)?json$/i.test(fileName) || text.trimStart().startsWith('{')) {
    draftInput = geoJsonToDraft(fileName, text);
  } else {
    throw new ImportError({ file: fileName }, 'unknown format: send a .geojson, .json or .gpx file');
  }
  if (name?.trim()) draftInput = { ...draftInput, name: name.trim().slice(0, 120) };
  const draft = checkDraft(fileName, draftInput);
  const [route] = await createRoutes(db, author, [draft]);
  return route!;
}

/** Imports one route per GTFS route of a feed; all or nothing. */
export async function importGtfsFeed(db: Database, author: Author, file: { originalname: string; buffer: Buffer }): Promise<RoadRoute[]> {
  const fileName = file.originalname || 'feed.zip';
  const { drafts, sources } = await gtfsToDrafts(fileName, file.buffer);
  const checked = drafts.map((draft, index) => checkDraft(sources[index]!, draft));
  return createRoutes(db, author, checked);
}

/** Validates an imported draft; problems name the file (or feed row) they came from. */
function checkDraft(source: string, input: RoadRouteDraftInput): RoadRouteDraft {
  const parsed = roadRouteDraftSchema.safeParse(input);
  if (!parsed.success) {
    const issue = parsed.error.issues[0]!;
    throw new ImportError({ file: source, field: issue.path.map(String).join('.') }, issue.message);
  }
  try {
    prepareVersion(parsed.data, { id: null, name: 'check' });
  } catch (error) {
    // Stops off the line or a too-short line: the same rule as a saved route, named by file.
    if (error instanceof BadRequestError && !(error instanceof ImportError)) {
      const field = (error.details as { field?: string } | undefined)?.field;
      throw new ImportError({ file: source, field }, error.message);
    }
    throw error;
  }
  return parsed.data;
}
