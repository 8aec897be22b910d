import { PURPOSE_LABELS, STAGE_TITLES, type Purpose } from '@trabeate/contracts';
import type { Db } from '../db/db';
import { allRegister, type DrawingListFilters } from './drawings.repository';
import { datesOf } from '../firms/firms.repository';
import { transmittalReference } from './format';
import { footers, newDocument, printDay, table, toBuffer, MUTED, INK } from './pdf';

type ExportFilters = Omit<DrawingListFilters, 'page' | 'pageSize'>;

interface IssueRow {
  drawing_id: string;
  code: string;
  suitability: string;
  purpose: Purpose;
  issued_at: Date;
  transmittal_number: number | null;
}

interface RegisterLine {
  number: string;
  title: string;
  stage: string;
  sheet: string;
  scale: string;
  revision: string;
  state: string;
  suitability: string;
  dateOfIssue: string;
  history: string;
}

/** The register's rows (firm view: each drawing's newest revision) with every issue so far. */
async function registerLines(db: Db, projectId: string, f: ExportFilters) {
  const project = await db('projects as p')
    .join('firms as f', 'f.id', 'p.firm_id')
    .where('p.id', projectId)
    .first('p.reference', 'p.name', 'f.date_locale', 'f.time_zone');
  const dates = datesOf(project);
  const rows = await allRegister(db, projectId, false, f);
  const issues: IssueRow[] = await db('drawing_revisions as r')
    .leftJoin('transmittal_items as ti', 'ti.revision_id', 'r.id')
    .leftJoin('transmittals as t', 't.id', 'ti.transmittal_id')
    .where('r.project_id', projectId)
    .whereIn('r.state', ['issued', 'superseded'])
    .orderBy(['r.drawing_id', 'r.seq'])
    .select('r.drawing_id', 'r.code', 'r.suitability', 'r.purpose', 'r.issued_at', 't.number as transmittal_number');
  const byDrawing = new Map<string, IssueRow[]>();
  for (const i of issues) byDrawing.set(i.drawing_id, [...(byDrawing.get(i.drawing_id) ?? []), i]);
  const lines: RegisterLine[] = rows.map((r) => {
    const history = byDrawing.get(r.id) ?? [];
    const lastIssue = history.at(-1);
    return {
      number: r.number,
      title: r.title,
      stage: STAGE_TITLES[r.stage_key],
      sheet: r.sheet_size,
      scale: r.scale,
      revision: r.r_code ?? '',
      state: r.r_state ?? 'no revision',
      suitability: r.r_suitability ?? '',
      dateOfIssue: lastIssue ? printDay(lastIssue.issued_at, dates) : '',
      history: history
        .map(
          (i) =>
            `${i.code} ${i.suitability} ${printDay(i.issued_at, dates)}${
              i.transmittal_number ? ` ${transmittalReference(project.reference, i.transmittal_number)}` : ''
            } (${PURPOSE_LABELS[i.purpose].toLowerCase()})`,
        )
        .join('; '),
    };
  });
  return { project, lines };
}

/** A CSV cell: always quoted; a leading = + - @ is defused so a spreadsheet never runs it as a formula. */
export function csvCell(value: string): string {
  const safe = /^[=+\-@\t\r]/.test(value) ? `'${value}` : value;
  return `"${safe.replace(/"/g, '""')}"`;
}

const HEADERS = [
  'Number',
  'Title',
  'Stage',
  'Sheet',
  'Scale',
  'Current revision',
  'State',
  'Suitability',
  'Date of issue',
  'Issue history',
];

export async function registerCsv(db: Db, projectId: string, f: ExportFilters) {
  const { project, lines } = await registerLines(db, projectId, f);
  const body = [
    HEADERS,
    ...lines.map((l) => [
      l.number,
      l.title,
      l.stage,
      l.sheet,
      l.scale,
      l.revision,
      l.state,
      l.suitability,
      l.dateOfIssue,
      l.history,
    ]),
  ]
    .map((cells) => cells.map(csvCell).join(','))
    .join('\r\n');
  // A byte-order mark so spreadsheet programs read the UTF-8 names correctly.
  return { fileName: `${project.reference} drawing register.csv`, body: `\ufeff${body}\r\n` };
}

export async function registerPdf(db: Db, projectId: string, f: ExportFilters) {
  const { project, lines } = await registerLines(db, projectId, f);
  const doc = await newDocument({ Title: `${project.reference} drawing register` }, 'landscape');
  doc.font('heading').fontSize(16).fillColor(INK).text('Drawing register');
  doc.font('body').fontSize(10).fillColor(MUTED).text(`${project.reference} · ${project.name}`);
  const filtered = [f.q && `search "${f.q}"`, f.stageKey && STAGE_TITLES[f.stageKey], f.state, f.suitability]
    .filter(Boolean)
    .join(', ');
  doc.text(`${lines.length} drawing${lines.length === 1 ? '' : 's'}${filtered ? ` (filtered: ${filtered})` : ''}`);
  doc.moveDown(0.8);
  table(
    doc,
    [
      { header: 'Number', width: 90 },
      { header: 'Title', width: 170 },
      { header: 'Rev.', width: 40 },
      { header: 'State', width: 62 },
      { header: 'Suit.', width: 38 },
      { header: 'Date of issue', width: 72 },
      { header: 'Issue history', width: 286 },
    ],
    lines.map((l) => [l.number, l.title, l.revision, l.state, l.suitability, l.dateOfIssue, l.history]),
  );
  footers(doc, `${project.reference} drawing register, made ${printDay(new Date(), datesOf(project))}`);
  return { fileName: `${project.reference} drawing register.pdf`, body: await toBuffer(doc) };
}
