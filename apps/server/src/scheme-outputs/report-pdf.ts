import { FOOTING_OPTION_LABELS, type FootingOption, type SchemeDocument } from '@trabeate/contracts';
import {
  beamLineDiagram,
  ENGINE_VERSION,
  type BeamLineDiagram,
  type BeamLineResult,
  type Scheme,
  type SchemeResult,
} from '@trabeate/structural';
import { ACCENT, INK, MUTED, RULE, newDocument, table, toBuffer } from '../drawings/pdf';

// The calculation report of one saved scheme version, written from the results stored with that
// save (never re-run here), so the report says exactly what the engine said at the time.

export interface FootingChoice {
  columnId: string;
  option: string;
  reason: string;
}

export interface ReportInput {
  firm: string;
  projectReference: string;
  projectName: string;
  schemeName: string;
  version: number;
  savedAt: string;
  savedBy: string;
  engineVersion: string;
  document: SchemeDocument;
  results: SchemeResult;
  /** document field added later (footingChoices); absent in older saves */
  footingChoices: FootingChoice[];
  /** already in the firm's date format */
  generatedOn: string;
  caution: string;
}

const f0 = (v: number) => (Number.isFinite(v) ? v.toFixed(0) : '—');
const f1 = (v: number) => (Number.isFinite(v) ? v.toFixed(1) : '—');
const f2 = (v: number) => (Number.isFinite(v) ? v.toFixed(2) : '—');
/** A load factor as written in the codes: up to three decimals, no trailing noise (1.05, not 1.0499…). */
const factor = (v: number) => String(Math.round(v * 1000) / 1000);
/** A check's source with its kind in brackets, unless the source already says it. */
const sourced = (source: string, kind: string) => {
  const words = KIND_WORDS[kind] ?? kind;
  return source.toLowerCase().includes(words) ? source : `${source} (${words})`;
};
const KIND_WORDS: Record<string, string> = {
  code: 'design code',
  handbook: 'handbook table',
  practice: 'common practice',
  memory: 'from memory',
  derived: 'derived',
  project: 'set for this project',
};

/** Reads the optional footingChoices list of a stored document, ignoring anything malformed. */
export function footingChoicesOf(raw: unknown): FootingChoice[] {
  const list = (raw as { footingChoices?: unknown } | null)?.footingChoices;
  if (!Array.isArray(list)) return [];
  return list.filter(
    (c): c is FootingChoice =>
      typeof c === 'object' &&
      c !== null &&
      typeof (c as FootingChoice).columnId === 'string' &&
      typeof (c as FootingChoice).option === 'string' &&
      typeof (c as FootingChoice).reason === 'string',
  );
}

type Doc = PDFKit.PDFDocument;

function heading(doc: Doc, text: string) {
  if (doc.y > doc.page.height - doc.page.margins.bottom - 120) doc.addPage();
  doc.moveDown(0.8);
  doc.x = doc.page.margins.left;
  doc.font('heading').fontSize(13).fillColor(ACCENT).text(text);
  doc.moveDown(0.3);
  doc.font('body').fontSize(9).fillColor(INK);
}

function note(doc: Doc, text: string) {
  doc.x = doc.page.margins.left;
  doc
    .font('body')
    .fontSize(8.5)
    .fillColor(MUTED)
    .text(text, { width: doc.page.width - doc.page.margins.left - doc.page.margins.right });
  doc.fillColor(INK).fontSize(9);
}

function facts(doc: Doc, rows: [string, string][]) {
  const left = doc.page.margins.left;
  for (const [label, value] of rows) {
    const y = doc.y;
    doc.font('heading').fontSize(9).fillColor(MUTED).text(label, left, y, { width: 170 });
    doc
      .font('body')
      .fontSize(9.5)
      .fillColor(INK)
      .text(value, left + 175, y, { width: 335 });
    doc.moveDown(0.25);
  }
}

function designBasis(doc: Doc, d: ReportInput) {
  const b = d.document.basis;
  doc.font('heading').fontSize(9).fillColor(ACCENT).text(d.firm.toUpperCase(), { characterSpacing: 1 });
  doc.moveDown(0.3);
  doc.font('heading').fontSize(18).fillColor(INK).text('Calculation report');
  doc.font('body').fontSize(11).fillColor(MUTED).text(`${d.projectReference} · ${d.projectName}`);
  doc.text(`${d.schemeName}, version ${d.version}`);
  doc.moveDown(0.6);
  facts(doc, [
    ['Saved', `${d.savedAt} by ${d.savedBy}`],
    ['Report generated', d.generatedOn],
    ['Engine version', d.engineVersion],
  ]);
  heading(doc, '1  Design basis');
  facts(doc, [
    ['Code family', `${b.codeFamily} — ${d.results.codeTitle || 'not analysed'}`],
    ['Concrete strength', `${b.concreteMPa} MPa`],
    ['Reinforcement yield strength', `${b.steelMPa} MPa`],
    ['Imposed load, floors', `${b.imposedKPa} kPa`],
    ...(b.roofImposedKPa !== undefined ? [['Imposed load, roof', `${b.roofImposedKPa} kPa`] as [string, string]] : []),
    ['Superimposed dead load', `${b.superimposedDeadKPa} kPa`],
    ['Wall load on beams', `${b.wallLoadKNPerM} kN/m`],
    ['Allowable bearing pressure', `${b.bearingPressureKPa} kPa`],
    ['Founding depth', `${b.foundingDepthM} m`],
    ['Storeys × storey height', `${b.storeys} × ${b.storeyHeightM} m`],
    ['Beam width', `${b.beamWidthMm} mm`],
    ['Slab thickness adopted', `${f0(d.results.loads?.slabThicknessMm ?? NaN)} mm`],
    [
      'Unit rates',
      `${b.rates.currency}: concrete ${b.rates.concretePerM3}/m³, steel ${b.rates.steelPerKg}/kg, formwork ${b.rates.formworkPerM2}/m²`,
    ],
  ]);
  if (d.results.combinations.length) {
    doc.moveDown(0.4);
    table(
      doc,
      [
        { header: 'Load combination', width: 150 },
        { header: 'Dead factor', width: 70 },
        { header: 'Imposed factor', width: 80 },
        { header: 'Source', width: 211 },
      ],
      d.results.combinations.map((c) => [c.id, factor(c.dead), factor(c.live), c.source]),
    );
  }
  note(
    doc,
    'Units: SI throughout. Lengths in m, sections in mm, loads in kN, kN/m and kPa, moments in kN·m, strengths in MPa.',
  );
}

function checks(doc: Doc, d: ReportInput) {
  heading(doc, '2  Checks');
  const r = d.results;
  if (r.problems.length) {
    doc.font('heading').text(`Input problems (${r.problems.length}): the engine could not analyse past these.`);
    table(
      doc,
      [
        { header: 'Where', width: 150 },
        { header: 'Problem', width: 361 },
      ],
      r.problems.map((p) => [p.path, p.message]),
    );
  }
  const errors = r.checks.filter((c) => c.severity === 'error').length;
  doc.text(
    `${r.checks.length} check${r.checks.length === 1 ? '' : 's'} failed (${errors} error${errors === 1 ? '' : 's'}); failing checks are listed in full, passing ones per rule below.`,
  );
  doc.moveDown(0.3);
  if (r.checks.length)
    table(
      doc,
      [
        { header: 'Rule', width: 78 },
        { header: 'Severity', width: 44 },
        { header: 'Finding', width: 180 },
        { header: 'Value / limit', width: 66 },
        { header: 'Source (kind)', width: 143 },
      ],
      r.checks.map((c) => [
        c.ruleId,
        c.severity,
        c.message,
        // the shipped Latin subset has no ≤ or ≥: words instead
        `${f1(c.value)} ${c.unit}, ${c.sense === 'max' ? 'at most' : 'at least'} ${f1(c.limit)}`,
        sourced(c.source, c.sourceKind),
      ]),
    );
  doc.moveDown(0.5);
  doc.font('heading').fontSize(10).text('Passing checks, per rule');
  doc.font('body').fontSize(9);
  table(
    doc,
    [
      { header: 'Rule', width: 90 },
      { header: 'Passed', width: 40 },
      { header: 'Nearest its limit', width: 190 },
      { header: 'Source (kind)', width: 191 },
    ],
    r.passed.map((p) => [
      p.ruleId,
      String(p.count),
      p.tightest.message,
      sourced(p.tightest.source, p.tightest.sourceKind),
    ]),
  );
}

function columnSchedule(doc: Doc, d: ReportInput) {
  heading(doc, '3  Column schedule');
  const loads = new Map(d.results.loads.columns.map((c) => [c.columnId, c]));
  const sizes = new Map(d.results.sizes.columns.map((c) => [c.columnId, c]));
  table(
    doc,
    [
      { header: 'Mark', width: 44 },
      { header: 'Position x, y (m)', width: 84 },
      { header: 'Section (mm)', width: 70 },
      { header: 'Pu storey 1 (kN)', width: 96 },
      { header: 'Capacity (kN)', width: 66 },
      { header: 'Utilisation', width: 62 },
      { header: 'Side needed (mm)', width: 89 },
    ],
    d.document.columns.map((c) => {
      const l = loads.get(c.id);
      const s = sizes.get(c.id);
      return [
        c.label,
        `${f2(c.x)}, ${f2(c.y)}`,
        `${c.widthMm} × ${c.depthMm}${c.orientationDeg === 90 ? ' (turned)' : ''}`,
        l ? f0(l.factoredKN[0]) : '—',
        s ? f0(s.providedCapacityKN) : '—',
        s ? f2(s.utilisation[0]) : '—',
        s ? f0(s.requiredSideMm[0]) : '—',
      ];
    }),
  );
  note(
    doc,
    `Pu storey 1: factored axial load in the lowest storey. ${d.results.sizes.columns[0] ? `Capacity: ${d.results.sizes.columns[0].source}.` : ''}`,
  );
}

function beamSchedule(doc: Doc, d: ReportInput) {
  heading(doc, '4  Beam schedule');
  table(
    doc,
    [
      { header: 'Member', width: 80 },
      { header: 'Span (m)', width: 46 },
      { header: 'Support', width: 62 },
      { header: 'b (mm)', width: 40 },
      { header: 'Design M (kN·m)', width: 60 },
      { header: 'd span, moment', width: 92 },
      { header: 'Adopted (mm)', width: 60 },
      { header: 'Governs', width: 71 },
    ],
    d.results.sizes.beams.map((b) => [
      b.memberId,
      f2(b.spanM),
      b.condition,
      f0(b.widthMm),
      f1(b.designMomentKNm),
      `${f0(b.fromSpanDepthMm)}, ${f0(b.fromMomentMm)}`,
      f0(b.adoptedDepthMm),
      b.governs,
    ]),
  );
  const first = d.results.sizes.beams[0];
  note(
    doc,
    `d span, moment: overall depth needed by the span/depth limit and by moment capacity, mm.${first ? ` Span/depth: ${first.spanDepthSource}. Moment: ${first.momentSource}.` : ''}`,
  );
}

function footingSchedule(doc: Doc, d: ReportInput) {
  heading(doc, '5  Footing schedule (isolated pads)');
  const label = new Map(d.document.columns.map((c) => [c.id, c.label]));
  table(
    doc,
    [
      { header: 'Column', width: 60 },
      { header: 'Service load (kN)', width: 76 },
      { header: 'Area needed (m²)', width: 76 },
      { header: 'Side adopted (m)', width: 76 },
      { header: 'Thickness (m)', width: 70 },
      { header: 'Net factored pressure (kPa)', width: 153 },
    ],
    d.results.sizes.footings.map((f) => [
      label.get(f.columnId) ?? f.columnId,
      f0(f.serviceKN),
      f2(f.areaM2),
      f2(f.adoptedSideM),
      f2(f.thicknessM),
      f0(f.factoredPressureKPa),
    ]),
  );
  note(
    doc,
    `Plan area A = (1 + α)·P / qa with qa = ${d.document.basis.bearingPressureKPa} kPa; thickness 0.2 × side, at least 0.3 m (common practice), to be checked for shear in design.`,
  );
}

type Curve = [number, number][];

/** One plotted quantity along the line: the envelope band between its upper and lower curves. */
function plotBand(
  doc: Doc,
  sx: (s: number) => number,
  left: number,
  width: number,
  title: string,
  unit: string,
  upper: Curve,
  lower: Curve,
  height: number,
) {
  if (doc.y + height + 30 > doc.page.height - doc.page.margins.bottom - 20) doc.addPage();
  const top = doc.y + 4;
  const all = [...upper, ...lower];
  const peak = Math.max(1e-9, ...all.map(([, v]) => Math.abs(v)));
  const mid = top + height / 2;
  // positive values drawn below the axis: sagging moments on the tension side
  const vy = (v: number) => mid + (v / peak) * (height / 2);
  doc
    .font('body')
    .fontSize(7.5)
    .fillColor(MUTED)
    .text(title, doc.page.margins.left, top - 2, { width: 40 });
  for (const curve of [upper, lower]) {
    if (!curve.length) continue;
    doc.moveTo(sx(curve[0][0]), mid);
    for (const [s, v] of curve) doc.lineTo(sx(s), vy(v));
    doc.lineTo(sx(curve[curve.length - 1][0]), mid);
    doc.fillOpacity(0.15).fillAndStroke(ACCENT, ACCENT);
    doc.fillOpacity(1);
  }
  doc
    .moveTo(left, mid)
    .lineTo(left + width, mid)
    .lineWidth(0.6)
    .strokeColor(INK)
    .stroke();
  for (const curve of [upper, lower]) {
    if (!curve.length) continue;
    const extreme = curve.reduce((a, b) => (Math.abs(b[1]) > Math.abs(a[1]) ? b : a));
    if (Math.abs(extreme[1]) < 1e-6) continue;
    doc
      .fontSize(7)
      .fillColor(INK)
      .text(`${f1(extreme[1])} ${unit}`, sx(extreme[0]) - 22, vy(extreme[1]) + (extreme[1] > 0 ? 2 : -9), {
        width: 44,
        align: 'center',
        lineBreak: false,
      });
  }
  doc.y = top + height + 8;
}

/**
 * One beam line's moment and shear envelopes drawn as vectors. With the engine's station-by-station
 * diagram (beamLineDiagram, same engine version as the stored results) the curves are the
 * envelope along the line; without it each member is drawn from its stored extremes joined by
 * straight lines, and the report says that this is a simplified picture.
 */
function drawLine(doc: Doc, line: BeamLineResult, diagram: BeamLineDiagram | null) {
  const left = doc.page.margins.left + 40;
  const width = doc.page.width - doc.page.margins.left - doc.page.margins.right - 50;
  const total = line.members.reduce((s, m) => s + m.lengthM, 0) || 1;
  const sx = (s: number) => left + (s / total) * width;
  if (diagram) {
    const st = diagram.stations;
    plotBand(
      doc,
      sx,
      left,
      width,
      'M (kN·m)',
      'kN·m',
      st.map((p) => [p.s, p.maxMomentKNm]),
      st.map((p) => [p.s, p.minMomentKNm]),
      50,
    );
    plotBand(
      doc,
      sx,
      left,
      width,
      'V (kN)',
      'kN',
      st.map((p) => [p.s, p.maxShearKN]),
      st.map((p) => [p.s, p.minShearKN]),
      40,
    );
  } else {
    const moment: Curve = [];
    const shear: Curve = [];
    let s0 = 0;
    for (const m of line.members) {
      const cantileverStart = m.kind === 'cantilever' && s0 === 0;
      const hogStart = cantileverStart ? 0 : m.minMomentAtM <= m.lengthM / 2 ? m.minMomentKNm : 0;
      const hogEnd = m.minMomentAtM > m.lengthM / 2 ? m.minMomentKNm : 0;
      moment.push([s0, hogStart]);
      if (m.maxMomentKNm > 0) moment.push([s0 + m.maxMomentAtM, m.maxMomentKNm]);
      moment.push([s0 + m.lengthM, hogEnd]);
      shear.push([s0, m.maxShearKN], [s0 + m.lengthM, -m.maxShearKN]);
      s0 += m.lengthM;
    }
    plotBand(doc, sx, left, width, 'M (kN·m)', 'kN·m', moment, [], 46);
    plotBand(doc, sx, left, width, 'V (kN)', 'kN', shear, [], 36);
  }
  // supports under the line
  const y = doc.y;
  const origin = line.reactions[0]?.s ?? 0;
  for (const r of line.reactions) {
    const x = sx(r.s - origin);
    if (r.columnId) doc.polygon([x, y], [x - 3, y + 5], [x + 3, y + 5]).fill(INK);
  }
  doc.y = y + 10;
  doc.x = doc.page.margins.left;
}

/** The engine's diagram of a line, when the stored results came from this engine version. */
function diagramOf(d: ReportInput, line: BeamLineResult): BeamLineDiagram | null {
  if (d.engineVersion !== ENGINE_VERSION) return null;
  try {
    return beamLineDiagram(d.document as Scheme, line.lineId, line.level);
  } catch {
    return null;
  }
}

function beamLines(doc: Doc, d: ReportInput) {
  heading(doc, '6  Beam lines: moments and shears');
  const lines = d.results.beamLines.filter((l) => l.level === 'floor');
  const diagrams = lines.map((l) => diagramOf(d, l));
  note(
    doc,
    diagrams.every((g) => g)
      ? 'Envelopes of the factored load arrangements along each floor beam line (upper and lower curves), sagging moment drawn below the axis; peaks are the envelope values in the beam schedule. The roof lines follow the same layout.'
      : "Simplified diagrams where marked: the stored results came from another engine version, so each member's stored envelope extremes (hogging at its supports, the largest sagging where it occurs, the largest shear at its ends) are joined by straight lines; they show magnitudes and where they act, not the curve between.",
  );
  lines.forEach((line, i) => {
    if (doc.y > doc.page.height - doc.page.margins.bottom - 150) doc.addPage();
    doc.moveDown(0.5);
    doc.x = doc.page.margins.left;
    doc
      .font('heading')
      .fontSize(10)
      .fillColor(INK)
      .text(
        `Line ${line.label} (${line.level}), ${line.members.length} member${line.members.length === 1 ? '' : 's'}, b = ${line.widthMm} mm${diagrams[i] ? '' : ' (simplified diagram)'}`,
      );
    doc.font('body').fontSize(8).fillColor(MUTED);
    doc.text(
      line.members
        .map(
          (m) =>
            `${m.id}: ${f2(m.lengthM)} m, M+ ${f1(m.maxMomentKNm)}, M− ${f1(m.minMomentKNm)} kN·m, V ${f1(m.maxShearKN)} kN`,
        )
        .join('; '),
    );
    drawLine(doc, line, diagrams[i]);
  });
}

function boundaryFootings(doc: Doc, d: ReportInput) {
  heading(doc, '7  Footings at the property lines');
  const label = new Map(d.document.columns.map((c) => [c.id, c.label]));
  const chosen = new Map(d.footingChoices.map((c) => [c.columnId, c]));
  const options = d.results.footings.boundary;
  if (!options.length) {
    doc.text('No isolated footing crosses a property line in this scheme.');
    return;
  }
  for (const o of options) {
    const c = chosen.get(o.columnId);
    doc.moveDown(0.4);
    doc.x = doc.page.margins.left;
    doc
      .font('heading')
      .fontSize(10)
      .fillColor(INK)
      .text(
        `Column ${label.get(o.columnId) ?? o.columnId}: ${f2(o.distanceToLineM)} m from the line, its pad would cross it by ${f2(o.crossingM)} m`,
      );
    const rows: string[][] = [
      [
        'Move the column inward',
        `by ${f2(o.shift.shiftM)} m to (${f2(o.shift.newPosition.x)}, ${f2(o.shift.newPosition.y)})${o.shift.spanAfterM !== null ? `; span ${f2(o.shift.spanBeforeM ?? NaN)} → ${f2(o.shift.spanAfterM)} m` : ''}`,
      ],
      [
        'Strap footing',
        o.strap
          ? `${o.strap.feasible ? '' : 'NOT WORKABLE: '}exterior pad ${f2(o.strap.exteriorLengthM)} × ${f2(o.strap.exteriorWidthM)} m, interior ${f2(o.strap.interiorSideM)} m square to ${label.get(o.interiorColumnId ?? '') ?? o.interiorColumnId}; strap M ${f0(o.strap.factoredMomentKNm)} kN·m factored`
          : 'no interior column to tie to',
      ],
      [
        'Combined footing (rectangular)',
        o.combinedRectangular
          ? `${o.combinedRectangular.feasible ? '' : 'NOT WORKABLE: '}${f2(o.combinedRectangular.lengthM)} × ${f2(o.combinedRectangular.adoptedWidthM)} m`
          : '—',
      ],
      [
        'Combined footing (trapezoidal)',
        o.combinedTrapezoidal
          ? `${o.combinedTrapezoidal.feasible ? '' : 'NOT WORKABLE: '}${f2(o.combinedTrapezoidal.lengthM)} m long, ${f2(o.combinedTrapezoidal.widthAtFirstM)} to ${f2(o.combinedTrapezoidal.widthAtFarM)} m wide`
          : '—',
      ],
    ];
    table(
      doc,
      [
        { header: 'Option', width: 150 },
        { header: 'Size', width: 361 },
      ],
      rows,
    );
    doc.x = doc.page.margins.left;
    doc
      .font('body')
      .fontSize(9)
      .fillColor(c ? INK : MUTED)
      .text(
        c
          ? `Chosen: ${FOOTING_OPTION_LABELS[c.option as FootingOption] ?? c.option}. Reason: ${c.reason}`
          : 'No option chosen yet in this version of the scheme.',
      );
  }
  if (d.results.footings.combined.length) {
    doc.moveDown(0.5);
    doc.font('heading').fontSize(10).fillColor(INK).text('Pads that would overlap: combined footings');
    table(
      doc,
      [
        { header: 'Columns', width: 120 },
        { header: 'Gap (m)', width: 80 },
        { header: 'Length × width (m)', width: 311 },
      ],
      d.results.footings.combined.map((c) => [
        c.columnIds.map((id) => label.get(id) ?? id).join(' + '),
        f2(c.gapM),
        `${f2(c.lengthM)} × ${f2(c.adoptedWidthM)}`,
      ]),
    );
  }
}

function quantities(doc: Doc, d: ReportInput) {
  heading(doc, '8  Quantities and cost');
  const q = d.results.quantities;
  const cost = d.results.cost;
  const money = new Intl.NumberFormat('en-GB', {
    style: 'currency',
    currency: cost.currency || 'EUR',
    maximumFractionDigits: 0,
  });
  const costOf = new Map(cost.rows.map((r) => [r.member, r]));
  table(
    doc,
    [
      { header: 'Member type', width: 70 },
      { header: 'Concrete (m³)', width: 66 },
      { header: 'Steel (kg)', width: 66 },
      { header: 'Formwork (m²)', width: 66 },
      { header: 'Steel (kg/m³)', width: 100 },
      { header: 'Cost', width: 143 },
    ],
    [
      ...q.rows.map((r) => [
        r.member,
        f1(r.concreteM3),
        f0(r.steelKg),
        f1(r.formworkM2),
        `${f0(r.steelRatioKgPerM3)} (${r.steelRatioSource})`,
        costOf.has(r.member) ? money.format(costOf.get(r.member)!.total) : '—',
      ]),
      ['Total', f1(q.totals.concreteM3), f0(q.totals.steelKg), f1(q.totals.formworkM2), '', money.format(cost.total)],
    ],
  );
  for (const n of q.notes) note(doc, n);
  doc.moveDown(0.6);
  doc
    .font('body')
    .fontSize(9)
    .fillColor(INK)
    .text(`Results computed by Trabeate engine ${d.engineVersion} when version ${d.version} was saved.`);
}

/** The report's sections in order; the job reports progress after each. */
export const REPORT_SECTIONS = [
  designBasis,
  checks,
  columnSchedule,
  beamSchedule,
  footingSchedule,
  beamLines,
  boundaryFootings,
  quantities,
] as const;

/**
 * Writes the report, calling `progress(done, total)` after each section (the job stores it).
 * Every page carries the caution at its head and a footer naming project, scheme, version and page.
 */
export async function calculationReport(
  d: ReportInput,
  progress: (done: number, total: number) => Promise<void> = async () => undefined,
): Promise<{ pdf: Buffer; pages: number }> {
  const doc = await newDocument({ Title: `Calculation report: ${d.schemeName} v${d.version}`, Subject: d.projectName });
  // room for the caution above the body on every page
  doc.page.margins.top = 70;
  doc.on('pageAdded', () => {
    doc.page.margins.top = 70;
    doc.y = 70;
  });
  doc.y = 70;
  let done = 0;
  for (const section of REPORT_SECTIONS) {
    section(doc, d);
    done++;
    await progress(done, REPORT_SECTIONS.length);
  }
  const range = doc.bufferedPageRange();
  const footer = `${d.projectReference} ${d.projectName}  ·  ${d.schemeName}  ·  version ${d.version}`;
  for (let i = range.start; i < range.start + range.count; i++) {
    doc.switchToPage(i);
    // Writing in the margins must not start a page of its own.
    const margins = { ...doc.page.margins };
    doc.page.margins.top = 0;
    doc.page.margins.bottom = 0;
    const left = margins.left;
    const width = doc.page.width - left - margins.right;
    doc.rect(left, 30, width, 30).fillAndStroke('#f4f6f6', RULE);
    doc
      .font('heading')
      .fontSize(7.5)
      .fillColor(INK)
      .text(`PRELIMINARY. ${d.caution}`, left + 6, 34, { width: width - 12, height: 24, lineBreak: true });
    const bottom = doc.page.height - margins.bottom + 12;
    doc.font('body').fontSize(7.5).fillColor(MUTED);
    doc.text(`${footer}  ·  page ${i + 1} of ${range.count}`, left, bottom, { width, lineBreak: false });
    doc.page.margins = margins;
  }
  return { pdf: await toBuffer(doc), pages: range.count };
}
