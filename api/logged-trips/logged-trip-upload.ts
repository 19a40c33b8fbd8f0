import type { RequestHandler } from 'express';
import multer from 'multer';
import { BadRequestError, HttpError } from '../http/http-error';
import { LOGGED_TRIP_MAX_BYTES } from './logged-trips-service';

const upload = multer({ storage: multer.memoryStorage(), limits: { fileSize: LOGGED_TRIP_MAX_BYTES, files: 1, fields: 10 } });

/**
 * Reads one multipart `file` (a logged-trip CSV, bounded by LOGGED_TRIP_MAX_BYTES) into memory;
 * too large → 413, any other upload problem → 400. The CSV itself is then read row by row.
 */
export function loggedTripFileUpload(): RequestHandler {
  const middleware = upload.single('file');
  return (req, res, next) => {
    middleware(req, res, (error: unknown) => {
      if (!error) return next();
      if (error instanceof multer.MulterError) {
        if (error.code === 'LIMIT_FILE_SIZE') {
          return next(
            new HttpError(
              413,
              'file_too_large',
              `The logged trip is larger than ${LOGGED_TRIP_MAX_BYTES / 1024 / 1024} MB; split it into shorter trips`,
            ),
          );
        }
        return next(
          new BadRequestError(
            `Upload refused: ${error.message}${error.field ? ` (field ${error.field})` : ''}`,
            { field: error.field },
            'invalid_upload',
          ),
        );
      }
      next(error);
    });
  };
}
