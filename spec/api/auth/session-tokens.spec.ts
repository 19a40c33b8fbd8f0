import { afterEach, describe, expect, it, vi } from 'vitest';
import { signSessionToken, verifySessionToken } from '../../../api/auth/session-tokens';

const SECRET = 'session-tokens-spec-secret-0123456789ab';
const claims = { sessionId: '6f1c2b1e-6a43-4a7b-9d7e-1c3f2a9b8e01', userId: '0b6d7a52-1e4f-4c8a-a2b3-5d6e7f8091a2' };

afterEach(() => vi.useRealTimers());

describe('session tokens', () => {
  it('answers a checked token again with the same claims', async () => {
    const token = await signSessionToken(SECRET, claims, 60);
    const first = await verifySessionToken(SECRET, token);
    expect(first).toMatchObject(claims);
    expect(await verifySessionToken(SECRET, token)).toEqual(first);
  });

  it('refuses a token once it has expired, even after it was accepted', async () => {
    vi.useFakeTimers({ now: new Date('2026-03-01T08:00:00Z'), toFake: ['Date'] });
    const token = await signSessionToken(SECRET, claims, 1);
    expect(await verifySessionToken(SECRET, token)).not.toBeNull();
    vi.setSystemTime(new Date('2026-03-01T08:00:59Z'));
    expect(await verifySessionToken(SECRET, token)).not.toBeNull();
    vi.setSystemTime(new Date('2026-03-01T08:01:00Z'));
    expect(await verifySessionToken(SECRET, token)).toBeNull();
    vi.setSystemTime(new Date('2026-03-01T08:00:30Z'));
    // Forgotten once refused: the check runs again in full (and accepts it at this earlier time).
    expect(await verifySessionToken(SECRET, token)).not.toBeNull();
  });

  it('refuses an accepted token under another secret and an altered copy of it', async () => {
    const token = await signSessionToken(SECRET, claims, 60);
    expect(await verifySessionToken(SECRET, token)).not.toBeNull();
    expect(await verifySessionToken('another-secret-another-secret-01234567', token)).toBeNull();
    const [header, payload, signature] = token.split('.');
    const forged = `${header}.${payload}.${signature!.slice(0, -2)}${signature!.endsWith('AA') ? 'BB' : 'AA'}`;
    expect(await verifySessionToken(SECRET, forged)).toBeNull();
  });
});
