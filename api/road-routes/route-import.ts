import { createHash } from 'node:crypto';
import {
  roadRouteDraftSchema,
  type RoadRoute,
  type RoadRouteDraft,
  type RoadRouteDraftInput,
  type RouteImportElevations,
  type RouteImportResult,
} from '@shared/domain/road-routes';
import type { Database } from '../db/client';
import { isUniqueViolation } from '../db/errors';
import { BadRequestError, ConflictError } from '../http/http-error';
import { findRouteByImportSha256 } from './road-routes-repository';
import { gtfsToDrafts } from './gtfs-import';
import { ImportError } from './import-error';
import { createRoutes, prepareVersion, type Author } from './road-routes-service';
import { geoJsonToDraft } from './route-geojson';
import { gpxToDraft } from './route-gpx';

/**
 * Imports one route from a GeoJSON or GPX file: all checks pass before anything is written.
 * Elevations: `'file'` keeps the file's own when every point has one (a GPS track's recorded
 * heights), otherwise the terrain supplies them; `'terrain'` drops the file's. The very same file
 * (byte for byte) imported again is refused with 409, naming the route it made.
 */
export async function importRouteFile(
  db: Database,
  author: Author,
  file: { originalname: string; buffer: Buffer },
  { name, elevations = 'file' }: { name?: string; elevations?: RouteImportElevations } = {},
): Promise<RouteImportResult> {
  const fileName = file.originalname || 'upload';
  const importSha256 = createHash('sha256').update(file.buffer).digest('hex');
  const earlier = await findRouteByImportSha256(db, importSha256);
  if (earlier) throw alreadyImported(fileName, earlier);
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
  const fileHasElevations = draftInput.geometry.coordinates.every((position) => position.length >= 3);
  const elevationSource = elevations === 'file' && fileHasElevations ? 'file' : 'terrain';
  if (elevationSource === 'terrain' && fileHasElevations) {
    draftInput = {
      ...draftInput,
      geometry: { type: 'LineString', coordinates: draftInput.geometry.coordinates.map(([lon, lat]) => [lon!, lat!]) },
    };
  }
  const draft = checkDraft(fileName, draftInput);
  try {
    const [route] = await createRoutes(db, author, [draft], { importSha256 });
    return { route: route!, elevationSource, fileHasElevations };
  } catch (error) {
    // The same file imported twice at the same moment, or a deleted route from it restored
    // meanwhile: the partial unique index on the hash refused this copy, and the one it kept is
    // committed and visible now.
    if (isUniqueViolation(error)) {
      const again = await findRouteByImportSha256(db, importSha256);
      if (again) throw alreadyImported(fileName, again);
    }
    throw error;
  }
}

function alreadyImported(fileName: string, route: { id: string; name: string }): ConflictError {
  return new ConflictError(
    `${fileName} was imported before, as the route “${route.name}”: open that route, or change the file to import it again`,
    'already_imported',
    { routeId: route.id, routeName: route.name },
  );
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
