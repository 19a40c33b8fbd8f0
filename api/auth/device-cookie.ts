import { randomUUID } from 'node:crypto';
import type { Request, Response } from 'express';
import { SignJWT, errors, jwtVerify } from 'jose';

/**
 * The device cookie of the OWASP Authentication Cheat Sheet: a browser that has signed in to an
 * account receives a signed token naming that account, and its later sign-ins to the account are
 * counted under the device instead of the account. Guesses from other clients then slow those
 * clients down, not the owner in their usual browser.
 */
export const DEVICE_COOKIE = 'descentry_device';
const AUDIENCE = 'descentry-device';
const ISSUER = 'descentry';
/** How long a browser stays known, days (common practice: a year). */
const DEVICE_COOKIE_DAYS = 365;

export interface KnownDevice {
  id: string;
  email: string;
}

/** The device the request's cookie names, if its signature holds. */
export async function knownDevice(secret: string, req: Request): Promise<KnownDevice | null> {
  const token = (req.cookies as Record<string, string | undefined>)[DEVICE_COOKIE];
  if (!token) return null;
  try {
    const { payload } = await jwtVerify(token, new TextEncoder().encode(secret), {
      audience: AUDIENCE,
      issuer: ISSUER,
      algorithms: ['HS256'],
    });
    if (!payload.jti || !payload.sub) return null;
    return { id: payload.jti, email: payload.sub };
  } catch (error) {
    // jose throws for expired, badly signed or malformed tokens: the browser is not known.
    if (error instanceof errors.JOSEError) return null;
    throw error;
  }
}

/** Gives the browser a device cookie for the account it just signed in to (kept if it has one). */
export async function rememberDevice(
  secret: string,
  req: Request,
  res: Response,
  email: string,
  current: KnownDevice | null,
): Promise<void> {
  if (current && current.email === email) return;
  const token = await new SignJWT({})
    .setProtectedHeader({ alg: 'HS256' })
    .setSubject(email)
    .setJti(randomUUID())
    .setIssuer(ISSUER)
    .setAudience(AUDIENCE)
    .setIssuedAt()
    .setExpirationTime(`${DEVICE_COOKIE_DAYS}d`)
    .sign(new TextEncoder().encode(secret));
  res.cookie(DEVICE_COOKIE, token, {
    httpOnly: true,
    sameSite: 'strict',
    secure: req.secure,
    path: '/api/auth',
    maxAge: DEVICE_COOKIE_DAYS * 86_400_000,
  });
}
