import type { RequestHandler } from 'express';
import multer from 'multer';
import { AppError, ValidationError } from '../errors';
import { checkMultipartText, MULTIPART_AS_BYTES } from '../http/body-text';
import { fieldTooLong } from '../http/video-upload';
import { DEMO_LIMITS } from '../../src/contracts/demonstrations';
import { PictureError } from './picture-error';

const HINT = 'Send the picture as multipart/form-data with one file in the field "file".';

/**
 * Receives one picture (field `file`, at most {@link DEMO_LIMITS.pictureBytes}) into memory: it is
 * small, and a refused one leaves nothing on disk. `req.file.buffer` holds it afterwards; a missing
 * file is 422, an oversized one 413, a malformed body 400.
 */
export function receivePicture(): RequestHandler {
  const upload = multer({
    storage: multer.memoryStorage(),
    // Field values and file names as bytes, checked as UTF-8 afterwards (http/body-text.ts).
    ...MULTIPART_AS_BYTES,
    limits: { fileSize: DEMO_LIMITS.pictureBytes, files: 1, fields: 5, parts: 6, fieldNameSize: 100, fieldSize: 2000 },
  }).single('file');
  const tooLarge = () =>
    new PictureError('too_large', `The picture is larger than ${DEMO_LIMITS.pictureBytes / 1024 / 1024} MB. Send a smaller copy.`);
  return (req, res, next) => {
    if (Number(req.headers['content-length'] ?? 0) > DEMO_LIMITS.pictureBytes + 64 * 1024) {
      res.setHeader('Connection', 'close');
      return next(tooLarge());
    }
    if (!req.is('multipart/form-data')) return next(new AppError(400, 'bad_upload', HINT));
    upload(req, res, (err: unknown) => {
      if (!err) {
        try {
          checkMultipartText(req);
        } catch (refusal) {
          return next(refusal);
        }
        if (!req.file)
          return next(new ValidationError('Choose a picture to upload.', [{ path: ['file'], message: 'A picture is required.' }]));
        return next();
      }
      if (err instanceof multer.MulterError) {
        if (err.code === 'LIMIT_FILE_SIZE') return next(tooLarge());
        if (err.code === 'LIMIT_FIELD_VALUE') return next(fieldTooLong(err.field));
        if (err.code === 'LIMIT_FILE_COUNT' || err.code === 'LIMIT_UNEXPECTED_FILE') {
          return next(
            new ValidationError('Upload one picture per request, in the field "file".', [
              { path: ['file'], message: 'One picture per request.' },
            ]),
          );
        }
      }
      next(new AppError(400, 'bad_upload', `The upload could not be read. ${HINT}`));
    });
  };
}
