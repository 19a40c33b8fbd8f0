import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { LineString } from '@shared/domain/analysis';
import {
  routeImportResultSchema,
  type RouteImportElevations,
  type RouteImportResult,
  roadNetworkPathSchema,
  roadNetworkSchema,
  roadNetworkUploadResultSchema,
  roadRouteImportListSchema,
  roadRouteListSchema,
  roadRouteSchema,
  roadRouteVersionListSchema,
  routeProfileSchema,
  type RoadNetwork,
  type RoadNetworkPath,
  type RoadRoute,
  type RoadRouteDraftInput,
  type RoadRouteSummary,
  type RouteProfile,
} from '@shared/domain/road-routes';
import { firstValueFrom, map, type Observable } from 'rxjs';
import * as z from 'zod';
import { ERRORS_SHOWN_INLINE } from '../core/api-error-message';
import { ROAD_NETWORK_PATH, routePath, routeVersionProfilePath, routeVersionsPath } from './route-paths';

export type RouteExportFormat = 'geojson' | 'gpx';
export type RouteVersionInfo = z.infer<typeof roadRouteVersionListSchema>['items'][number];
export type { RoadNetwork, RouteProfile };

const inline = () => ({ context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) });

/** Road routes and the reference road network; every answer is parsed with the shared schemas. */
@Injectable({ providedIn: 'root' })
export class RoadRoutesApi {
  private readonly http = inject(HttpClient);

  async list(): Promise<RoadRouteSummary[]> {
    return roadRouteListSchema.parse(await firstValueFrom(this.http.get('/api/routes'))).items;
  }

  async get(routeId: string, version?: number): Promise<RoadRoute> {
    const path = version === undefined ? routePath(routeId) : `${routePath(routeId)}/versions/${version}`;
    return roadRouteSchema.parse(await firstValueFrom(this.http.get(path)));
  }

  /** Creates a route (201). Errors are shown by the editor, inline. */
  async create(draft: RoadRouteDraftInput): Promise<RoadRoute> {
    return roadRouteSchema.parse(await firstValueFrom(this.http.post('/api/routes', draft, inline())));
  }

  /** Saves a new version of the route; the server recomputes the stops' `atM`. */
  async saveVersion(routeId: string, draft: RoadRouteDraftInput): Promise<RoadRoute> {
    return roadRouteSchema.parse(await firstValueFrom(this.http.put(routePath(routeId), draft, inline())));
  }

  /** Every saved version of the route, newest first. */
  async versions(routeId: string): Promise<RouteVersionInfo[]> {
    return roadRouteVersionListSchema.parse(await firstValueFrom(this.http.get(routeVersionsPath(routeId)))).items;
  }

  async remove(routeId: string): Promise<void> {
    await firstValueFrom(this.http.delete(routePath(routeId)));
  }

  /**
   * Length and elevation along a saved version's line: the same answer as `profile` for that
   * line, but a GET the browser keeps and revalidates, so an unchanged profile costs no body.
   */
  savedProfile(routeId: string, version: number): Observable<RouteProfile> {
    return this.http.get(routeVersionProfilePath(routeId, version), inline()).pipe(map((body) => routeProfileSchema.parse(body)));
  }

  /** Length and elevation along a geometry being edited (not stored). Cancel by unsubscribing. */
  profile(geometry: LineString): Observable<RouteProfile> {
    return this.http.post('/api/routes/profile', { geometry }, inline()).pipe(map((body) => routeProfileSchema.parse(body)));
  }

  /** Download address of a route export (the browser saves the file). */
  exportUrl(routeId: string, format: RouteExportFormat): string {
    return `${routePath(routeId)}/export?format=${format}`;
  }

  /** Imports one route from a GeoJSON or GPX file; the answer says where its elevations come from. */
  async importFile(file: File, elevations: RouteImportElevations): Promise<RouteImportResult> {
    const form = new FormData();
    form.append('elevations', elevations);
    form.append('file', file, file.name);
    return routeImportResultSchema.parse(await firstValueFrom(this.http.post('/api/routes/import', form, inline())));
  }

  /** Imports a GTFS feed's shapes, stops and trips per day from a zip. */
  async importGtfs(file: File): Promise<RoadRoute[]> {
    const form = new FormData();
    form.append('file', file, file.name);
    return roadRouteImportListSchema.parse(await firstValueFrom(this.http.post('/api/routes/import-gtfs', form, inline()))).items;
  }

  async roadNetwork(): Promise<RoadNetwork | null> {
    const body = await firstValueFrom(this.http.get(ROAD_NETWORK_PATH, inline()));
    const network = roadNetworkSchema.parse(body);
    return network.features.length > 0 ? network : null;
  }

  /** Replaces the reference road network with a GeoJSON FeatureCollection of lines (analysts). */
  async uploadRoadNetwork(file: File): Promise<{ featureCount: number; lineCount: number }> {
    const form = new FormData();
    form.append('file', file, file.name);
    return roadNetworkUploadResultSchema.parse(await firstValueFrom(this.http.post(ROAD_NETWORK_PATH, form, inline())));
  }

  /** The path along the reference network between two points, for snapping a new vertex. */
  /** The path a bus may drive from `from` through `via` to `to`, along the imported roads and the reference network. */
  pathAlongNetwork(
    from: readonly [number, number, ...number[]],
    to: readonly [number, number, ...number[]],
    via: ReadonlyArray<readonly [number, number, ...number[]]> = [],
  ): Observable<RoadNetworkPath> {
    // Only longitude and latitude go to the server: a drawn point may carry an elevation.
    const lngLat = (p: readonly [number, number, ...number[]]) => [p[0], p[1]];
    return this.http
      .post('/api/road-network/path', { from: lngLat(from), to: lngLat(to), via: via.map(lngLat) }, inline())
      .pipe(map((body) => roadNetworkPathSchema.parse(body)));
  }
}
