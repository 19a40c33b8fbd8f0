import { HttpClient, HttpContext, HttpEventType, type HttpEvent } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { calibrationListSchema, calibrationSchema, type Calibration, type CalibrationRequest } from '@shared/domain/calibrations';
import {
  loggedTripCreatedSchema,
  loggedTripListSchema,
  loggedTripSchema,
  replayComparisonSchema,
  type LoggedTrip,
  type ReplayComparison,
} from '@shared/domain/logged-trips';
import { vehicleProfileVersionListSchema, type VehicleProfileVersion } from '@shared/domain/vehicle-profiles';
import { Observable, filter, firstValueFrom, map } from 'rxjs';
import { ERRORS_SHOWN_INLINE } from '../core/api-error-message';

/** Progress of an upload: bytes sent so far, then the stored trip. */
export type TripUploadProgress = { kind: 'progress'; sentBytes: number; totalBytes: number } | { kind: 'stored'; trip: LoggedTrip };

/** The form fields sent with a logged trip. */
export interface TripUploadFields {
  routeId?: string;
  payloadKg?: number;
  ambientC?: number;
  elevationSource: 'auto' | 'route' | 'file';
  name?: string;
}

export type CalibrationSummary = ReturnType<typeof calibrationListSchema.parse>['items'][number];

const inline = () => ({ context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) });

/** Logged trips, their comparison with the model, and calibrations; parsed with the shared schemas. */
@Injectable({ providedIn: 'root' })
export class CalibrationApi {
  private readonly http = inject(HttpClient);

  async trips(vehicleProfileId: string): Promise<LoggedTrip[]> {
    return loggedTripListSchema.parse(await firstValueFrom(this.http.get(`${profilePath(vehicleProfileId)}/logged-trips`))).items;
  }

  async trip(loggedTripId: string): Promise<LoggedTrip> {
    return loggedTripSchema.parse(await firstValueFrom(this.http.get(tripPath(loggedTripId))));
  }

  async comparison(loggedTripId: string, calibrationId?: string): Promise<ReplayComparison> {
    const params: Record<string, string> = calibrationId ? { calibrationId } : {};
    return replayComparisonSchema.parse(
      await firstValueFrom(this.http.get(`${tripPath(loggedTripId)}/comparison`, { params, ...inline() })),
    );
  }

  async deleteTrip(loggedTripId: string): Promise<void> {
    await firstValueFrom(this.http.delete(tripPath(loggedTripId), inline()));
  }

  /** Uploads a logged trip as multipart form data, reporting progress as the browser sends it. */
  upload(vehicleProfileId: string, file: File, fields: TripUploadFields): Observable<TripUploadProgress> {
    const form = new FormData();
    for (const [key, value] of Object.entries(fields)) if (value !== undefined && value !== '') form.append(key, String(value));
    form.append('file', file, file.name);
    return this.http
      .post(`${profilePath(vehicleProfileId)}/logged-trips`, form, { reportProgress: true, observe: 'events', ...inline() })
      .pipe(
        map((event: HttpEvent<unknown>): TripUploadProgress | null => {
          if (event.type === HttpEventType.UploadProgress)
            return { kind: 'progress', sentBytes: event.loaded, totalBytes: event.total ?? file.size };
          if (event.type === HttpEventType.Response) return { kind: 'stored', trip: loggedTripCreatedSchema.parse(event.body).trip };
          return null;
        }),
        filter((progress): progress is TripUploadProgress => progress !== null),
      );
  }

  async calibrations(vehicleProfileId: string): Promise<CalibrationSummary[]> {
    return calibrationListSchema.parse(await firstValueFrom(this.http.get(`${profilePath(vehicleProfileId)}/calibrations`))).items;
  }

  async requestCalibration(vehicleProfileId: string, request: CalibrationRequest): Promise<Calibration> {
    return calibrationSchema.parse(
      await firstValueFrom(this.http.post(`${profilePath(vehicleProfileId)}/calibrations`, request, inline())),
    );
  }

  async calibration(calibrationId: string): Promise<Calibration> {
    return calibrationSchema.parse(await firstValueFrom(this.http.get(calibrationPath(calibrationId))));
  }

  async decide(calibrationId: string, decision: 'accept' | 'reject'): Promise<Calibration> {
    return calibrationSchema.parse(await firstValueFrom(this.http.post(`${calibrationPath(calibrationId)}/${decision}`, {}, inline())));
  }

  async versions(vehicleProfileId: string): Promise<VehicleProfileVersion[]> {
    return vehicleProfileVersionListSchema.parse(await firstValueFrom(this.http.get(`${profilePath(vehicleProfileId)}/versions`))).items;
  }
}

function profilePath(id: string): string {
  return `/api/vehicles/${encodeURIComponent(id)}`;
}
function tripPath(id: string): string {
  return `/api/logged-trips/${encodeURIComponent(id)}`;
}
function calibrationPath(id: string): string {
  return `/api/calibrations/${encodeURIComponent(id)}`;
}
