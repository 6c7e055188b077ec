import type { NextFunction, Request, Response } from 'express';
import multer from 'multer';
import { HttpError, badRequest } from '../http-error';

// Room for the multipart boundaries, part headers and the two id fields beside the file.
const FORM_OVERHEAD_BYTES = 64 * 1024;

export const tooLarge = (maxBytes: number) =>
  new HttpError(413, 'payload_too_large', `The file is larger than ${formatMb(maxBytes)}. Take the photo at a lower resolution or send a smaller file.`, [
    { path: 'file', message: `At most ${formatMb(maxBytes)}.` },
  ]);

const formatMb = (bytes: number) => `${Math.round((bytes / (1024 * 1024)) * 10) / 10} MB`;

/**
 * One file in the field `file`, held in memory up to `maxBytes`, with a few small text fields.
 * Every refusal from the parser becomes an API error; none reaches the 500 handler.
 */
export function singleUpload(maxBytes: number) {
  const parse = multer({
    storage: multer.memoryStorage(),
    limits: { fileSize: maxBytes, files: 1, fields: 4, fieldSize: 200, fieldNameSize: 40, parts: 6, headerPairs: 20 },
    // Browsers send the file name as UTF-8 bytes.
    defParamCharset: 'utf8',
  }).single('file');
  return (req: Request, res: Response, next: NextFunction) => {
    const declared = Number(req.headers['content-length']);
    // An honest client that declares an oversized body is refused before any of it is read.
    if (Number.isFinite(declared) && declared > maxBytes + FORM_OVERHEAD_BYTES) return next(tooLarge(maxBytes));
    parse(req, res, (err?: unknown) => next(err ? uploadError(err, maxBytes) : undefined));
  };
}

function uploadError(err: unknown, maxBytes: number): HttpError {
  if (err instanceof HttpError) return err;
  if (err instanceof multer.MulterError) {
    switch (err.code) {
      case 'LIMIT_FILE_SIZE':
        return tooLarge(maxBytes);
      case 'LIMIT_FILE_COUNT':
      case 'LIMIT_UNEXPECTED_FILE':
        return badRequest('Send one file at a time, in the field named file.', [{ path: 'file', message: 'One file only.' }]);
      default:
        return badRequest('The upload form could not be read. Choose the file again and retry.');
    }
  }
  // Busboy's own complaints (a malformed or cut-off multipart body) and a client that went away.
  return badRequest('The upload did not arrive complete. Check the connection and try again.');
}
