import { PRINT_COLOURS, PRINT_FONTS, PRINT_TYPE, printable, printDay, printDayTime } from '../look/print-look';

// The PDF helpers shared by transmittal sheets, register exports, invoices and reports. The look
// (fonts, colours, type scale, dates) lives in look/print-look.ts and is re-exported here, so
// these names keep working for every sheet built on them.
export { PRINT_COLOURS, PRINT_FONTS, PRINT_TYPE, printDay, printDayTime };
// The Latin subset covers Western European names; other scripts would need their own subset.
export const FONTS = PRINT_FONTS;

export const INK = PRINT_COLOURS.ink;
export const MUTED = PRINT_COLOURS.muted;
export const RULE = PRINT_COLOURS.rule;
export const ACCENT = PRINT_COLOURS.accent;
export const TYPE = PRINT_TYPE;

/**
 * pdfkit, loaded the first time a PDF is made rather than when the API starts: with its font
 * engine it is about 9 MB of a process's resident memory (measured with `node --expose-gc`, RSS
 * and heap after a full collection), and most API processes serve requests that make no PDF.
 */
export async function loadPdfKit(): Promise<typeof import('pdfkit')> {
  return (await import('pdfkit')).default;
}

/** A new A4 document with our fonts registered as "body", "heading" and "figures" (fixed-width digits). */
export async function newDocument(
  info: { Title: string; Subject?: string },
  layout: 'portrait' | 'landscape' = 'portrait',
): Promise<PDFKit.PDFDocument> {
  const PDFDocument = await loadPdfKit();
  const doc = new PDFDocument({
    size: 'A4',
    layout,
    margin: 42,
    info: { ...info, Author: 'Trabeate' },
    bufferPages: true,
  });
  doc.registerFont('body', FONTS.regular);
  doc.registerFont('heading', FONTS.bold);
  doc.registerFont('figures', FONTS.figures);
  doc.font('body').fillColor(INK);
  return printableText(doc);
}

/**
 * Makes every string the document writes or measures printable in the shipped Latin faces
 * (Greek letters and maths signs spelled out), whoever wrote it: the engine's texts, our own
 * notes, a name someone typed. Measuring goes through the same spelling, so tables size their
 * rows for what is drawn.
 */
export function printableText(doc: PDFKit.PDFDocument): PDFKit.PDFDocument {
  type Call = (...args: unknown[]) => unknown;
  const spell = <F>(f: F): F => {
    const call = f as unknown as Call;
    const spelled: Call = (first, ...rest) =>
      call.call(doc, typeof first === 'string' ? printable(first) : first, ...rest);
    return spelled as unknown as F;
  };
  doc.text = spell(doc.text);
  doc.widthOfString = spell(doc.widthOfString);
  doc.heightOfString = spell(doc.heightOfString);
  return doc;
}

/** Collects a document into one Buffer (sheets and exports are a few pages, not large files). */
export function toBuffer(doc: PDFKit.PDFDocument): Promise<Buffer> {
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.end();
  });
}

export interface Column {
  header: string;
  width: number;
  /** Amounts, counts and codes: the figures face, so the digits line up down the column. */
  figures?: boolean;
  align?: 'left' | 'right';
}

/**
 * Draws a simple ruled table from the current position, starting a new page (with the header
 * repeated) when a row would not fit.
 */
export function table(doc: PDFKit.PDFDocument, columns: Column[], rows: string[][]): void {
  const left = doc.page.margins.left;
  const pad = 4;
  const header = () => {
    let x = left;
    const y = doc.y;
    doc.font('heading').fontSize(TYPE.caption).fillColor(MUTED);
    for (const c of columns) {
      doc.text(c.header, x + pad, y, { width: c.width - 2 * pad, align: c.align ?? 'left' });
      x += c.width;
    }
    doc.y = y + 14;
    doc
      .moveTo(left, doc.y)
      .lineTo(left + columns.reduce((s, c) => s + c.width, 0), doc.y)
      .strokeColor(INK)
      .lineWidth(1.2)
      .stroke();
    doc.y += 4;
  };
  // The dense table of the screens: a heavy rule under the head, hairlines between rows.
  const cellFont = (i: number) => doc.font(columns[i].figures ? 'figures' : 'body').fontSize(TYPE.body - 1);
  header();
  doc.fillColor(INK);
  for (const row of rows) {
    const height =
      Math.max(
        ...row.map((cell, i) => cellFont(i).heightOfString(cell || ' ', { width: columns[i].width - 2 * pad })),
      ) + 6;
    if (doc.y + height > doc.page.height - doc.page.margins.bottom - 30) {
      doc.addPage();
      header();
      doc.fillColor(INK);
    }
    const y = doc.y;
    let x = left;
    row.forEach((cell, i) => {
      cellFont(i).text(cell, x + pad, y + 3, { width: columns[i].width - 2 * pad, align: columns[i].align ?? 'left' });
      x += columns[i].width;
    });
    doc.y = y + height;
    doc.moveTo(left, doc.y).lineTo(x, doc.y).strokeColor(RULE).lineWidth(0.4).stroke();
  }
  doc.x = left;
}

/** Page numbers and a footer line on every buffered page. */
export function footers(doc: PDFKit.PDFDocument, text: string): void {
  const range = doc.bufferedPageRange();
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    const bottom = doc.page.height - doc.page.margins.bottom + 12;
    doc
      .font('body')
      .fontSize(TYPE.caption - 0.5)
      .fillColor(MUTED);
    doc.text(`${text}   ·   page ${i + 1} of ${range.count}`, doc.page.margins.left, bottom, {
      width: doc.page.width - doc.page.margins.left - doc.page.margins.right,
      lineBreak: false,
    });
  }
}
