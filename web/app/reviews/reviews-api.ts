import { HttpClient, HttpContext } from '@angular/common/http';
import { Injectable, inject } from '@angular/core';
import type { RiskLevel } from '@shared/domain/analysis';
import {
  auditEventListSchema,
  reviewDetailSchema,
  reviewListSchema,
  reviewTransitionResultSchema,
  type AuditEvent,
  type ReviewDetail,
  type ReviewItem,
  type ReviewState,
  type ReviewTransitionRequest,
  type ReviewTransitionResult,
} from '@shared/domain/reviews';
import { firstValueFrom } from 'rxjs';
import { ERRORS_SHOWN_INLINE } from '../core/api-error-message';

/** Query of GET /api/reviews; empty fields are left out. */
export interface ReviewQuery {
  risk?: RiskLevel | '';
  state?: ReviewState | '';
  routeId?: string;
  vehicleProfileId?: string;
}

/** Descent review endpoints; every answer is parsed with the shared schemas. */
@Injectable({ providedIn: 'root' })
export class ReviewsApi {
  private readonly http = inject(HttpClient);

  async list(query: ReviewQuery = {}): Promise<ReviewItem[]> {
    const params: Record<string, string> = {};
    for (const [key, value] of Object.entries(query)) {
      if (typeof value === 'string' && value) params[key] = value;
    }
    return reviewListSchema.parse(await firstValueFrom(this.http.get('/api/reviews', { params }))).items;
  }

  async get(reviewId: string): Promise<ReviewDetail> {
    return reviewDetailSchema.parse(await firstValueFrom(this.http.get(reviewPath(reviewId))));
  }

  async events(reviewId: string): Promise<AuditEvent[]> {
    const body = await firstValueFrom(this.http.get(`${reviewPath(reviewId)}/events`));
    return auditEventListSchema.parse(body).items;
  }

  /**
   * Moves the item (safety officers only; the server checks). Errors are shown by the form that
   * sent them, so a refused transition explains itself where the person is looking.
   */
  async transition(reviewId: string, request: ReviewTransitionRequest): Promise<ReviewTransitionResult> {
    const body = await firstValueFrom(
      this.http.post(`${reviewPath(reviewId)}/transitions`, request, {
        context: new HttpContext().set(ERRORS_SHOWN_INLINE, true),
      }),
    );
    return reviewTransitionResultSchema.parse(body);
  }
}

function reviewPath(reviewId: string): string {
  return `/api/reviews/${encodeURIComponent(reviewId)}`;
}
