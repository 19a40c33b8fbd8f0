import { createHash, randomUUID } from 'node:crypto';
import { readFileSync } from 'node:fs';
import { fileURLToPath } from 'node:url';
import type { Request, RequestHandler, Response } from 'express';
import type { User } from '@shared/domain/auth';
import { sendKeptAnswer, type KeptAnswer } from './answer-cache';
import { sizeOf, type BuiltAnswers } from './built-answers';

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

/** The parts an answer depends on, as `answerIdentity` reads them: plain values, compared as JSON. */
export type AnswerIdentity = readonly (string | number | boolean | null | readonly (string | number)[])[];

let codeVersion: string | undefined;

/**
 * The version of the server's code, part of every identity-made ETag, so an answer whose shape
 * or wording changed with a new release is never confirmed with 304 to a browser that kept the
 * old one. Run from the built bundle (dist/api/main.mjs, all of the server's code in one file),
 * it is the bundle's SHA-256; run from the sources (development, tests), every process counts as
 * new code.
 */
export function serverCodeVersion(): string {
  if (codeVersion === undefined) {
    const file = fileURLToPath(import.meta.url);
    codeVersion = file.endsWith('.mjs')
      ? createHash('sha256').update(readFileSync(file)).digest('base64url').slice(0, 16)
      : `sources-${randomUUID()}`;
  }
  return codeVersion;
}

/**
 * The validator of an answer made from what it depends on instead of from the answer itself: the
 * endpoint, the server's code version, the caller's role (or 'every role' for an answer the same
 * for all) and the identity the endpoint read (its rows' versions, the query). Weak, like
 * `answerEtag`, and of the same form.
 */
export function identityEtag(endpointPath: string, role: string, identity: AnswerIdentity): string {
  const text = JSON.stringify([serverCodeVersion(), endpointPath, role, identity]);
  return `W/"${createHash('sha256').update(text).digest('base64url').slice(0, 27)}"`;
}

function sameIdentity(a: AnswerIdentity, b: AnswerIdentity): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

export interface IdentifiedAnswerOptions {
  /** The endpoint's documented path (part of the ETag: two endpoints never share one). */
  endpointPath: string;
  /**
   * What the answer depends on, read without building it: undefined when there is nothing to
   * answer (no such item), and the handler then answers as it would (404).
   */
  identity: () => Promise<AnswerIdentity | undefined>;
  /** Builds the answer and sends it with `res.json` (or an error). */
  build: () => Promise<void> | void;
  /** Where built answers are kept by their ETag, if anywhere (the process's BuiltAnswers). */
  kept?: BuiltAnswers;
  /**
   * Whether every role is shown the very same answer, so people of different roles may share an
   * ETag (and a kept answer). Otherwise the caller's role is part of the ETag.
   */
  sameForEveryRole?: boolean;
}

/**
 * Answers a read whose validator comes from what it depends on (`answerIdentity` in the endpoint
 * definition), after its access check:
 * - the identity is read (one small query) and made into the ETag; when the browser's
 *   If-None-Match names it, 304 without a body, and nothing is built;
 * - otherwise the answer kept under that ETag is sent, if this process built it before;
 * - otherwise the handler builds it; the identity is read again once it has, and only when it is
 *   still the same (nothing changed while the answer was being built) does the answer go out
 *   with the ETag and get kept. If something changed meanwhile it goes out as it was built,
 *   without an ETag and `no-store`, and the next visit starts over.
 * The caller's role is part of the ETag unless the endpoint declares that every role is shown the
 * same answer (`sameForEveryRole`), so a browser shared by two people of different roles never
 * gets one role's answer confirmed for the other. (An answer that differs from one person to
 * another must not use this: the identity would have to name the person.) Errors keep the API's
 * `no-store`.
 */
export async function answerByIdentity(req: Request, res: Response, options: IdentifiedAnswerOptions): Promise<void> {
  const identity = await options.identity();
  if (identity === undefined) {
    await options.build();
    return;
  }
  const role = options.sameForEveryRole ? 'every role' : ((res.locals['user'] as User | undefined)?.role ?? 'public');
  const etag = identityEtag(options.endpointPath, role, identity);
  if (ifNoneMatchHolds(req.get('if-none-match'), etag)) {
    res.setHeader('Cache-Control', REVALIDATED_CACHE_CONTROL);
    res.setHeader('ETag', etag);
    res.status(304).end();
    return;
  }
  const kept = options.kept?.get(etag);
  if (kept) {
    sendWithEtag(req, res, etag, kept, options.kept);
    return;
  }
  let built: string | undefined;
  const json = res.json.bind(res);
  res.json = (body: unknown) => {
    if (res.statusCode !== 200) return json(body);
    built = JSON.stringify(body) ?? 'null';
    return res;
  };
  try {
    await options.build();
  } finally {
    res.json = json;
  }
  if (built === undefined) return;
  const after = await options.identity();
  const fresh = { json: Buffer.from(built) };
  if (after === undefined || !sameIdentity(identity, after)) {
    res.setHeader('Content-Type', 'application/json; charset=utf-8');
    res.send(fresh.json);
    return;
  }
  options.kept?.set(etag, fresh);
  sendWithEtag(req, res, etag, fresh, options.kept);
}

function sendWithEtag(req: Request, res: Response, etag: string, answer: KeptAnswer, kept: BuiltAnswers | undefined): void {
  res.setHeader('Cache-Control', REVALIDATED_CACHE_CONTROL);
  res.setHeader('ETag', etag);
  const grew = (before: number) => kept?.grew(etag, before, answer);
  const before = sizeOf(answer);
  sendKeptAnswer(req, res, answer, grew);
  grew(before);
}
