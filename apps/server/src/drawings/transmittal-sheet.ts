import { PURPOSE_LABELS, suitabilityMeaning, type Purpose } from '@trabeate/contracts';
import type { FirmDateSettings } from '@trabeate/dates';
import { ACCENT, footers, INK, MUTED, newDocument, printDay, printDayTime, table, toBuffer, TYPE } from './pdf';

export interface SheetData {
  firmName: string;
  /** The firm's locale and time zone: the issue time is written in them. */
  dates: FirmDateSettings;
  projectReference: string;
  projectName: string;
  reference: string;
  purpose: Purpose;
  note: string;
  issuedBy: string;
  issuedAt: Date;
  recipients: Array<{ name: string; email: string }>;
  items: Array<{ number: string; title: string; code: string; suitability: string; purpose: Purpose; date: string }>;
}

/** The transmittal sheet: who got which revisions, when and why. Returned whole (a page or two). */
export async function transmittalSheet(d: SheetData): Promise<Buffer> {
  const doc = await newDocument({ Title: `Transmittal ${d.reference}`, Subject: d.projectName });
  doc.font('heading').fontSize(TYPE.caption).fillColor(ACCENT).text(d.firmName.toUpperCase(), { characterSpacing: 1 });
  doc.moveDown(0.3);
  doc.font('heading').fontSize(TYPE.h1).fillColor(INK).text(`Transmittal ${d.reference}`);
  doc.font('body').fontSize(TYPE.body).fillColor(MUTED).text(`${d.projectReference} · ${d.projectName}`);
  doc.moveDown(0.8);

  const facts: Array<[string, string]> = [
    ['Purpose of issue', PURPOSE_LABELS[d.purpose]],
    ['Issued', `${printDayTime(d.issuedAt, d.dates)} by ${d.issuedBy}`],
    ['Recipients', d.recipients.map((r) => (r.name ? `${r.name} <${r.email}>` : r.email)).join('\n')],
  ];
  for (const [label, value] of facts) {
    const y = doc.y;
    doc.font('heading').fontSize(TYPE.caption).fillColor(MUTED).text(label, doc.page.margins.left, y, { width: 110 });
    doc
      .font('body')
      .fontSize(TYPE.body)
      .fillColor(INK)
      .text(value, doc.page.margins.left + 115, y, { width: 390 });
    doc.moveDown(0.4);
  }
  if (d.note) {
    doc.moveDown(0.3);
    doc.font('body').fontSize(TYPE.body).fillColor(INK).text(d.note, doc.page.margins.left, doc.y, { width: 505 });
  }
  doc.moveDown(1);
  doc.x = doc.page.margins.left;
  table(
    doc,
    [
      { header: 'Number', width: 92, figures: true },
      { header: 'Title', width: 150 },
      { header: 'Rev.', width: 34, figures: true },
      { header: 'Suitability', width: 92 },
      { header: 'Purpose', width: 65 },
      { header: 'Date', width: 78, figures: true },
    ],
    d.items.map((i) => [
      i.number,
      i.title,
      i.code,
      `${i.suitability} ${suitabilityMeaning(i.suitability)}`,
      PURPOSE_LABELS[i.purpose],
      printDay(i.date, d.dates),
    ]),
  );
  doc.moveDown(1.2);
  doc
    .font('body')
    .fontSize(TYPE.caption)
    .fillColor(MUTED)
    .text(
      'Drawings and calculations are preliminary unless marked for construction; the governing code and local regulations apply, and final design and sealing rest with a licensed structural engineer.',
      doc.page.margins.left,
      doc.y,
      { width: 505 },
    );
  footers(doc, `Transmittal ${d.reference}`);
  return toBuffer(doc);
}
