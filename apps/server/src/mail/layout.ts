import { MAIL_FONTS, MAIL_TYPE, PRINT_COLOURS } from '../look/print-look';

/**
 * The frame around every notice, in the app's look (look/print-look.ts): its typeface where the
 * reader has it (system fonts otherwise; nothing is fetched), the screen's type scale and colours,
 * square buttons, figures that line up. Inline styles and tables only (mail programs drop style
 * sheets) and no images, so nothing is fetched from outside when a message is opened.
 */
export const PETROL = PRINT_COLOURS.accent;
const INK = PRINT_COLOURS.ink;
const MUTED = PRINT_COLOURS.muted;

export const htmlLayout = `<!doctype html>
<html lang="en">
<head>
<meta charset="utf-8">
<meta name="viewport" content="width=device-width, initial-scale=1">
<meta name="color-scheme" content="light">
<title>{{subject}}</title>
</head>
<body style="margin:0;padding:0;background:${PRINT_COLOURS.paper};color:${INK};font-family:${MAIL_FONTS.body};font-size:${MAIL_TYPE.body}px;line-height:1.5;font-variant-numeric:tabular-nums;">
<table role="presentation" width="100%" cellspacing="0" cellpadding="0" style="background:${PRINT_COLOURS.paper};">
<tr><td align="center" style="padding:24px 12px;">
<table role="presentation" width="100%" cellspacing="0" cellpadding="0" style="max-width:600px;background:#ffffff;border:1px solid #dcdad5;">
<tr><td style="padding:18px 28px;border-bottom:3px solid ${PETROL};">
<span style="font-size:${MAIL_TYPE.lead}px;font-weight:700;letter-spacing:0.04em;color:${PETROL};">TRABEATE</span>
<span style="font-size:${MAIL_TYPE.caption}px;color:${MUTED};">&nbsp;&middot;&nbsp;{{firmName}}</span>
</td></tr>
<tr><td style="padding:24px 28px 8px 28px;">
{{{body}}}
</td></tr>
<tr><td style="padding:16px 28px 22px 28px;border-top:1px solid ${PRINT_COLOURS.rule};font-size:${MAIL_TYPE.caption}px;line-height:1.5;color:${MUTED};">
{{> footer}}
</td></tr>
</table>
</td></tr>
</table>
</body>
</html>`;

export const htmlButton = `<table role="presentation" cellspacing="0" cellpadding="0" style="margin:22px 0 18px 0;"><tr>
<td style="background:${PETROL};border-radius:0;"><a href="{{link}}" style="display:inline-block;padding:11px 20px;color:#ffffff;text-decoration:none;font-weight:700;">{{label}}</a></td>
</tr></table>
<p style="font-size:${MAIL_TYPE.caption}px;color:${MUTED};word-break:break-all;">Or copy this address into your browser: {{link}}</p>`;

export const footer = `Sent by Trabeate on behalf of {{firmName}}. You receive this because you take part in their work on Trabeate; the people named above can answer questions about it. This address does not read replies.`;

export const textLayout = `{{{body}}}

--
{{> footer}}
`;
