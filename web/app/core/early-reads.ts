/**
 * What a page reads first, declared on its route as `data: { firstReads }`: given the address's
 * parameters, it asks `read` for each API answer the page will ask for as soon as it exists (and
 * may await one answer to decide the next, as the page itself would). These reads start while
 * Angular and the page's scripts are still loading (`preloadFirstPage`), so on a first visit the
 * answers are already in when the page asks, instead of being asked for only after it rendered.
 */
export type FirstReads = (params: Readonly<Record<string, string>>, read: (url: string) => Promise<unknown>) => Promise<void> | void;

/** An answer read ahead of its page: its status and parsed body, or null when none came (network). */
export interface EarlyAnswer {
  status: number;
  statusText: string;
  body: unknown;
}

/**
 * An early answer is handed over only this long after it was asked for: a page that asks later
 * (the person was slow to get there, or the scripts failed and were loaded again) asks the API.
 */
export const EARLY_READ_LIFETIME_MS = 15_000;

/** The session read every page's guards start with (main.ts starts it before anything else loads). */
export const SESSION_PATH = '/api/auth/session';

const pending = new Map<string, { startedAt: number; answer: Promise<EarlyAnswer | null> }>();

/**
 * Asks for `url` (a GET of a JSON answer, with its query string exactly as the page's request will
 * carry it) once; the page's own request for the same address is then answered from it by
 * `earlyReadsInterceptor`. Resolves to the parsed body of a successful answer, else null.
 */
export function readEarly(url: string): Promise<unknown> {
  let entry = pending.get(url);
  if (!entry) {
    entry = { startedAt: Date.now(), answer: fetchAnswer(url) };
    pending.set(url, entry);
  }
  return entry.answer.then((answer) => (answer && answer.status >= 200 && answer.status < 300 ? answer.body : null));
}

async function fetchAnswer(url: string): Promise<EarlyAnswer | null> {
  try {
    // The same headers and cache mode as HttpClient's fetch: revalidated answers come back as 304
    // from the API and as the browser's stored copy here.
    const response = await fetch(url, { headers: { Accept: 'application/json, text/plain, */*' } });
    const text = await response.text();
    let body: unknown = text;
    try {
      body = text === '' ? null : JSON.parse(text);
    } catch {
      // Not JSON (a proxy's error page): handed over as text, as HttpClient would report it.
    }
    return { status: response.status, statusText: response.statusText, body };
  } catch {
    return null;
  }
}

/**
 * Takes the early read for `url` if one is waiting and was asked for less than
 * `EARLY_READ_LIFETIME_MS` ago: its answer (null when none came). Each read is taken once.
 */
export function takeEarlyRead(url: string): Promise<EarlyAnswer | null> | undefined {
  const entry = pending.get(url);
  if (!entry) return undefined;
  pending.delete(url);
  return Date.now() - entry.startedAt > EARLY_READ_LIFETIME_MS ? undefined : entry.answer;
}

/** Drops every early read not yet taken (a change may have altered what they describe). */
export function forgetEarlyReads(): void {
  pending.clear();
}
