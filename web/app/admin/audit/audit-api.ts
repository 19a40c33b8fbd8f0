import { HttpClient, HttpParams } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { auditLogPageSchema, type AuditLogPage, type AuditLogQuery } from '@shared/domain/audit';
import { firstValueFrom } from 'rxjs';

/** The audit log, one page at a time; answers parsed with the shared schema. */
@Injectable({ providedIn: 'root' })
export class AuditApi {
  private readonly http = inject(HttpClient);

  async page(query: Partial<AuditLogQuery>): Promise<AuditLogPage> {
    let params = new HttpParams();
    for (const [key, value] of Object.entries(query)) {
      if (value !== undefined && value !== '') params = params.set(key, String(value));
    }
    return auditLogPageSchema.parse(await firstValueFrom(this.http.get('/api/audit-log', { params })));
  }
}
