import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import { batchRunListSchema, batchRunSchema, type BatchRun } from '@shared/domain/board-summary';
import { firstValueFrom } from 'rxjs';
import type { z } from 'zod';
import { ERRORS_SHOWN_INLINE } from '../core/api-error-message';

export type BatchRunSummary = z.infer<typeof batchRunListSchema>['items'][number];

/** Network-wide re-runs of the in-service scenarios; answers parsed with the shared schemas. */
@Injectable({ providedIn: 'root' })
export class BatchRunsApi {
  private readonly http = inject(HttpClient);

  /** Queues a re-run of every in-service scenario; errors are shown beside the button. */
  async start(): Promise<BatchRun> {
    const body = await firstValueFrom(this.http.post('/api/batch-runs', {}, { context: new HttpContext().set(ERRORS_SHOWN_INLINE, true) }));
    return batchRunSchema.parse(body);
  }

  async list(): Promise<BatchRunSummary[]> {
    return batchRunListSchema.parse(await firstValueFrom(this.http.get('/api/batch-runs'))).items;
  }

  async get(batchRunId: string): Promise<BatchRun> {
    return batchRunSchema.parse(await firstValueFrom(this.http.get(`/api/batch-runs/${encodeURIComponent(batchRunId)}`)));
  }
}
