import { jwtVerify, SignJWT, errors } from 'jose';

export const SESSION_COOKIE = 'descentry_session';
const ISSUER = 'descentry';
const AUDIENCE = 'descentry-web';

export interface SessionClaims {
  sessionId: string;
  userId: string;
  issuedAtS: number;
}

/** Signs a short-lived HS256 token naming the session row (its id is the JWT `jti`). */
export async function signSessionToken(
  secret: string,
  claims: { sessionId: string; userId: string },
  ttlMinutes: number,
): Promise<string> {
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

/** The token's claims, or null when it is expired, tampered with or malformed. */
export async function verifySessionToken(secret: string, token: string): Promise<SessionClaims | null> {
  try {
    const { payload } = await jwtVerify(token, new TextEncoder().encode(secret), {
      issuer: ISSUER,
      audience: AUDIENCE,
      algorithms: ['HS256'],
    });
    if (!payload.jti || !payload.sub || !payload.iat) return null;
    return { sessionId: payload.jti, userId: payload.sub, issuedAtS: payload.iat };
  } catch (error) {
    // jose throws for expired, badly signed or malformed tokens: all mean "not signed in".
    if (error instanceof errors.JOSEError) return null;
    throw error;
  }
}
