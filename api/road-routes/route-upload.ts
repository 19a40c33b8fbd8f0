import type { RequestHandler } from 'express';
import multer from 'multer';
import { BadRequestError, HttpError } from '../http/http-error';
import { uploadLimit } from '../http/upload-limit';

/** Largest route, GTFS or road-network file accepted, bytes (common practice: a feed of a mid-size network fits in 50 MB). */
export const ROUTE_FILE_MAX_BYTES = 50 * 1024 * 1024;

const tooLarge = () => new HttpError(413, 'file_too_large', `The file is larger than ${ROUTE_FILE_MAX_BYTES / 1024 / 1024} MB`);
const limit = uploadLimit(ROUTE_FILE_MAX_BYTES, tooLarge);
const upload = multer({
  storage: multer.memoryStorage(),
  limits: { fileSize: ROUTE_FILE_MAX_BYTES, files: 1, fields: 10 },
  streamHandler: limit.streamHandler,
} as multer.Options);

/**
 * Reads one multipart `file` into memory (route files are small; terrain uploads stream to disk
 * elsewhere). Upload problems become 4xx answers: too large → 413 (before reading the body when
 * its length says so, else as soon as the limit is passed), anything else → 400.
 */
export function singleFileUpload(): RequestHandler[] {
  const middleware = upload.single('file');
  return [
    limit.precheck,
    (req, res, next) => {
      middleware(req, res, (error: unknown) => {
        if (!error) return next();
        if (error instanceof multer.MulterError) {
          if (error.code === 'LIMIT_FILE_SIZE') return next(tooLarge());
          return next(new BadRequestError(`Upload refused: ${error.message}${error.field ? ` (field ${error.field})` : ''}`));
        }
        next(error);
      });
    },
  ];
}

/** The uploaded file, or a 400 naming the missing field. */
export function requireFile(file: Express.Multer.File | undefined): Express.Multer.File {
  if (!file) throw new BadRequestError('file: attach the file as multipart/form-data field "file"', { field: 'file' });
  return file;
}
