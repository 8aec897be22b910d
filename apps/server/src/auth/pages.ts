import type { Request, Response } from 'express';
import type { ErrorCode } from '../core/errors';

const escape = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);

/**
 * A small server-rendered page for the moments the browser lands on the API itself (sign-in
 * problems). Trabeate's look: warm neutrals, one ochre accent, system fonts, nothing external.
 */
export function page(title: string, message: string, action?: { href: string; label: string }): string {
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${escape(title)} · Trabeate</title>
<style>
:root{color-scheme:light;--ink:#22252a;--muted:#5b6068;--paper:#f5f3ef;--card:#fff;--line:#d9d5cc;--accent:#016973}
body{margin:0;min-height:100vh;display:grid;place-items:center;background:var(--paper);color:var(--ink);
font:16px/1.5 "Atkinson Hyperlegible",system-ui,-apple-system,"Segoe UI",sans-serif}
main{max-width:28rem;margin:1.5rem;padding:2rem;background:var(--card);border:1px solid var(--line);border-top:4px solid var(--accent);border-radius:6px}
.mark{font-weight:700;letter-spacing:.08em;text-transform:uppercase;font-size:.8rem;color:var(--accent);margin:0 0 1rem}
h1{font-size:1.35rem;margin:0 0 .75rem}p{margin:0 0 1rem;color:var(--muted)}
a.button{display:inline-block;padding:.6rem 1.1rem;background:var(--accent);color:#fff;text-decoration:none;border-radius:4px;font-weight:700}
a.button:focus-visible{outline:3px solid var(--ink);outline-offset:2px}
</style></head>
<body><main><p class="mark">Trabeate</p><h1>${escape(title)}</h1><p>${escape(message)}</p>
${action ? `<a class="button" href="${escape(action.href)}">${escape(action.label)}</a>` : ''}
</main></body></html>`;
}

/** Answers a sign-in problem as a page for a browser, or in the API's JSON error shape otherwise. */
export function problem(
  req: Request,
  res: Response,
  status: number,
  code: ErrorCode | 'sign_in_failed' | 'sign_in_expired' | 'sign_in_cancelled' | 'identity_provider_unavailable',
  title: string,
  message: string,
): void {
  res.status(status);
  res.setHeader('Cache-Control', 'no-store');
  if (req.accepts(['html', 'json']) === 'json') {
    res.json({ error: { code, message, requestId: String(req.id ?? '') || undefined } });
    return;
  }
  res.type('html').send(page(title, message, { href: '/api/auth/login', label: 'Sign in again' }));
}
