import { HttpError } from '../core/errors';

/**
 * How an upload is refused:
 * - 413 payload_too_large: over UPLOAD_MAX_BYTES;
 * - 415 unsupported_media_type: a kind we do not take, a program or script, an archive that
 *   holds one, a macro-enabled document, or an archive we cannot look inside (encrypted, nested);
 * - 422 validation_failed (field `file`): the content is not what its name says, or is damaged;
 * - 400 bad_request: no file, or more than one, in the form.
 */
export type RejectionReason = 'too_large' | 'executable' | 'not_accepted' | 'mismatch' | 'unreadable' | 'missing';

export function rejection(reason: RejectionReason, message: string): HttpError {
  switch (reason) {
    case 'too_large':
      return new HttpError(413, 'payload_too_large', message);
    case 'executable':
    case 'not_accepted':
      return new HttpError(415, 'unsupported_media_type', message);
    case 'mismatch':
    case 'unreadable':
      return new HttpError(422, 'validation_failed', message, { file: [message] });
    case 'missing':
      return new HttpError(400, 'bad_request', message);
  }
}
