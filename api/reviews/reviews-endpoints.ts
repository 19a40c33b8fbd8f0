import { rolesWith } from '@shared/domain/permissions';
import {
  auditEventListSchema,
  reviewDetailSchema,
  reviewIdParamsSchema,
  reviewListQuerySchema,
  reviewListSchema,
  reviewTransitionRequestSchema,
  reviewTransitionResultSchema,
} from '@shared/domain/reviews';
import { ENGINEERING_CAUTION } from '@shared/engine/constants';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import * as reviewsService from './reviews-service';

export function reviewsEndpoints(deps: AppDeps) {
  return [
    endpoint({
      method: 'get',
      path: '/api/reviews',
      summary: 'Descent review items (elevated risk or worse), worst first; filter by risk, state, route or vehicle profile',
      tag: 'Descent review',
      access: 'signed-in',
      query: reviewListQuerySchema,
      responses: { 200: { description: 'Review items', schema: reviewListSchema } },
      handler: async ({ query, res }) => {
        res.json({ items: await reviewsService.listReviews(deps, query), caution: ENGINEERING_CAUTION });
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/reviews/:reviewId',
      summary: 'One review item with the descent’s profile (chart) and route line (map)',
      tag: 'Descent review',
      access: 'signed-in',
      params: reviewIdParamsSchema,
      responses: { 200: { description: 'The item', schema: reviewDetailSchema }, 404: { description: 'No such item' } },
      handler: async ({ params, res }) => {
        res.json(await reviewsService.getReview(deps, params.reviewId));
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/reviews/:reviewId/transitions',
      summary: 'Acknowledge, mitigate (and re-run), accept with a reason, or reopen a review item',
      tag: 'Descent review',
      access: rolesWith('reviews.act'),
      heavy: true,
      params: reviewIdParamsSchema,
      body: reviewTransitionRequestSchema,
      responses: {
        200: { description: 'The item after the move and its audit event', schema: reviewTransitionResultSchema },
        404: { description: 'No such item' },
        409: { description: 'The action does not apply in the item’s current state (named in the message)' },
      },
      handler: async ({ params, body, user, res }) => {
        res.json(await reviewsService.transitionReview(deps, user!, params.reviewId, body));
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/reviews/:reviewId/events',
      summary: 'Audit trail of a review item, oldest first (append-only)',
      tag: 'Descent review',
      access: 'signed-in',
      params: reviewIdParamsSchema,
      responses: { 200: { description: 'Events', schema: auditEventListSchema }, 404: { description: 'No such item' } },
      handler: async ({ params, res }) => {
        res.json({ items: await reviewsService.listEvents(deps, params.reviewId) });
      },
    }),
  ];
}
