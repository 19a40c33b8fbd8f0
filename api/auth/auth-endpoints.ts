import { z } from 'zod';
import {
  changePasswordRequestSchema,
  loginRequestSchema,
  passwordResetRequestSchema,
  setPasswordWithTokenRequestSchema,
  tokenInfoRequestSchema,
  tokenInfoResponseSchema,
  sessionResponseSchema,
  userResponseSchema,
} from '@shared/domain/auth';
import type { AppDeps } from '../app-deps';
import { endpoint } from '../http/endpoint';
import { revokeSession } from './auth-repository';
import * as authService from './auth-service';
import { issueSessionCookie, sessionCookieOptions } from './authenticate';
import { knownDevice, rememberDevice } from './device-cookie';
import { SESSION_COOKIE } from './session-tokens';
import { runtimeOf } from '../app-runtime';

export function authEndpoints(deps: AppDeps) {
  const { db, config } = deps;
  return [
    endpoint({
      method: 'post',
      path: '/api/auth/login',
      summary: 'Sign in; sets the HttpOnly session cookie',
      tag: 'Sign-in',
      access: 'public',
      body: loginRequestSchema,
      responses: {
        200: { description: 'Signed in', schema: userResponseSchema },
        401: { description: 'Wrong e-mail or password, or account disabled' },
        429: { description: 'Too many failed attempts for the account or from the address; see Retry-After' },
      },
      handler: async ({ body, req, res }) => {
        const device = await knownDevice(config.SESSION_SECRET, req);
        const { session, user } = await authService.signIn(deps, body, {
          ip: req.ip ?? 'unknown',
          userAgent: req.get('user-agent'),
          device,
        });
        await issueSessionCookie(deps, req, res, session);
        await rememberDevice(config.SESSION_SECRET, req, res, user.email, device);
        res.json({ user });
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/auth/logout',
      summary: 'Sign out; the session is revoked on the server',
      tag: 'Sign-in',
      access: 'signed-in',
      responses: { 204: { description: 'Signed out' } },
      handler: async ({ req, res }) => {
        const sessionId = res.locals['sessionId'] as string;
        await revokeSession(db, sessionId);
        // This process forgets at once (the replay of this cookie on the next request must fail);
        // the others hear it from the database's notification.
        runtimeOf(deps).sessionCache.forgetSession(sessionId);
        res.clearCookie(SESSION_COOKIE, { ...sessionCookieOptions(req, config.SESSION_TTL_MINUTES), maxAge: undefined });
        res.status(204).end();
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/auth/session',
      summary: 'Who is signed in on this browser: the person, or null (never 401)',
      tag: 'Sign-in',
      access: 'public',
      responses: { 200: { description: 'The signed-in person, or null when nobody is', schema: sessionResponseSchema } },
      handler: ({ user, res }) => {
        res.json({ user: user ?? null });
      },
    }),
    endpoint({
      method: 'get',
      path: '/api/auth/me',
      summary: 'The signed-in person',
      tag: 'Sign-in',
      access: 'signed-in',
      responses: { 200: { description: 'Signed in', schema: userResponseSchema } },
      handler: ({ user, res }) => {
        res.json({ user });
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/auth/password',
      summary: 'Change one’s own password; ends every session of the account',
      tag: 'Sign-in',
      access: 'signed-in',
      body: changePasswordRequestSchema,
      responses: { 204: { description: 'Changed; sign in again' } },
      handler: async ({ body, user, req, res }) => {
        await authService.changePassword(deps, user!.id, body);
        res.clearCookie(SESSION_COOKIE, { ...sessionCookieOptions(req, config.SESSION_TTL_MINUTES), maxAge: undefined });
        res.status(204).end();
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/auth/token-info',
      summary: 'Who an invitation or reset link is for (does not use the link)',
      tag: 'Sign-in',
      access: 'public',
      body: tokenInfoRequestSchema,
      responses: {
        200: { description: 'Valid link', schema: tokenInfoResponseSchema },
        404: { description: 'Unknown link' },
        410: { description: 'Used or expired link' },
      },
      handler: async ({ body, res }) => {
        const { row, user } = await authService.describeToken(deps, body.token);
        res.json({ kind: row.kind, email: user.email, name: user.name });
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/auth/invitations/accept',
      summary: 'Accept an invitation by choosing a password',
      tag: 'Sign-in',
      access: 'public',
      body: setPasswordWithTokenRequestSchema,
      responses: { 204: { description: 'Account active; sign in' } },
      handler: async ({ body, res }) => {
        await authService.setPasswordWithToken(deps, 'invite', body);
        res.status(204).end();
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/auth/password-reset/request',
      summary: 'E-mail a password-reset link (same answer whether or not the account exists)',
      tag: 'Sign-in',
      access: 'public',
      body: passwordResetRequestSchema,
      responses: {
        202: { description: 'If the account exists, a message is on its way', schema: z.object({}) },
        429: { description: 'Too many requests for this address or from this client; see Retry-After' },
      },
      handler: async ({ body, req, res }) => {
        await authService.requestPasswordReset(deps, body.email, req.ip ?? 'unknown');
        res.status(202).json({});
      },
    }),
    endpoint({
      method: 'post',
      path: '/api/auth/password-reset/confirm',
      summary: 'Choose a new password through a reset link; ends every session',
      tag: 'Sign-in',
      access: 'public',
      body: setPasswordWithTokenRequestSchema,
      responses: { 204: { description: 'Password set; sign in' } },
      handler: async ({ body, res }) => {
        await authService.setPasswordWithToken(deps, 'reset', body);
        res.status(204).end();
      },
    }),
  ];
}
