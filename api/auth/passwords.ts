import { hash, verify } from '@node-rs/argon2';

/**
 * argon2id with the OWASP Password Storage Cheat Sheet's first listed setting
 * (m = 19 MiB, t = 2, p = 1), the minimum the cheat sheet recommends.
 */
// `algorithm: 2` is Argon2id in @node-rs/argon2's (const) Algorithm enum.
const ARGON2_OPTIONS = { algorithm: 2, memoryCost: 19_456, timeCost: 2, parallelism: 1 };

export function hashPassword(password: string): Promise<string> {
  return hash(password, ARGON2_OPTIONS);
}

export function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  return verify(passwordHash, password);
}

/**
 * A fixed hash to verify against when the e-mail is unknown, so a wrong e-mail costs the same
 * time as a wrong password and does not reveal which accounts exist.
 */
let dummyHash: Promise<string> | undefined;
export function dummyPasswordHash(): Promise<string> {
  dummyHash ??= hashPassword('not-a-real-password-for-timing');
  return dummyHash;
}
