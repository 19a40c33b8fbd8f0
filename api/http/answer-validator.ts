import { createHash } from 'node:crypto';
import type { RequestHandler } from 'express';

/**
 * How the browser may keep a revalidated answer: in its own cache only (`private`: never a shared
 * proxy's), and only after asking the server whether it still holds (`no-cache`) on every use.
 */
export const REVALIDATED_CACHE_CONTROL = 'private, no-cache';

/**
 * The validator of an answer: a weak ETag over the JSON exactly as it would be sent (SHA-256,
 * the first 160 bits). Weak, because the same JSON goes out gzip- or brotli-compressed or as is.
 * Being made from the content itself, it changes with every change of what the answer shows,
 * whatever the change was (a re-run, an edit, a field shown only to some roles, a new version of
 * the code), and two callers share one only when they would be sent the same bytes.
 */
export function answerEtag(json: string | Buffer): string {
  return `W/"${createHash('sha256').update(json).digest('base64url').slice(0, 27)}"`;
}

/** Whether an If-None-Match header names the ETag (weak comparison, RFC 9110 §13.1.2), or is `*`. */
export function ifNoneMatchHolds(header: string | undefined, etag: string): boolean {
  if (!header) return false;
  const opaque = etag.replace(/^W\//, '');
  return header.split(',').some((candidate) => {
    const tag = candidate.trim();
    return tag === '*' || tag.replace(/^W\//, '') === opaque;
  });
}

/**
 * Middleware for one read endpoint, after its access check (so a caller who may not read it gets
 * 401/403, never 304): a 200 JSON answer goes out with its ETag and `private, no-cache`, or as 304
 * without a body when the browser's If-None-Match already names it. The handler runs either way,
 * so the check costs the server what the answer costs and saves only the bytes on the wire;
 * errors keep the API's `no-store`.
 */
export function revalidatedAnswer(): RequestHandler {
  return (req, res, next) => {
    const json = res.json.bind(res);
    res.json = (body: unknown) => {
      if (res.statusCode !== 200) return json(body);
      const text = JSON.stringify(body) ?? 'null';
      const etag = answerEtag(text);
      res.setHeader('Cache-Control', REVALIDATED_CACHE_CONTROL);
      res.setHeader('ETag', etag);
      if (ifNoneMatchHolds(req.get('if-none-match'), etag)) {
        res.status(304).end();
        return res;
      }
      res.setHeader('Content-Type', 'application/json; charset=utf-8');
      res.send(text);
      return res;
    };
    next();
  };
}
