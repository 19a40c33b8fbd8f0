import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { networkSettingsViewSchema, type NetworkSettingsUpdate, type NetworkSettingsView } from '@shared/domain/board-summary';
import { firstValueFrom } from 'rxjs';
import { ERRORS_SHOWN_INLINE } from '../../core/api-error-message';

/** The tariff and emission factor the board summary uses; only administrators may change them. */
@Injectable({ providedIn: 'root' })
export class NetworkSettingsApi {
  private readonly http = inject(HttpClient);

  async get(): Promise<NetworkSettingsView> {
    return networkSettingsViewSchema.parse(await firstValueFrom(this.http.get('/api/settings/network')));
  }

  /** Saves the settings; a refusal is shown in the form. */
  async save(settings: NetworkSettingsUpdate): Promise<NetworkSettingsView> {
    const body = await firstValueFrom(
      this.http.put('/api/settings/network', settings, { context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) }),
    );
    return networkSettingsViewSchema.parse(body);
  }
}
