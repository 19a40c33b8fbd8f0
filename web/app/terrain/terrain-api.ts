import { HttpClient, HttpContext, HttpEventType, type HttpEvent } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import {
  terrainListSchema,
  terrainModelSchema,
  terrainUploadAcceptedSchema,
  type TerrainList,
  type TerrainModel,
  type TerrainUploadAccepted,
} from '@shared/domain/terrain';
import { Observable, filter, firstValueFrom, map } from 'rxjs';
import { ERRORS_SHOWN_INLINE } from '../core/api-error-message';
import { TerrainTilesVersion } from '../map/terrain-tiles-version';

/** Progress of an upload: bytes sent so far, then the accepted model. */
export type UploadProgress =
  { kind: 'progress'; sentBytes: number; totalBytes: number } | { kind: 'accepted'; accepted: TerrainUploadAccepted };

/** The terrain endpoints; every answer is parsed with the shared schemas. */
@Injectable({ providedIn: 'root' })
export class TerrainApi {
  private readonly http = inject(HttpClient);
  private readonly tilesVersion = inject(TerrainTilesVersion);

  async list(): Promise<TerrainList> {
    const list = terrainListSchema.parse(await firstValueFrom(this.http.get('/api/terrain')));
    this.tilesVersion.report(list.tilesVersion);
    return list;
  }

  async get(id: string): Promise<TerrainModel> {
    return terrainModelSchema.parse(await firstValueFrom(this.http.get(`/api/terrain/${encodeURIComponent(id)}`)));
  }

  /**
   * Uploads a GeoTIFF as multipart form data, reporting progress as the browser sends it.
   * Errors are shown inline by the upload panel (the API names the problem).
   */
  upload(file: File, name: string): Observable<UploadProgress> {
    const form = new FormData();
    form.append('name', name);
    form.append('file', file, file.name);
    return this.http
      .post('/api/terrain', form, {
        reportProgress: true,
        observe: 'events',
        context: new HttpContext().set(ERRORS_SHOWN_INLINE, true),
      })
      .pipe(
        map((event: HttpEvent<unknown>): UploadProgress | null => {
          if (event.type === HttpEventType.UploadProgress) {
            return { kind: 'progress', sentBytes: event.loaded, totalBytes: event.total ?? file.size };
          }
          if (event.type === HttpEventType.Response) {
            return { kind: 'accepted', accepted: terrainUploadAcceptedSchema.parse(event.body) };
          }
          return null;
        }),
        filter((progress): progress is UploadProgress => progress !== null),
      );
  }

  /** Deletes a model; `force` (administrators) even while saved scenarios use it. */
  async delete(id: string, force = false): Promise<void> {
    await firstValueFrom(
      this.http.delete(`/api/terrain/${encodeURIComponent(id)}`, {
        params: force ? { force: 'true' } : {},
        context: new HttpContext().set(ERRORS_SHOWN_INLINE, true),
      }),
    );
  }
}
