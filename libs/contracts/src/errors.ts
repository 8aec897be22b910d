import { z } from 'zod';

/** The error codes an API answer may carry; the client may switch on them. */
export const errorCodeSchema = z.enum([
  'bad_request',
  'validation_failed',
  'malformed_json',
  'unauthenticated',
  'session_expired',
  'no_access',
  'csrf_failed',
  'forbidden',
  'not_found',
  'conflict',
  'payload_too_large',
  'unsupported_media_type',
  'too_many_requests',
  'service_unavailable',
  'internal',
]);
export type ErrorCode = z.infer<typeof errorCodeSchema>;

/** Every refusal and failure the API answers with, whatever the status. */
export const apiErrorSchema = z.object({
  error: z.object({
    code: errorCodeSchema,
    message: z.string(),
    /** Per-field messages, keyed like "body.email", for a 400 or 409 about a form. */
    fields: z.record(z.string(), z.array(z.string())).optional(),
    requestId: z.string().optional(),
  }),
});
export type ApiError = z.infer<typeof apiErrorSchema>;
