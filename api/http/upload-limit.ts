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
 * Either way the answer goes out with `Connection: close` and the connection is closed once it is
 * sent, so the rest of the body is never read (multer alone would read it to the end first).
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

/** Answers the 413 at once and closes the connection after it, leaving the body unread. */
function refuse(req: Request, res: Response, error: HttpError): void {
  if (res.headersSent) {
    req.socket.destroy();
    return;
  }
  res.once('finish', () => req.socket.destroy());
  res
    .status(error.status)
    .set({ ...error.headers, Connection: 'close' })
    .json({ error: { code: error.code, message: error.message, details: error.details } } satisfies ApiError);
}
