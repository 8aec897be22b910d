import { createRequire } from 'node:module';
import { readFileSync } from 'node:fs';
import PDFDocument from 'pdfkit';
import { STAGE_TITLES, type StageKey } from '@trabeate/contracts';
import { formatMoney } from './money';

// The invoice sheet. Fonts are the shipped WOFF files of the app's own typeface (pdfkit cannot
// read WOFF2), so the PDF looks the same on every machine and needs nothing from the network.
const require_ = createRequire(__filename);
let fonts: { regular: Buffer; bold: Buffer } | undefined;
function loadFonts() {
  if (!fonts) {
    const dir = (weight: number) =>
      require_.resolve(`@fontsource/atkinson-hyperlegible/files/atkinson-hyperlegible-latin-${weight}-normal.woff`);
    fonts = { regular: readFileSync(dir(400)), bold: readFileSync(dir(700)) };
  }
  return fonts;
}

export interface InvoiceSheet {
  kind: 'invoice' | 'credit_note';
  number: string;
  issuedOn: string;
  dueOn: string;
  currency: string;
  firm: { name: string };
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

/** One date format everywhere: 2 December 2026. */
export function longDate(iso: string): string {
  return new Intl.DateTimeFormat('en-GB', { day: 'numeric', month: 'long', year: 'numeric', timeZone: 'UTC' }).format(
    new Date(`${iso}T00:00:00Z`),
  );
}

export async function renderInvoicePdf(s: InvoiceSheet): Promise<Buffer> {
  const f = loadFonts();
  const doc = new PDFDocument({
    size: 'A4',
    margin: 56,
    info: { Title: `${s.number} ${s.firm.name}`, Author: s.firm.name },
  });
  doc.registerFont('body', f.regular);
  doc.registerFont('bold', f.bold);
  const chunks: Buffer[] = [];
  doc.on('data', (c: Buffer) => chunks.push(c));
  const done = new Promise<Buffer>((resolve, reject) => {
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
  });
  const money = (m: number) => formatMoney(m, s.currency);
  const accent = '#016973';
  const left = doc.page.margins.left;
  const width = doc.page.width - left - doc.page.margins.right;

  doc.font('bold').fontSize(18).fillColor(accent).text(s.firm.name, left, 56);
  doc.font('body').fontSize(10).fillColor('#333').text('Structural engineering');
  doc.moveDown(1.5);
  doc
    .font('bold')
    .fontSize(16)
    .fillColor('#111')
    .text(s.kind === 'invoice' ? `Invoice ${s.number}` : `Credit note ${s.number}`);
  if (s.creditsNumber) doc.font('body').fontSize(10).text(`Corrects invoice ${s.creditsNumber}`);
  if (s.reason) doc.font('body').fontSize(10).text(`Reason: ${s.reason}`);
  doc.moveDown(0.5);
  doc.font('body').fontSize(10);
  doc.text(`Issued: ${longDate(s.issuedOn)}`);
  if (s.kind === 'invoice') doc.text(`Due: ${longDate(s.dueOn)}`);
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
  const row = (y: number, cells: [string, string, string, string], font: 'body' | 'bold') => {
    doc.font(font).fontSize(10);
    doc.text(cells[0], cols.desc, y, { width: width * 0.53 });
    const h = doc.y;
    doc.text(cells[1], cols.net, y, { width: colW, align: 'right' });
    doc.text(cells[2], cols.tax, y, { width: colW, align: 'right' });
    doc.text(cells[3], cols.total, y, { width: colW, align: 'right' });
    return Math.max(h, doc.y) + 4;
  };
  let y = row(doc.y, ['Description', 'Net', s.taxLabel, 'Amount'], 'bold');
  doc
    .moveTo(left, y - 2)
    .lineTo(left + width, y - 2)
    .strokeColor('#999')
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
  }
  doc
    .moveTo(left, y)
    .lineTo(left + width, y)
    .strokeColor('#999')
    .stroke();
  y += 6;
  for (const [label, value, font] of [
    ['Subtotal', s.subtotalMinor, 'body'],
    [s.taxLabel, s.taxMinor, 'body'],
    [s.kind === 'invoice' ? 'Total due' : 'Total credited', s.totalMinor, 'bold'],
  ] as const) {
    doc.font(font).fontSize(11);
    doc.text(label, cols.tax - colW, y, { width: colW * 2 - 4, align: 'right' });
    doc.text(money(value), cols.total, y, { width: colW, align: 'right' });
    y = doc.y + 4;
  }
  doc.moveDown(2);
  doc.x = left;
  if (s.kind === 'invoice') {
    doc.font('bold').fontSize(10).text('How to pay', left);
    doc
      .font('body')
      .text(
        `Pay online from the Fees page in Trabeate, or by bank transfer quoting ${s.paymentReference} by ${longDate(s.dueOn)}.`,
        left,
        doc.y,
        { width },
      );
  }
  doc.end();
  return done;
}
