import type { Request, RequestHandler, Response } from 'express';
import type { User } from '@shared/domain/auth';
import type { AppDeps } from '../app-deps';
import { extendSession, findLiveSessionUser } from './auth-repository';
import { runtimeOf } from '../app-runtime';
import type { LiveSession } from './session-cache';
import { SESSION_COOKIE, signSessionToken, verifySessionToken } from './session-tokens';

/** Renew the cookie when it is older than this share of its lifetime (sliding expiry). */
const RENEW_AFTER_SHARE = 0.25;

export function sessionCookieOptions(req: Request, ttlMinutes: number) {
  return {
    httpOnly: true,
    sameSite: 'strict' as const,
    secure: req.secure,
    path: '/',
    maxAge: ttlMinutes * 60_000,
  };
}

export async function issueSessionCookie({ config }: AppDeps, req: Request, res: Response, session: { id: string; userId: string }) {
  const token = await signSessionToken(
    config.SESSION_SECRET,
    { sessionId: session.id, userId: session.userId },
    config.SESSION_TTL_MINUTES,
  );
  res.cookie(SESSION_COOKIE, token, sessionCookieOptions(req, config.SESSION_TTL_MINUTES));
}

/**
 * Reads the session cookie on every API request: a valid signature is not enough, the session
 * row must be live (not revoked by sign-out or a password change) and the account active.
 * The answer is kept for a moment in the process's session cache (session-cache.ts), which the
 * database tells about every change to a session or an account, so revocation still takes effect
 * at once in every process. Puts the person in `res.locals.user`; `requireRole` decides what
 * they may do.
 */
export function authenticate(deps: AppDeps): RequestHandler {
  const { db, config } = deps;
  const cache = runtimeOf(deps).sessionCache;
  return async (req, res, next) => {
    const token = (req.cookies as Record<string, string | undefined>)[SESSION_COOKIE];
    if (!token) return next();
    const claims = await verifySessionToken(config.SESSION_SECRET, token);
    if (!claims) return next();
    let live = cache.get(claims.sessionId, claims.userId);
    if (!live) {
      const generation = cache.generation;
      const row = await findLiveSessionUser(db, claims.sessionId, claims.userId);
      if (!row) return next();
      live = {
        sessionId: row.session.id,
        expiresAt: row.session.expiresAt,
        user: { id: row.user.id, email: row.user.email, name: row.user.name, role: row.user.role },
      } satisfies LiveSession;
      cache.remember(live, generation);
    }
    const user: User = { ...live.user };
    res.locals['user'] = user;
    res.locals['sessionId'] = live.sessionId;
    const ageS = Date.now() / 1000 - claims.issuedAtS;
    if (ageS > config.SESSION_TTL_MINUTES * 60 * RENEW_AFTER_SHARE) {
      await extendSession(db, live.sessionId, new Date(Date.now() + config.SESSION_TTL_MINUTES * 60_000));
      await issueSessionCookie(deps, req, res, { id: live.sessionId, userId: user.id });
    }
    next();
  };
}
