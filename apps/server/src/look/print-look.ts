import { formatDay, formatDayTime, zoneLabel, type FirmDateSettings } from '@trabeate/dates';

// Trabeate's look on paper and in mail, taken from the screens (apps/client/src/styles.scss and
// styles/_palette.scss) so an invoice, a transmittal sheet and a notice read as the same product:
// the same accent and ink, the same typeface, numbers in a fixed-width figures face so columns of
// amounts line up, the same 1.2-step type scale, and dates written by libs/dates.

const fontFile = (name: string) => require.resolve(`@fontsource/${name}`);

/** Shipped WOFF files (pdfkit cannot read every glyph of WOFF2); nothing is fetched. Latin subset. */
export const PRINT_FONTS = {
  regular: fontFile('atkinson-hyperlegible/files/atkinson-hyperlegible-latin-400-normal.woff'),
  bold: fontFile('atkinson-hyperlegible/files/atkinson-hyperlegible-latin-700-normal.woff'),
  /** Every digit the same width: amounts, dates and references line up in a column. */
  figures: fontFile('jetbrains-mono/files/jetbrains-mono-latin-400-normal.woff'),
};

/** Colours: the app's primary tone 40 as the accent, its neutral tones for ink, notes and rules. */
export const PRINT_COLOURS = {
  accent: '#016973',
  ink: '#1d2427',
  muted: '#496367',
  rule: '#c9d0d2',
  paper: '#f2f1ee',
};

/**
 * The type scale in points for paper: the screen's 13 / 16 / 18 / 22 / 28 px steps from a 16 px
 * body, scaled to a 10 pt body.
 */
export const PRINT_TYPE = { caption: 8, body: 10, lead: 11.25, h2: 13.75, h1: 17.5 } as const;

/** The same scale in px for mail (mail programs read px), on the screen's 16 px body. */
export const MAIL_TYPE = { caption: 13, body: 16, lead: 18, h2: 22 } as const;

/** The screen's font stacks, for mail: our typeface where the reader has it, system fonts else. */
export const MAIL_FONTS = {
  body: "'Atkinson Hyperlegible',-apple-system,'Segoe UI',Roboto,Arial,sans-serif",
  figures: "'JetBrains Mono',ui-monospace,'Cascadia Mono',Menlo,Consolas,monospace",
};

/**
 * A day on paper and in mail, as on screen, in the firm's locale: "20 Dec 2026". A calendar day
 * (YYYY-MM-DD) stays that day; an instant is the day it was in the firm's time zone.
 */
export const printDay = (value: string | Date, firm: FirmDateSettings): string =>
  formatDay(value, { locale: firm.dateLocale, timeZone: firm.timeZone });

/**
 * An instant on paper and in mail, in the firm's locale and time zone, with the zone named (a
 * sheet travels to readers elsewhere): "20 Dec 2026, 14:05 GMT", "1 Dec 2026, 14:35 GMT+5:30".
 */
export const printDayTime = (value: Date | string, firm: FirmDateSettings): string => {
  const opts = { locale: firm.dateLocale, timeZone: firm.timeZone };
  const text = formatDayTime(value, opts);
  return text && `${text} ${zoneLabel(new Date(value), opts)}`;
};

/**
 * The shipped faces carry the Latin subset only, so Greek letters and mathematical signs from the
 * engine's texts (ψ0, εc2, αcc, ≤; the minus sign is there) would print as empty boxes: on paper they are spelled out.
 */
const SPELLED: Readonly<Record<string, string>> = {
  α: 'alpha',
  β: 'beta',
  γ: 'gamma',
  δ: 'delta',
  ε: 'eps',
  ζ: 'zeta',
  η: 'eta',
  θ: 'theta',
  κ: 'kappa',
  λ: 'lambda',
  μ: 'mu',
  ν: 'nu',
  ξ: 'xi',
  π: 'pi',
  ρ: 'rho',
  σ: 'sigma',
  τ: 'tau',
  φ: 'phi',
  ϕ: 'phi',
  χ: 'chi',
  ψ: 'psi',
  ω: 'omega',
  Γ: 'Gamma',
  Δ: 'Delta',
  Θ: 'Theta',
  Λ: 'Lambda',
  Σ: 'Sigma',
  Φ: 'Phi',
  Ψ: 'Psi',
  Ω: 'Omega',
  '≤': '<=',
  '≥': '>=',
  '≈': '~',
  '≠': '!=',
  '√': 'sqrt',
  '∞': 'inf',

  '→': '->',
};
const OUTSIDE_LATIN = /[\u0370-\u03ff\u2190-\u21ff\u2200-\u2211\u2213-\u22ff]/gu;

/** Text as the shipped print faces can draw it. */
export const printable = (text: string): string => text.replace(OUTSIDE_LATIN, (c) => SPELLED[c] ?? '?');
