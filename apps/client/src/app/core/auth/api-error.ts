import { HttpErrorResponse } from '@angular/common/http';

/** The server's one error shape: `{ error: { code, message, fields? } }`. */
export interface ApiErrorBody {
  readonly code: string;
  readonly message: string;
  /** Keys as the server names them, e.g. `body.email`. */
  readonly fields?: Readonly<Record<string, readonly string[]>>;
}

/** The server's error, or null when the answer was not ours (a proxy page, a dropped connection). */
export function apiError(err: unknown): ApiErrorBody | null {
  if (!(err instanceof HttpErrorResponse)) return null;
  const body = err.error as { error?: Partial<ApiErrorBody> } | null;
  const e = body && typeof body === 'object' ? body.error : undefined;
  if (!e || typeof e.message !== 'string') return null;
  return { code: String(e.code ?? ''), message: e.message, fields: e.fields };
}

/** A sentence for the user: the server's own message, else a fallback that says what happened. */
export function errorMessage(
  err: unknown,
  fallback = 'The server could not be reached. Check the connection and try again.',
): string {
  return apiError(err)?.message ?? fallback;
}

/** Field errors keyed by form control name (`body.email` → `email`). */
export function fieldErrors(err: unknown): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [key, messages] of Object.entries(apiError(err)?.fields ?? {})) {
    const name = key.replace(/^body\./, '').split('.')[0];
    if (messages.length && !(name in out)) out[name] = messages[0];
  }
  return out;
}

/** Field errors keyed by their path inside the body (`body.designBasis.concreteMPa` → `designBasis.concreteMPa`). */
export function fieldErrorsByPath(err: unknown): Record<string, string> {
  const out: Record<string, string> = {};
  for (const [key, messages] of Object.entries(apiError(err)?.fields ?? {})) {
    const path = key.replace(/^body\./, '');
    if (messages.length && !(path in out)) out[path] = messages[0];
  }
  return out;
}
