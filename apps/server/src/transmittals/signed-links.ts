import { createHmac, timingSafeEqual } from 'node:crypto';
import { HttpError } from '../core/errors';
import type { FirmDateSettings } from '@trabeate/dates';
import { formatInstant } from '../drawings/format';
import { printDayTime } from '../look/print-look';

/**
 * Download links for outside recipients (no account): an HMAC-SHA256 over what the link opens (the
 * transmittal, the recipient, the item) and until when. Nothing is stored per link; changing any
 * part, the expiry included, breaks the signature.
 */
export interface LinkClaims {
  transmittalId: string;
  recipientId: string;
  /** A revision file's id, or "zip", or "sheet". */
  item: string;
  /** Unix seconds. */
  expires: number;
}

const payload = (c: LinkClaims) => `transmittal-link|${c.transmittalId}|${c.recipientId}|${c.item}|${c.expires}`;

export function signLink(secret: Buffer, claims: LinkClaims): string {
  return createHmac('sha256', secret).update(payload(claims)).digest('base64url');
}

export function linkQuery(secret: Buffer, claims: LinkClaims): string {
  return `r=${claims.recipientId}&e=${claims.expires}&s=${signLink(secret, claims)}`;
}

/**
 * Throws 403 saying why when the signature does not match or the link has expired; the expiry is
 * told in the firm's date format and time zone when `dates` are given (else UTC).
 */
export function verifyLink(
  secret: Buffer,
  claims: LinkClaims,
  signature: string,
  now = Date.now(),
  dates?: FirmDateSettings,
): void {
  const expected = Buffer.from(signLink(secret, claims));
  const given = Buffer.from(signature);
  if (given.length !== expected.length || !timingSafeEqual(given, expected)) {
    throw new HttpError(
      403,
      'forbidden',
      'This download link is not valid: it has been changed or was not made by us. Use the link exactly as it came in the e-mail.',
    );
  }
  if (claims.expires * 1000 <= now) {
    throw new HttpError(
      403,
      'forbidden',
      `This download link expired on ${dates ? printDayTime(new Date(claims.expires * 1000), dates) : formatInstant(new Date(claims.expires * 1000))}. Ask the firm to send the drawings again.`,
    );
  }
}
