import type { Request, RequestHandler } from 'express';
import multer, { MulterError } from 'multer';
import type { ObjectStore } from '../storage';
import { rejection } from './rejections';
import { deliverableStorage, formatBytes, type DeliverableStorageOptions, type StoredUpload } from './storage-engine';

export interface DeliverableUploadOptions {
  store: ObjectStore;
  /** UPLOAD_MAX_BYTES from the configuration. */
  maxBytes: number;
  keyFor: DeliverableStorageOptions['keyFor'];
  /** The multipart field that carries the file (default "file"). */
  field?: string;
}

/**
 * Middleware for a route that takes one deliverable: afterwards `uploadedFile(req)` gives the
 * stored, checked file and `req.body` the form's other (small) fields. Every refusal is an
 * HttpError for the one final error handler; nothing is left in storage when it refuses.
 */
export function deliverableUpload(opts: DeliverableUploadOptions): RequestHandler {
  const field = opts.field ?? 'file';
  const parse = multer({
    storage: deliverableStorage(opts),
    // Browsers send UTF-8 file names; busboy would read them as Latin-1 ("BÃ©ton.pdf") otherwise.
    defParamCharset: 'utf8',
    limits: { files: 1, fileSize: opts.maxBytes, fields: 20, fieldSize: 16 * 1024, parts: 22, headerPairs: 100 },
  }).single(field);

  return (req, res, next) => {
    parse(req, res, (err?: unknown) => {
      if (err) return next(translate(err, field, opts.maxBytes));
      if (!req.file)
        return next(rejection('missing', `No file was sent (expected a multipart form with the file in "${field}").`));
      next();
    });
  };
}

/** The checked file of a request that passed `deliverableUpload`. */
export function uploadedFile(req: Request): StoredUpload {
  const file = req.file as (Express.Multer.File & StoredUpload) | undefined;
  if (!file?.key) throw new Error('uploadedFile() called on a request without a stored upload');
  const { key, sha256, size, detectedType, contentType, originalName, safeName } = file;
  return { key, sha256, size, detectedType, contentType, originalName, safeName };
}

function translate(err: unknown, field: string, maxBytes: number): unknown {
  if (!(err instanceof MulterError)) return err;
  switch (err.code) {
    case 'LIMIT_FILE_SIZE':
      return rejection('too_large', `The file is larger than the limit of ${formatBytes(maxBytes)}.`);
    case 'LIMIT_FILE_COUNT':
    case 'LIMIT_UNEXPECTED_FILE':
      return rejection('missing', `Send exactly one file, in the form field "${field}".`);
    default:
      return rejection('missing', `The upload form could not be read (${err.message}).`);
  }
}
