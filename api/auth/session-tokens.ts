import { jwtVerify, SignJWT, errors } from 'jose';
import { LRUCache } from 'lru-cache';

export const SESSION_COOKIE = 'descentry_session';
const ISSUER = 'descentry';
const AUDIENCE = 'descentry-web';

export interface SessionClaims {
  sessionId: string;
  userId: string;
  issuedAtS: number;
}

/** Signs a short-lived HS256 token naming the session row (its id is the JWT `jti`). */
export async function signSessionToken(secret: string, claims: { sessionId: string; userId: string }, ttlMinutes: number): Promise<string> {
  return new SignJWT({})
    .setProtectedHeader({ alg: 'HS256' })
    .setSubject(claims.userId)
    .setJti(claims.sessionId)
    .setIssuer(ISSUER)
    .setAudience(AUDIENCE)
    .setIssuedAt()
    .setExpirationTime(`${ttlMinutes}m`)
    .sign(new TextEncoder().encode(secret));
}

interface VerifiedToken {
  secret: string;
  claims: SessionClaims;
  expiresAtS: number;
}

/**
 * Tokens whose signature and claims have been checked, by the token's exact text. Checking costs
 * a key import and an HMAC through WebCrypto on every API request, and its answer for the same
 * text and secret can only change by the token expiring, which is checked again on every use.
 * This memo says nothing about whether the session is still live: the caller still asks the
 * session cache or the database for that on every request.
 */
const verifiedTokens = new LRUCache<string, VerifiedToken>({ max: 10_000 });

/** The token's claims, or null when it is expired, tampered with or malformed. */
export async function verifySessionToken(secret: string, token: string): Promise<SessionClaims | null> {
  const known = verifiedTokens.get(token);
  if (known && known.secret === secret) {
    // jose's rule: a token is expired once its `exp` is not after the current whole second.
    if (Math.floor(Date.now() / 1000) < known.expiresAtS) return known.claims;
    verifiedTokens.delete(token);
    return null;
  }
  try {
    const { payload } = await jwtVerify(token, new TextEncoder().encode(secret), {
      issuer: ISSUER,
      audience: AUDIENCE,
      algorithms: ['HS256'],
    });
    if (!payload.jti || !payload.sub || !payload.iat || !payload.exp) return null;
    const claims = { sessionId: payload.jti, userId: payload.sub, issuedAtS: payload.iat };
    verifiedTokens.set(token, { secret, claims, expiresAtS: payload.exp });
    return claims;
  } catch (error) {
    // jose throws for expired, badly signed or malformed tokens: all mean "not signed in".
    if (error instanceof errors.JOSEError) return null;
    throw error;
  }
}
