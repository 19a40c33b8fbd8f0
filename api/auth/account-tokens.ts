import { createHash, randomBytes } from 'node:crypto';

export const INVITE_TTL_HOURS = 72;
export const RESET_TTL_MINUTES = 60;

/** A random token for a link in an e-mail, and the hash we store instead of the token. */
export function newAccountToken(): { token: string; tokenHash: string } {
  const token = randomBytes(32).toString('base64url');
  return { token, tokenHash: hashAccountToken(token) };
}

export function hashAccountToken(token: string): string {
  return createHash('sha256').update(token).digest('hex');
}
