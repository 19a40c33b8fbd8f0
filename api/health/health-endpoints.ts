import { z } from 'zod';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import { pingDatabase } from './health-repository';

const healthSchema = z.object({ status: z.enum(['ok', 'degraded']), db: z.enum(['ok', 'down']) });

export function healthEndpoints({ db }: AppDeps) {
  return [
    endpoint({
      method: 'get',
      path: '/api/health',
      summary: 'Liveness and database reachability',
      tag: 'Health',
      access: 'public',
      responses: {
        200: { description: 'Healthy', schema: healthSchema },
        503: { description: 'Database unreachable', schema: healthSchema },
      },
      handler: async ({ res }) => {
        try {
          await Promise.race([pingDatabase(db), new Promise((_, reject) => setTimeout(() => reject(new Error('timeout')), 2000))]);
          res.json({ status: 'ok', db: 'ok' });
        } catch {
          // Any failure to reach the database within 2 s means "down" for the load balancer.
          res.status(503).set('Retry-After', '5').json({ status: 'degraded', db: 'down' });
        }
      },
    }),
  ];
}
