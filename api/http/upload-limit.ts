import type { Request, RequestHandler, Response } from 'express';
import type { ApiError } from '@shared/domain/api-error';
import type { HttpError } from './http-error';

/** Room for the multipart boundaries, headers and small form fields around the file, bytes. */
const MULTIPART_OVERHEAD_BYTES = 64 * 1024;

/**
 * Keeps an upload from being read past its limit. Two guards, used together:
 *
 * - `precheck`, mounted before the upload parser: a request whose Content-Length already says
 *   it is too large is answered 413 before a byte of its body is read;
 * - `streamHandler`, given to multer: counts the body as it arrives and, as soon as it passes the
 *   limit (a body without Content-Length, or one that lied), stops the upload and answers 413.
 *
 * Either way the connection is closed shortly after the answer is out, so the rest of the body is
 * never read (multer, and Node's keep-alive handling, would otherwise read it to the end first).
 */
export function uploadLimit(maxFileBytes: number, tooLarge: () => HttpError) {
  const maxBodyBytes = maxFileBytes + MULTIPART_OVERHEAD_BYTES;
  const precheck: RequestHandler = (req, res, next) => {
    const declared = Number(req.get('content-length'));
    if (Number.isFinite(declared) && declared > maxBodyBytes) {
      refuse(req, res, tooLarge());
      return;
    }
    next();
  };
  const streamHandler = (req: Request, busboy: NodeJS.WritableStream & { destroy(error?: Error): void }) => {
    let received = 0;
    req.on('data', (chunk: Buffer) => {
      received += chunk.length;
      if (received <= maxBodyBytes) return;
      req.unpipe(busboy as NodeJS.WritableStream);
      req.pause();
      const error = tooLarge();
      if (req.res) refuse(req, req.res, error);
      busboy.destroy(error);
    });
    req.pipe(busboy);
  };
  return { precheck, streamHandler };
}

/**
 * After a refusal the connection lingers briefly, discarding what the client still sends (as
 * HTTP servers' "lingering close" does), so the client reads the whole 413 instead of a reset;
 * then it is closed, however much body is left. Bounded in time and bytes. (A `Connection: close`
 * answer would make Node close the socket the moment the answer is flushed, and a client still
 * sending would see a reset before it read the answer.)
 */
const LINGER_MS = 1_000;
const LINGER_BYTES = 4 * 1024 * 1024;

/** Answers the 413 at once and closes the connection after it, leaving the rest of the body unread. */
function refuse(req: Request, res: Response, error: HttpError): void {
  if (res.headersSent) {
    req.socket.destroy();
    return;
  }
  // Node would close a `Connection: close` request's socket the moment the answer is flushed;
  // the connection is to close after lingering instead.
  res.shouldKeepAlive = true;
  res.once('finish', () => lingerThenClose(req));
  res
    .status(error.status)
    .set(error.headers)
    .json({ error: { code: error.code, message: error.message, details: error.details } } satisfies ApiError);
}

function lingerThenClose(req: Request): void {
  const socket = req.socket;
  let discarded = 0;
  const close = () => {
    clearTimeout(timer);
    socket.destroy();
  };
  const timer = setTimeout(close, LINGER_MS);
  req.on('data', (chunk: Buffer) => {
    discarded += chunk.length;
    if (discarded > LINGER_BYTES) close();
  });
  req.once('end', close);
  req.resume();
}
