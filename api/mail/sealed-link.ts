import { hkdfSync } from 'node:crypto';
import { CompactEncrypt, compactDecrypt } from 'jose';

/**
 * Links that act as credentials (invitations, password resets) never sit readable in the
 * outbox: the body is stored with `MAIL_LINK_PLACEHOLDER` where the link goes, and the link itself
 * is stored sealed (JWE, direct A256GCM encryption with a key derived from SESSION_SECRET by
 * HKDF-SHA-256). The mail worker opens it only to send the message and forgets it once sent, so
 * administrators reading the outbox, or a copy of the database, learn nothing they could use.
 */
export const MAIL_LINK_PLACEHOLDER = '[personal link: added when the message is sent, shown only to the recipient]';

function sealingKey(secret: string): Uint8Array {
  return new Uint8Array(hkdfSync('sha256', secret, 'descentry', 'mail-link-sealing', 32));
}

export async function sealLink(secret: string, link: string): Promise<string> {
  return new CompactEncrypt(new TextEncoder().encode(link)).setProtectedHeader({ alg: 'dir', enc: 'A256GCM' }).encrypt(sealingKey(secret));
}

/** The link, or null when the seal cannot be opened (made under another SESSION_SECRET, or damaged). */
export async function openSealedLink(secret: string, sealed: string): Promise<string | null> {
  try {
    const { plaintext } = await compactDecrypt(sealed, sealingKey(secret));
    return new TextDecoder().decode(plaintext);
  } catch {
    // jose throws for a wrong key or a damaged token alike; either way the link is lost.
    return null;
  }
}

/** Hides the value of every `token=` parameter in a text (for the administrators' mail screens). */
export function maskLinkTokens(text: string): string {
  return text.replace(/([?&]token=)[A-Za-z0-9_%.~-]+/g, '$1••••••');
}
