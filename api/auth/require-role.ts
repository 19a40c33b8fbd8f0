import type { RequestHandler } from 'express';
import type { User } from '@shared/domain/auth';
import type { Role } from '@shared/domain/roles';
import { ForbiddenError, UnauthorizedError } from '../http/http-error';

/** Who may call an endpoint: anyone, anyone signed in, or the listed roles. */
export type Access = 'public' | 'signed-in' | readonly Role[];

/**
 * The one authorization check every endpoint passes through (mounted by `mountEndpoint`).
 * `authenticate` has already put the signed-in person, if any, in `res.locals.user`.
 */
export function requireRole(access: Access): RequestHandler {
  return (_req, res, next) => {
    if (access === 'public') {
      next();
      return;
    }
    const user = res.locals['user'] as User | undefined;
    if (!user) throw new UnauthorizedError();
    if (access !== 'signed-in' && !access.includes(user.role)) {
      throw new ForbiddenError(`This needs the role ${access.join(' or ')}; you are signed in as ${user.role}`);
    }
    next();
  };
}
