import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { firstValueFrom } from 'rxjs';
import { basemapListSchema, basemapUploadAcceptedSchema, type BasemapList, type BasemapUploadAccepted } from '@shared/domain/basemap';

@Injectable({ providedIn: 'root' })
export class BasemapApi {
  private readonly http = inject(HttpClient);

  async list(): Promise<BasemapList> {
    return basemapListSchema.parse(await firstValueFrom(this.http.get('/api/basemap')));
  }

  /** Uploads an OpenStreetMap extract; the import then runs in the background. */
  async upload(file: File, attribution: string): Promise<BasemapUploadAccepted> {
    const form = new FormData();
    form.append('file', file, file.name);
    if (attribution.trim()) form.append('attribution', attribution.trim());
    return basemapUploadAcceptedSchema.parse(await firstValueFrom(this.http.post('/api/basemap', form)));
  }
}
