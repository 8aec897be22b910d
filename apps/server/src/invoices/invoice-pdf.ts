import { readFileSync } from 'node:fs';
import { STAGE_TITLES, type StageKey } from '@trabeate/contracts';
import type { FirmDateSettings } from '@trabeate/dates';
import { loadPdfKit } from '../drawings/pdf';
import { PRINT_COLOURS, PRINT_FONTS, PRINT_TYPE as TYPE, printDay } from '../look/print-look';
import { formatMoney } from './money';

// The invoice sheet, in the app's look (look/print-look.ts): its typeface from shipped WOFF files
// (pdfkit cannot read WOFF2; nothing from the network), amounts in the fixed-width figures face so
// they line up, the screen's type scale and accent, dates as on screen. The stored PDF names no
// payment state: it is made once at issue, and the state moves on (the Fees page shows it).
let fonts: { regular: Buffer; bold: Buffer; figures: Buffer } | undefined;
function loadFonts() {
  fonts ??= {
    regular: readFileSync(PRINT_FONTS.regular),
    bold: readFileSync(PRINT_FONTS.bold),
    figures: readFileSync(PRINT_FONTS.figures),
  };
  return fonts;
}

export interface InvoiceSheet {
  kind: 'invoice' | 'credit_note';
  number: string;
  issuedOn: string;
  dueOn: string;
  currency: string;
  firm: { name: string };
  /** The firm's locale: the sheet's dates are written in it. */
  dates: FirmDateSettings;
  client: { name: string; address: string | null; contactName: string };
  project: { reference: string; name: string };
  creditsNumber?: string | null;
  reason?: string | null;
  lines: Array<{
    description: string;
    stageKey: StageKey | null;
    netMinor: number;
    taxRateBp: number;
    taxMinor: number;
  }>;
  taxLabel: string;
  subtotalMinor: number;
  taxMinor: number;
  totalMinor: number;
  paymentReference: string;
}

/** A calendar day in invoices, their mails and the activity log: as on screen, "2 Dec 2026" (libs/dates), in the firm's locale. */
export function longDate(iso: string, dates: FirmDateSettings): string {
  return printDay(iso, dates);
}

export async function renderInvoicePdf(s: InvoiceSheet): Promise<Buffer> {
  const f = loadFonts();
  const PDFDocument = await loadPdfKit();
  const doc = new PDFDocument({
    size: 'A4',
    margin: 56,
    info: { Title: `${s.number} ${s.firm.name}`, Author: s.firm.name },
  });
  doc.registerFont('body', f.regular);
  doc.registerFont('bold', f.bold);
  doc.registerFont('figures', f.figures);
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const money = (m: number) => formatMoney(m, s.currency);
  const accent = PRINT_COLOURS.accent;
  const ink = PRINT_COLOURS.ink;
  const muted = PRINT_COLOURS.muted;
  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;

  doc.font('bold').fontSize(TYPE.h2).fillColor(accent).text(s.firm.name, left, 56);
  doc.font('body').fontSize(TYPE.body).fillColor(muted).text('Structural engineering');
  doc
    .moveTo(left, doc.y + 6)
    .lineTo(left + width, doc.y + 6)
    .strokeColor(accent)
    .lineWidth(2)
    .stroke();
  doc.moveDown(1.5);
  doc
    .font('bold')
    .fontSize(TYPE.h1)
    .fillColor(ink)
    .text(s.kind === 'invoice' ? `Invoice ${s.number}` : `Credit note ${s.number}`, left);
  doc.fillColor(ink);
  if (s.creditsNumber) doc.font('body').fontSize(TYPE.body).text(`Corrects invoice ${s.creditsNumber}`);
  if (s.reason) doc.font('body').fontSize(TYPE.body).text(`Reason: ${s.reason}`);
  doc.moveDown(0.5);
  doc.font('body').fontSize(TYPE.body);
  doc.text(`Issued: ${longDate(s.issuedOn, s.dates)}`);
  if (s.kind === 'invoice') doc.text(`Due: ${longDate(s.dueOn, s.dates)}`);
  doc.moveDown();
  doc.font('bold').text('Billed to');
  doc.font('body').text(s.client.name);
  if (s.client.address) doc.text(s.client.address);
  doc.text(`Attention: ${s.client.contactName}`);
  doc.moveDown();
  doc.font('bold').text('Project');
  doc.font('body').text(`${s.project.reference}  ${s.project.name}`);
  doc.moveDown();

  const cols = { desc: left, net: left + width * 0.55, tax: left + width * 0.7, total: left + width * 0.85 };
  const colW = width * 0.15;
  // The dense table of the screens: a heavy rule under the head, hairlines between lines, and
  // amounts right-aligned in the figures face.
  const row = (y: number, cells: [string, string, string, string], font: 'body' | 'bold') => {
    doc.font(font).fontSize(TYPE.body);
    doc.text(cells[0], cols.desc, y, { width: width * 0.53 });
    const h = doc.y;
    if (font === 'body') doc.font('figures').fontSize(TYPE.body - 1);
    doc.text(cells[1], cols.net, y, { width: colW, align: 'right' });
    doc.text(cells[2], cols.tax, y, { width: colW, align: 'right' });
    doc.text(cells[3], cols.total, y, { width: colW, align: 'right' });
    return Math.max(h, doc.y) + 4;
  };
  let y = row(doc.y, ['Description', 'Net', s.taxLabel, 'Amount'], 'bold');
  doc
    .moveTo(left, y - 2)
    .lineTo(left + width, y - 2)
    .strokeColor(ink)
    .lineWidth(1.2)
    .stroke();
  for (const l of s.lines) {
    const what =
      l.stageKey && !l.description.includes(STAGE_TITLES[l.stageKey])
        ? `${STAGE_TITLES[l.stageKey]}: ${l.description}`
        : l.description;
    y = row(
      y + 2,
      [
        `${what} (${s.taxLabel} ${(l.taxRateBp / 100).toFixed(2)} %)`,
        money(l.netMinor),
        money(l.taxMinor),
        money(l.netMinor + l.taxMinor),
      ],
      'body',
    );
    doc
      .moveTo(left, y - 2)
      .lineTo(left + width, y - 2)
      .strokeColor(PRINT_COLOURS.rule)
      .lineWidth(0.4)
      .stroke();
  }
  doc
    .moveTo(left, y)
    .lineTo(left + width, y)
    .strokeColor(ink)
    .lineWidth(1.2)
    .stroke();
  y += 6;
  for (const [label, value, font] of [
    ['Subtotal', s.subtotalMinor, 'body'],
    [s.taxLabel, s.taxMinor, 'body'],
    [s.kind === 'invoice' ? 'Total due' : 'Total credited', s.totalMinor, 'bold'],
  ] as const) {
    doc.font(font).fontSize(TYPE.lead);
    doc.text(label, cols.tax - colW, y, { width: colW * 2 - 4, align: 'right' });
    doc.font(font === 'bold' ? 'bold' : 'figures').fontSize(font === 'bold' ? TYPE.lead : TYPE.body);
    doc.text(money(value), cols.total, y, { width: colW, align: 'right' });
    y = doc.y + 4;
  }
  doc.moveDown(2);
  doc.x = left;
  if (s.kind === 'invoice') {
    doc.font('bold').fontSize(TYPE.body).text('How to pay', left);
    doc
      .font('body')
      .text(
        `Pay online from the Fees page in Trabeate, or by bank transfer quoting ${s.paymentReference} by ${longDate(s.dueOn, s.dates)}.`,
        left,
        doc.y,
        { width },
      );
  }
  doc.end();
  return done;
}
