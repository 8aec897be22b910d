import { ACCENT, INK, MUTED, FONTS, loadPdfKit, printableText } from '../drawings/pdf';
import type { PlanSheet, Primitive, Tone } from './plan-sheet';

// The two renderings of one plan sheet geometry (plan-sheet.ts): SVG for the screen, PDF for the
// register. Neither adds anything to the drawing; they translate primitives one to one.

const COLOURS: Record<Tone, string> = { ink: INK, muted: MUTED, accent: ACCENT, paper: '#ffffff' };
const PT_PER_MM = 72 / 25.4;

const esc = (s: string) =>
  s.replace(/[&<>"']/g, (c) => ({ '&': '&amp;', '<': '&lt;', '>': '&gt;', '"': '&quot;', "'": '&#39;' })[c]!);

function svgOf(p: Primitive): string {
  switch (p.kind) {
    case 'line':
      return `<line x1="${p.x1}" y1="${p.y1}" x2="${p.x2}" y2="${p.y2}" stroke="${COLOURS[p.tone]}" stroke-width="${p.width}"${p.dash ? ` stroke-dasharray="${p.dash.join(' ')}"` : ''}/>`;
    case 'poly': {
      const tag = p.closed ? 'polygon' : 'polyline';
      return `<${tag} points="${p.points.map(([x, y]) => `${x},${y}`).join(' ')}" fill="${p.fill ? COLOURS[p.fill] : 'none'}" stroke="${p.width > 0 ? COLOURS[p.tone] : 'none'}" stroke-width="${p.width}"${p.dash ? ` stroke-dasharray="${p.dash.join(' ')}"` : ''}/>`;
    }
    case 'circle':
      return `<circle cx="${p.cx}" cy="${p.cy}" r="${p.r}" fill="${p.fill ? COLOURS[p.fill] : '#ffffff'}" stroke="${COLOURS[p.tone]}" stroke-width="${p.width}"/>`;
    case 'text': {
      const anchor = p.anchor === 'start' ? '' : ` text-anchor="${p.anchor}"`;
      const rot = p.rotate ? ` transform="rotate(${-p.rotate} ${p.x} ${p.y})"` : '';
      return `<text x="${p.x}" y="${p.y}" font-size="${p.size}"${p.bold ? ' font-weight="700"' : ''} fill="${COLOURS[p.tone]}"${anchor}${rot}>${esc(p.text)}</text>`;
    }
  }
}

/** The sheet as a standalone SVG document in millimetres (the screen scales it to fit). */
export function sheetSvg(sheet: PlanSheet, title: string): string {
  return [
    `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${sheet.widthMm} ${sheet.heightMm}" width="${sheet.widthMm}mm" height="${sheet.heightMm}mm" font-family="'Atkinson Hyperlegible', sans-serif" role="img" aria-label="${esc(title)}">`,
    `<title>${esc(title)}</title>`,
    `<rect width="${sheet.widthMm}" height="${sheet.heightMm}" fill="#ffffff"/>`,
    ...sheet.primitives.map(svgOf),
    '</svg>',
  ].join('\n');
}

/** The sheet as a one-page PDF at true scale, with the fonts the other PDFs ship. */
export async function sheetPdf(sheet: PlanSheet, info: { Title: string; Subject: string }): Promise<Buffer> {
  const PDFDocument = await loadPdfKit();
  const doc = new PDFDocument({
    size: [sheet.widthMm * PT_PER_MM, sheet.heightMm * PT_PER_MM],
    margin: 0,
    info: { ...info, Author: 'Trabeate' },
  });
  doc.registerFont('body', FONTS.regular);
  doc.registerFont('heading', FONTS.bold);
  printableText(doc);
  const u = (v: number) => v * PT_PER_MM;
  // pdfkit 0.20 takes a whole pattern as an array; its published types know only one length
  const dashPattern = doc.dash.bind(doc) as unknown as (pattern: number[], options: object) => unknown;
  for (const p of sheet.primitives) {
    doc.save();
    if (p.kind === 'text') {
      doc
        .font(p.bold ? 'heading' : 'body')
        .fontSize(u(p.size))
        .fillColor(COLOURS[p.tone]);
      const width = doc.widthOfString(p.text);
      const dx = p.anchor === 'middle' ? -width / 2 : p.anchor === 'end' ? -width : 0;
      // SVG places text on its baseline; pdfkit at the top of the line box: lift by the ascender.
      const ascent = doc.currentLineHeight(false) * 0.8;
      if (p.rotate) doc.rotate(-p.rotate, { origin: [u(p.x), u(p.y)] });
      doc.text(p.text, u(p.x) + dx, u(p.y) - ascent, { lineBreak: false });
    } else {
      doc.lineWidth(u(p.width));
      // the whole pattern (a property line is dash-dot), as the SVG's stroke-dasharray has it; every
      // primitive sits in its own save/restore, and a solid one undashes, so no dash outlives its stroke
      if ('dash' in p && p.dash) dashPattern(p.dash.map(u), {});
      else doc.undash();
      if (p.kind === 'line') doc.moveTo(u(p.x1), u(p.y1)).lineTo(u(p.x2), u(p.y2)).stroke(COLOURS[p.tone]);
      else if (p.kind === 'circle') {
        doc.circle(u(p.cx), u(p.cy), u(p.r));
        doc.fillAndStroke(p.fill ? COLOURS[p.fill] : '#ffffff', COLOURS[p.tone]);
      } else {
        const [first, ...rest] = p.points;
        doc.moveTo(u(first[0]), u(first[1]));
        for (const [x, y] of rest) doc.lineTo(u(x), u(y));
        if (p.closed) doc.closePath();
        if (p.fill && p.width > 0) doc.fillAndStroke(COLOURS[p.fill], COLOURS[p.tone]);
        else if (p.fill) doc.fill(COLOURS[p.fill]);
        else doc.stroke(COLOURS[p.tone]);
      }
    }
    doc.restore();
  }
  return new Promise((resolve, reject) => {
    const chunks: Buffer[] = [];
    doc.on('data', (c: Buffer) => chunks.push(c));
    doc.on('end', () => resolve(Buffer.concat(chunks)));
    doc.on('error', reject);
    doc.end();
  });
}
