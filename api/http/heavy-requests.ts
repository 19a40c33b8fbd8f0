import type { RequestHandler } from 'express';
import type { User } from '@shared/domain/auth';
import { HttpError } from './http-error';

/** Retry-After for a refused heavy request, s: long enough for a typical analysis to finish. */
const RETRY_AFTER_S = 2;

/**
 * Counts each person's heavy requests in flight (analyses, imports, uploads, reports) and refuses
 * one more than `perPerson` with 429, so one person cannot take every analysis thread or the
 * server's memory while the others wait. The count is per API process: behind a load balancer
 * each process holds the line for its own share.
 */
export class HeavyRequestLimiter {
  private readonly running = new Map<string, number>();

  constructor(private readonly perPerson: number) {}

  /** Requests `userId` has in flight in this process. */
  inFlight(userId: string): number {
    return this.running.get(userId) ?? 0;
  }

  middleware(): RequestHandler {
    return (_req, res, next) => {
      const user = res.locals['user'] as User | undefined;
      // Public heavy endpoints do not exist; signed-in access has already been checked.
      if (!user) return next();
      const current = this.inFlight(user.id);
      if (current >= this.perPerson) {
        throw new HttpError(
          429,
          'too_many_heavy_requests',
          `You already have ${current} analyses, imports or reports running; wait for one to finish (at most ${this.perPerson} at once)`,
          { inFlight: current, limit: this.perPerson, retryAfterS: RETRY_AFTER_S },
          { 'Retry-After': String(RETRY_AFTER_S) },
        );
      }
      this.running.set(user.id, current + 1);
      let released = false;
      const release = () => {
        if (released) return;
        released = true;
        const left = this.inFlight(user.id) - 1;
        if (left > 0) this.running.set(user.id, left);
        else this.running.delete(user.id);
      };
      // 'close' fires once the answer is sent or the client went away, whichever comes first.
      res.once('close', release);
      next();
    };
  }
}
