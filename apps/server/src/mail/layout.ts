/**
 * The frame around every notice. Inline styles and tables only (mail programs drop style sheets),
 * system fonts and no images, so nothing is fetched from outside when a message is opened.
 * Palette: warm neutral page, white card, ink text, one petrol accent.
 */
export const PETROL = '#016973';

export const htmlLayout = `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="color-scheme" content="light">
<title>{{subject}}</title>
</head>
<body style="margin:0;padding:0;background:#f2f1ee;color:#1d2628;font-family:-apple-system,'Segoe UI',Roboto,'Helvetica Neue',Arial,sans-serif;font-size:15px;line-height:1.55;">
<table role="presentation" width="100%" cellspacing="0" cellpadding="0" style="background:#f2f1ee;">
<tr><td align="center" style="padding:24px 12px;">
<table role="presentation" width="100%" cellspacing="0" cellpadding="0" style="max-width:600px;background:#ffffff;border:1px solid #dcdad5;">
<tr><td style="padding:18px 28px;border-bottom:3px solid ${PETROL};">
<span style="font-size:17px;font-weight:700;letter-spacing:0.04em;color:${PETROL};">TRABEATE</span>
<span style="font-size:13px;color:#5f6a6c;">&nbsp;&middot;&nbsp;{{firmName}}</span>
</td></tr>
<tr><td style="padding:24px 28px 8px 28px;">
{{{body}}}
</td></tr>
<tr><td style="padding:16px 28px 22px 28px;border-top:1px solid #e6e4df;font-size:12px;line-height:1.5;color:#5f6a6c;">
{{> footer}}
</td></tr>
</table>
</td></tr>
</table>
</body>
</html>`;

export const htmlButton = `<table role="presentation" cellspacing="0" cellpadding="0" style="margin:22px 0 18px 0;"><tr>
<td style="background:${PETROL};border-radius:3px;"><a href="{{link}}" style="display:inline-block;padding:11px 20px;color:#ffffff;text-decoration:none;font-weight:600;">{{label}}</a></td>
</tr></table>
<p style="font-size:12px;color:#5f6a6c;word-break:break-all;">Or copy this address into your browser: {{link}}</p>`;

export const footer = `Sent by Trabeate on behalf of {{firmName}}. You receive this because you take part in their work on Trabeate; the people named above can answer questions about it. This address does not read replies.`;

export const textLayout = `{{{body}}}

--
{{> footer}}
`;
