// Server-rendered pages of the local identity provider, in Trabeate's look: warm neutrals, one
// ochre accent, system fonts (nothing loaded from elsewhere), labelled fields, visible focus.

export const esc = (s: string): string =>
  s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c] as string);

const STYLE = `
:root{color-scheme:light;--ink:#22252a;--muted:#5b6068;--paper:#f5f3ef;--card:#fff;--line:#cfcac0;--accent:#016973;--bad:#8f1d1d}
*{box-sizing:border-box}
body{margin:0;min-height:100vh;display:grid;place-items:center;background:var(--paper);color:var(--ink);
font:16px/1.5 "Atkinson Hyperlegible",system-ui,-apple-system,"Segoe UI",sans-serif}
main{width:100%;max-width:26rem;margin:1.5rem;padding:2rem;background:var(--card);border:1px solid var(--line);border-top:4px solid var(--accent);border-radius:6px}
.mark{font-weight:700;letter-spacing:.08em;text-transform:uppercase;font-size:.8rem;color:var(--accent);margin:0 0 .25rem}
h1{font-size:1.35rem;margin:0 0 1rem}p{margin:0 0 1rem;color:var(--muted)}
label{display:block;font-weight:700;margin:0 0 .25rem}
input[type=email],input[type=password]{display:block;width:100%;padding:.6rem .7rem;margin:0 0 1rem;font:inherit;color:inherit;border:1px solid var(--line);border-radius:4px;background:#fff}
input:focus-visible,button:focus-visible,a:focus-visible{outline:3px solid var(--accent);outline-offset:2px}
button{font:inherit;font-weight:700;padding:.6rem 1.1rem;border-radius:4px;border:1px solid var(--accent);background:var(--accent);color:#fff;cursor:pointer}
button.quiet{background:transparent;color:var(--ink);border-color:var(--line)}
.actions{display:flex;gap:.75rem;align-items:center;flex-wrap:wrap}
.error{color:var(--bad);background:#fbeeee;border:1px solid #e5c4c4;border-radius:4px;padding:.6rem .75rem}
.note{font-size:.85rem;margin-top:1.25rem}
a{color:var(--accent)}`;

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
    `<p class="mark">Trabeate</p><h1>Sign in to ${esc(opts.clientName)}</h1>
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
  return layout(title, `<p class="mark">Trabeate</p><h1>${esc(title)}</h1><p>${esc(message)}</p>`);
}

export function logoutPage(form: string): string {
  return layout(
    'Sign out',
    `<p class="mark">Trabeate</p><h1>Sign out of the sign-in service too?</h1>
<p>You have left Trabeate. Signing out here as well means the next person at this computer must enter a password.</p>
${form}
<div class="actions"><button type="submit" form="op.logoutForm" name="logout" value="yes" autofocus>Sign out</button>
<button type="submit" form="op.logoutForm" class="quiet">Stay signed in here</button></div>`,
  );
}
