import { HttpClient } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { RestorableKind } from '@shared/domain/audit';
import { deletedItemListSchema, type DeletedItemList } from '@shared/domain/deleted-items';
import { firstValueFrom } from 'rxjs';

/** Where each kind of thing lives in the API (its restore endpoint is `<path>/<id>/restore`). */
const API_PATHS: Readonly<Record<RestorableKind, string>> = {
  route: '/api/routes',
  scenario: '/api/scenarios',
  'vehicle-profile': '/api/vehicles',
  terrain: '/api/terrain',
  'service-day': '/api/service-days',
};

/** Recently deleted items and their restore endpoints; answers parsed with the shared schemas. */
@Injectable({ providedIn: 'root' })
export class DeletedItemsApi {
  private readonly http = inject(HttpClient);

  async list(): Promise<DeletedItemList> {
    return deletedItemListSchema.parse(await firstValueFrom(this.http.get('/api/deleted-items')));
  }

  /** Restores one item; the API's reason (its route is deleted too …) reaches the caller as an error. */
  async restore(kind: RestorableKind, id: string): Promise<void> {
    await firstValueFrom(this.http.post(`${API_PATHS[kind]}/${encodeURIComponent(id)}/restore`, null));
  }
}
