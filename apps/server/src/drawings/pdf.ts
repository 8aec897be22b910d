import PDFDocument from 'pdfkit';

// The register's own PDF helpers (transmittal sheets and register exports). Fonts ship with the app
// as WOFF from @fontsource (pdfkit cannot read every glyph of WOFF2); nothing is fetched.
const FONT_DIR = '@fontsource/atkinson-hyperlegible/files/';
const fontFile = (name: string) => require.resolve(`${FONT_DIR}${name}`);
// The Latin subset covers Western European names; other scripts would need their own subset.
export const FONTS = {
  regular: fontFile('atkinson-hyperlegible-latin-400-normal.woff'),
  bold: fontFile('atkinson-hyperlegible-latin-700-normal.woff'),
};

export const INK = '#1d2427';
export const MUTED = '#5b6568';
export const RULE = '#c9d0d2';
export const ACCENT = '#0f5c63';

/** A new A4 document with our fonts registered as "body" and "heading". */
export function newDocument(info: { Title: string; Subject?: string }, layout: 'portrait' | 'landscape' = 'portrait') {
  const doc = new PDFDocument({
    size: 'A4',
    layout,
    margin: 42,
    info: { ...info, Author: 'Trabeate' },
    bufferPages: true,
  });
  doc.registerFont('body', FONTS.regular);
  doc.registerFont('heading', FONTS.bold);
  doc.font('body').fillColor(INK);
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
    doc.font('heading').fontSize(8.5).fillColor(MUTED);
    for (const c of columns) {
      doc.text(c.header, x + pad, y, { width: c.width - 2 * pad });
      x += c.width;
    }
    doc.y = y + 14;
    doc
      .moveTo(left, doc.y)
      .lineTo(left + columns.reduce((s, c) => s + c.width, 0), doc.y)
      .strokeColor(ACCENT)
      .lineWidth(0.8)
      .stroke();
    doc.y += 4;
  };
  header();
  doc.font('body').fontSize(9).fillColor(INK);
  for (const row of rows) {
    const height =
      Math.max(...row.map((cell, i) => doc.heightOfString(cell || ' ', { width: columns[i].width - 2 * pad }))) + 6;
    if (doc.y + height > doc.page.height - doc.page.margins.bottom - 30) {
      doc.addPage();
      header();
      doc.font('body').fontSize(9).fillColor(INK);
    }
    const y = doc.y;
    let x = left;
    row.forEach((cell, i) => {
      doc.text(cell, x + pad, y + 3, { width: columns[i].width - 2 * pad });
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
    doc.font('body').fontSize(7.5).fillColor(MUTED);
    doc.text(`${text}   ·   page ${i + 1} of ${range.count}`, doc.page.margins.left, bottom, {
      width: doc.page.width - doc.page.margins.left - doc.page.margins.right,
      lineBreak: false,
    });
  }
}
