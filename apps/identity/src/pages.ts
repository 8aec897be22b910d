// Server-rendered pages of the local identity provider, in Trabeate's look: the app's own font
// (embedded in the page, nothing loaded from elsewhere), warm paper neutrals, the one petrol
// accent, the wordmark, square-shouldered fields and buttons, a 3 px focus ring.
import { readFileSync } from 'node:fs';

export const esc = (s: string): string =>
  s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);

/** The app's font as data: URLs (the page's policy allows fonts from data: only); system fonts if absent. */
function embeddedFonts(): string {
  try {
    return ([400, 700] as const)
      .map((w) => {
        const file = require.resolve(
          `@fontsource/atkinson-hyperlegible/files/atkinson-hyperlegible-latin-${w}-normal.woff2`,
        );
        const data = readFileSync(file).toString('base64');
        return `@font-face{font-family:"Atkinson Hyperlegible";font-style:normal;font-weight:${w};font-display:swap;src:url(data:font/woff2;base64,${data}) format("woff2")}`;
      })
      .join('');
  } catch {
    return '';
  }
}

// Colours are the app's palette: ink neutral 10, muted neutral 40 (5:1 on white, so field outlines
// pass the 3:1 non-text contrast), paper neutral 96, accent tone 40, focus ring tone 30.
const STYLE = `${embeddedFonts()}
:root{color-scheme:light;--ink:#1e1b17;--muted:#55524e;--paper:#f5f3ef;--card:#fff;--line:#615e59;--soft:#dcd9d3;--accent:#016973;--focus:#014f57;--bad:#8f1d1d}
*{box-sizing:border-box}
body{margin:0;min-height:100vh;display:grid;place-items:center;background:var(--paper);color:var(--ink);
font:16px/1.5 "Atkinson Hyperlegible",system-ui,-apple-system,"Segoe UI",sans-serif}
main{width:100%;max-width:26rem;margin:1.5rem;padding:2rem;background:var(--card);border:1px solid var(--soft);border-top:4px solid var(--accent);border-radius:3px}
.mark{display:flex;align-items:center;gap:.5rem;font-weight:700;font-size:1.1rem;color:var(--ink);margin:0 0 1rem}
.mark svg{width:1.75rem;height:1.75rem;fill:var(--accent)}
h1{font-size:1.35rem;margin:0 0 1rem}p{margin:0 0 1rem;color:var(--muted)}
label{display:block;font-weight:700;margin:0 0 .25rem}
input[type=email],input[type=password]{display:block;width:100%;padding:.6rem .7rem;margin:0 0 1rem;font:inherit;color:inherit;border:1.5px solid var(--line);border-radius:3px;background:#fff}
input:focus-visible,button:focus-visible,a:focus-visible{outline:3px solid var(--focus);outline-offset:2px}
button{font:inherit;font-weight:700;padding:.6rem 1.25rem;border-radius:3px;border:1.5px solid var(--accent);background:var(--accent);color:#fff;cursor:pointer}
button.quiet{background:transparent;color:var(--ink);border-color:var(--line)}
.actions{display:flex;gap:.75rem;align-items:center;flex-wrap:wrap}
.error{color:var(--bad);background:#fbeeee;border-left:4px solid var(--bad);padding:.6rem .75rem}
.note{font-size:.85rem;margin-top:1.25rem}
a{color:var(--accent)}`;

/** The wordmark: a lintel on two posts, as in the app's bar. */
const MARK = `<p class="mark"><svg viewBox="0 0 32 32" aria-hidden="true" focusable="false"><rect x="3" y="6" width="26" height="6"/><rect x="7" y="12" width="5" height="15"/><rect x="20" y="12" width="5" height="15"/></svg>Trabeate</p>`;

export function layout(title: string, body: string): string {
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8"><meta name="viewport" content="width=device-width, initial-scale=1">
<title>${esc(title)} · Trabeate sign-in</title><style>${STYLE}</style></head>
<body><main>${body}</main></body></html>`;
}

export function loginPage(opts: {
  uid: string;
  csrf: string;
  email?: string;
  error?: string;
  clientName: string;
}): string {
  return layout(
    'Sign in',
    `${MARK}<h1>Sign in to ${esc(opts.clientName)}</h1>
${opts.error ? `<p class="error" role="alert" id="form-error">${esc(opts.error)}</p>` : ''}
<form method="post" action="/interaction/${esc(opts.uid)}/login" novalidate${opts.error ? ' aria-describedby="form-error"' : ''}>
<input type="hidden" name="csrf" value="${esc(opts.csrf)}">
<label for="email">E-mail address</label>
<input id="email" name="email" type="email" autocomplete="username" required value="${esc(opts.email ?? '')}"${opts.email ? '' : ' autofocus'}>
<label for="password">Password</label>
<input id="password" name="password" type="password" autocomplete="current-password" required${opts.email ? ' autofocus' : ''}>
<div class="actions"><button type="submit">Sign in</button><a href="/interaction/${esc(opts.uid)}/abort">Cancel</a></div>
</form>
<p class="note">This is the local sign-in service for development. A firm's own identity provider takes its place in production.</p>`,
  );
}

export function messagePage(title: string, message: string): string {
  return layout(title, `${MARK}<h1>${esc(title)}</h1><p>${esc(message)}</p>`);
}

export function logoutPage(form: string): string {
  return layout(
    'Sign out',
    `${MARK}<h1>Sign out of the sign-in service too?</h1>
<p>You have left Trabeate. Signing out here as well means the next person at this computer must enter a password.</p>
${form}
<div class="actions"><button type="submit" form="op.logoutForm" name="logout" value="yes" autofocus>Sign out</button>
<button type="submit" form="op.logoutForm" class="quiet">Stay signed in here</button></div>`,
  );
}
