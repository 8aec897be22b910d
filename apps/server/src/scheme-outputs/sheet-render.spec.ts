import { inflateSync } from 'node:zlib';
import type { PlanSheet, Primitive } from './plan-sheet';
import { sheetPdf } from './sheet-render';

const PT_PER_MM = 72 / 25.4;

/** The page content operators of a pdfkit PDF (its streams are deflated). */
function contentOf(pdf: Buffer): string {
  const raw = pdf.toString('latin1');
  const out: string[] = [];
  for (const m of raw.matchAll(/stream\r?\n([\s\S]*?)\r?\nendstream/g)) {
    try {
      const text = inflateSync(Buffer.from(m[1], 'latin1')).toString('latin1');
      // the page's drawing stream, not an embedded font
      if (/^(q|Q)$/m.test(text)) out.push(text);
    } catch {
      // not deflated: fonts' own streams, metadata
    }
  }
  return out.join('\n');
}

/**
 * Walks the operators as a PDF reader does: q saves the graphics state, Q restores it, d sets the
 * dash pattern; each stroke (S, s, B, b, B*, b*) is listed with the dash pattern in force then.
 */
function strokesWithDash(content: string): string[] {
  let dash = '[] 0';
  const saved: string[] = [];
  const out: string[] = [];
  for (const line of content.split('\n').map((l) => l.trim())) {
    if (line === 'q') saved.push(dash);
    else if (line === 'Q') dash = saved.pop() ?? '[] 0';
    else if (/ d$/.test(line)) dash = line.slice(0, -2).trim();
    else if (/(^| )(S|s|B|b|B\*|b\*)$/.test(line)) out.push(dash);
  }
  return out;
}

const pattern = (mm: number[]) => `[${mm.map((v) => +(v * PT_PER_MM).toFixed(6)).join(' ')}] 0`;

describe('the plan sheet as PDF: dashed strokes', () => {
  it('draws each dash pattern in full and every later stroke solid, as the SVG does', async () => {
    const propertyLine = [6, 1.5, 1, 1.5]; // dash-dot, as plan-sheet.ts draws property lines
    const primitives: Primitive[] = [
      { kind: 'line', x1: 10, y1: 10, x2: 100, y2: 10, width: 0.7, tone: 'accent', dash: propertyLine },
      { kind: 'text', x: 10, y: 20, text: 'PROPERTY LINE', size: 2, anchor: 'start', tone: 'accent' },
      { kind: 'circle', cx: 50, cy: 50, r: 4, width: 0.35, tone: 'ink' },
      {
        kind: 'poly',
        points: [
          [20, 20],
          [40, 20],
          [40, 40],
        ],
        width: 0.25,
        tone: 'ink',
        closed: true,
        dash: [2, 1],
      },
      { kind: 'line', x1: 10, y1: 60, x2: 100, y2: 60, width: 0.18, tone: 'ink' },
      {
        kind: 'poly',
        points: [
          [60, 60],
          [80, 60],
          [80, 80],
        ],
        width: 0.35,
        tone: 'ink',
        fill: 'ink',
        closed: true,
      },
    ];
    const sheet: PlanSheet = { size: 'A4', scale: 100, widthMm: 297, heightMm: 210, primitives };
    const strokes = strokesWithDash(contentOf(await sheetPdf(sheet, { Title: 'dash test', Subject: 'dash test' })));
    // line, circle, dashed polygon, solid line, filled polygon: one stroke each, in order
    expect(strokes).toEqual([pattern(propertyLine), '[] 0', pattern([2, 1]), '[] 0', '[] 0']);
  });
});
