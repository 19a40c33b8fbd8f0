import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import {
  capabilityCurvesSchema,
  vehicleProfileListSchema,
  vehicleProfileSchema,
  type CapabilityCurvesResponse,
  type LoadCase,
  type VehicleProfile,
  type VehicleProfileDraftInput,
} from '@shared/domain/vehicle-profiles';
import { firstValueFrom } from 'rxjs';
import { ERRORS_SHOWN_INLINE } from '../core/api-error-message';

/** Which load the capability chart is drawn for. */
export type CapabilityLoad = LoadCase;

const inline = () => ({ context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) });

/** Vehicle profiles (the built-in classes and the authority's own), parsed with the shared schemas. */
@Injectable({ providedIn: 'root' })
export class VehicleProfilesApi {
  private readonly http = inject(HttpClient);

  async list(): Promise<VehicleProfile[]> {
    return vehicleProfileListSchema.parse(await firstValueFrom(this.http.get('/api/vehicles'))).items;
  }

  async get(vehicleProfileId: string): Promise<VehicleProfile> {
    return vehicleProfileSchema.parse(await firstValueFrom(this.http.get(profilePath(vehicleProfileId))));
  }

  async create(draft: VehicleProfileDraftInput): Promise<VehicleProfile> {
    return vehicleProfileSchema.parse(await firstValueFrom(this.http.post('/api/vehicles', draft, inline())));
  }

  async update(vehicleProfileId: string, draft: VehicleProfileDraftInput): Promise<VehicleProfile> {
    return vehicleProfileSchema.parse(await firstValueFrom(this.http.put(profilePath(vehicleProfileId), draft, inline())));
  }

  async remove(vehicleProfileId: string): Promise<void> {
    await firstValueFrom(this.http.delete(profilePath(vehicleProfileId)));
  }

  async capability(vehicleProfileId: string, load: CapabilityLoad): Promise<CapabilityCurvesResponse> {
    const body = await firstValueFrom(this.http.get(`${profilePath(vehicleProfileId)}/capability`, { params: { load }, ...inline() }));
    return capabilityCurvesSchema.parse(body);
  }
}

function profilePath(vehicleProfileId: string): string {
  return `/api/vehicles/${encodeURIComponent(vehicleProfileId)}`;
}
