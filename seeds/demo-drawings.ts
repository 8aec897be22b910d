import { createHash } from 'node:crypto';
import { Readable } from 'node:stream';
import type { Knex } from 'knex';
import type { ObjectStore } from '../apps/server/src/storage';
import { DEMO } from './demo-data';

// Kestrel Yard's drawing register in the invented demo: three structural drawings, two issued by
// transmittal (one already revised, so its first issue is superseded), one still a draft. The
// PDFs are tiny, made here byte for byte, so their sizes and SHA-256 are known without storage;
// `storeDemoDrawingFiles` puts them in the object store (npm start does, once S3 is up).

const id = (n: number) => `0b8c2d1e-0000-4000-8000-0000000009${String(n).padStart(2, '0')}`;
const P = DEMO.projects.kestrel;
const U = DEMO.users;
const SITE_OFFICE = 'site.office@brackenfold-build.example';

export const DEMO_DRAWINGS = {
  foundations: { id: id(1), number: 'S-001', title: 'Foundation layout and footing schedule', stage: 'foundations' },
  columns: { id: id(2), number: 'S-002', title: 'Ground floor column layout', stage: 'column_layout' },
  beams: { id: id(3), number: 'S-003', title: 'Level 1 beam framing plan', stage: 'beam_framing' },
} as const;

interface DemoRevision {
  id: string;
  drawingId: string;
  seq: number;
  code: string;
  suitability: string;
  purpose: string;
  description: string;
  date: string;
  finalState: 'issued' | 'superseded' | 'draft';
  fileId: string;
}

const REVISIONS: DemoRevision[] = [
  {
    id: id(11),
    drawingId: DEMO_DRAWINGS.foundations.id,
    seq: 1,
    code: 'P01',
    suitability: 'S2',
    purpose: 'information',
    description: 'First issue: pad footings sized for the site investigation bearing pressure',
    date: '2026-11-12',
    finalState: 'superseded',
    fileId: id(21),
  },
  {
    id: id(12),
    drawingId: DEMO_DRAWINGS.foundations.id,
    seq: 2,
    code: 'P02',
    suitability: 'S3',
    purpose: 'comment',
    description: 'Strap footings at the two boundary columns on Tanner Street',
    date: '2026-11-26',
    finalState: 'issued',
    fileId: id(22),
  },
  {
    id: id(13),
    drawingId: DEMO_DRAWINGS.columns.id,
    seq: 1,
    code: 'P01',
    suitability: 'S2',
    purpose: 'information',
    description: 'Column grid and sizes, levels 0 to 7',
    date: '2026-11-12',
    finalState: 'issued',
    fileId: id(23),
  },
  {
    id: id(14),
    drawingId: DEMO_DRAWINGS.beams.id,
    seq: 1,
    code: 'P01',
    suitability: 'S0',
    purpose: 'coordination',
    description: 'Work in progress: secondary beams around the stair core',
    date: '2026-11-30',
    finalState: 'draft',
    fileId: id(24),
  },
];

const TRANSMITTALS = [
  {
    id: id(31),
    number: 1,
    purpose: 'information',
    note: 'First structural drawings for the design team.',
    issuedAt: new Date('2026-11-13T10:30:00Z'),
    revisions: [id(11), id(13)],
    recipients: [
      {
        id: id(41),
        userId: U.fenwickContact.id,
        email: U.fenwickContact.email,
        name: U.fenwickContact.name,
        ack: new Date('2026-11-14T08:05:00Z'),
      },
      { id: id(42), userId: null, email: SITE_OFFICE, name: '', ack: null },
    ],
  },
  {
    id: id(32),
    number: 2,
    purpose: 'comment',
    note: 'Revised foundations with strap footings at the Tanner Street boundary.',
    issuedAt: new Date('2026-11-27T15:00:00Z'),
    revisions: [id(12)],
    recipients: [
      {
        id: id(43),
        userId: U.fenwickContact.id,
        email: U.fenwickContact.email,
        name: U.fenwickContact.name,
        ack: null,
      },
    ],
  },
];

/** A small, valid one-page PDF with a few lines of text (deterministic bytes). */
export function demoPdf(lines: string[]): Buffer {
  const esc = (s: string) => s.replace(/[\\()]/g, (c) => `\\${c}`);
  const text = lines.map((l, i) => `BT /F1 ${i === 0 ? 16 : 11} Tf 60 ${760 - i * 22} Td (${esc(l)}) Tj ET`).join('\n');
  const objects = [
    '<< /Type /Catalog /Pages 2 0 R >>',
    '<< /Type /Pages /Kids [3 0 R] /Count 1 >>',
    '<< /Type /Page /Parent 2 0 R /MediaBox [0 0 842 595] /Contents 4 0 R /Resources << /Font << /F1 5 0 R >> >> >>',
    `<< /Length ${text.length} >>\nstream\n${text}\nendstream`,
    '<< /Type /Font /Subtype /Type1 /BaseFont /Helvetica >>',
  ];
  let body = '%PDF-1.7\n';
  const offsets: number[] = [];
  objects.forEach((o, i) => {
    offsets.push(body.length);
    body += `${i + 1} 0 obj\n${o}\nendobj\n`;
  });
  const xref = body.length;
  body += `xref\n0 ${objects.length + 1}\n0000000000 65535 f \n${offsets.map((o) => `${String(o).padStart(10, '0')} 00000 n \n`).join('')}`;
  body += `trailer\n<< /Size ${objects.length + 1} /Root 1 0 R >>\nstartxref\n${xref}\n%%EOF\n`;
  return Buffer.from(body, 'latin1');
}

const drawingOf = (drawingId: string) => Object.values(DEMO_DRAWINGS).find((d) => d.id === drawingId)!;
const fileKey = (r: DemoRevision) => `drawings/${P.id}/${r.id}/${r.fileId}`;
const sheetKey = (t: (typeof TRANSMITTALS)[number]) => `transmittals/${P.id}/${t.id}/sheet`;
const fileOf = (r: DemoRevision) => {
  const d = drawingOf(r.drawingId);
  return demoPdf([
    `${d.number} ${d.title}`,
    `Kestrel Yard apartments (${P.reference}), revision ${r.code}, suitability ${r.suitability}`,
    r.description,
    'Sable Quay Structural. Preliminary: final design and sealing by a licensed structural engineer.',
  ]);
};
const sheetOf = (t: (typeof TRANSMITTALS)[number]) =>
  demoPdf([
    `Transmittal ${P.reference}-TR-${String(t.number).padStart(3, '0')}`,
    `Kestrel Yard apartments, purpose of issue: ${t.purpose}`,
    ...t.revisions.map((rid) => {
      const r = REVISIONS.find((x) => x.id === rid)!;
      const d = drawingOf(r.drawingId);
      return `${d.number} ${d.title}  rev ${r.code}  ${r.suitability}  ${r.date}`;
    }),
  ]);

/** Every object the demo register refers to, by key. */
export function demoDrawingObjects(): Array<{ key: string; data: Buffer }> {
  return [
    ...REVISIONS.map((r) => ({ key: fileKey(r), data: fileOf(r) })),
    ...TRANSMITTALS.map((t) => ({ key: sheetKey(t), data: sheetOf(t) })),
  ];
}

/** Puts the demo's files in the store where they are missing (safe to run on every start). */
export async function storeDemoDrawingFiles(store: ObjectStore): Promise<number> {
  await store.ensureBucket();
  let stored = 0;
  for (const o of demoDrawingObjects()) {
    if (await store.head(o.key)) continue;
    await store.putStream(o.key, Readable.from([o.data]), { contentType: 'application/pdf' });
    stored++;
  }
  return stored;
}

/** Inserts Kestrel Yard's register unless it is there already. */
export async function seedDemoDrawings(db: Knex): Promise<void> {
  if (await db('drawings').where({ id: DEMO_DRAWINGS.foundations.id }).first('id')) return;
  await db.transaction(async (trx) => {
    await trx('drawings').insert(
      Object.values(DEMO_DRAWINGS).map((d) => ({
        id: d.id,
        firm_id: DEMO.firm.id,
        project_id: P.id,
        number: d.number,
        title: d.title,
        stage_key: d.stage,
        sheet_size: 'A1',
        scale: '1:100',
        created_by: U.engineerA.id,
      })),
    );
    const issuedAt = (rid: string) => TRANSMITTALS.find((t) => t.revisions.includes(rid))?.issuedAt ?? null;
    // A revision starts as a draft with its file (the database takes files only before issue), and
    // a drawing has one open revision at a time: so each is added just before it is issued.
    const addRevision = async (r: DemoRevision) => {
      const done = r.finalState !== 'draft';
      await trx('drawing_revisions').insert({
        id: r.id,
        drawing_id: r.drawingId,
        project_id: P.id,
        seq: r.seq,
        series: 'preliminary',
        code: r.code,
        suitability: r.suitability,
        purpose: r.purpose,
        description: r.description,
        revision_date: r.date,
        state: 'draft',
        drawn_by: U.engineerA.id,
      });
      const data = fileOf(r);
      await trx('revision_files').insert({
        id: r.fileId,
        revision_id: r.id,
        project_id: P.id,
        role: 'pdf',
        file_name: `${drawingOf(r.drawingId).number} rev ${r.code}.pdf`,
        object_key: fileKey(r),
        size_bytes: data.length,
        sha256: createHash('sha256').update(data).digest('hex'),
        content_type: 'application/pdf',
        uploaded_by: U.engineerA.id,
        uploaded_at: new Date(`${r.date}T09:00:00Z`),
      });
      if (done)
        await trx('drawing_revisions')
          .where({ id: r.id })
          .update({
            state: 'approved',
            checked_by: U.engineerB.id,
            approved_by: U.principal.id,
            checked_at: issuedAt(r.id),
            approved_at: issuedAt(r.id),
          });
    };
    for (const t of TRANSMITTALS) {
      const sheet = sheetOf(t);
      await trx('transmittals').insert({
        id: t.id,
        firm_id: DEMO.firm.id,
        project_id: P.id,
        number: t.number,
        purpose: t.purpose,
        note: t.note,
        issued_by: U.principal.id,
        issued_at: t.issuedAt,
        links_expire_at: new Date(t.issuedAt.getTime() + 14 * 86_400_000),
        sheet_object_key: sheetKey(t),
        sheet_size_bytes: sheet.length,
      });
      await trx('transmittal_recipients').insert(
        t.recipients.map((r) => ({
          id: r.id,
          transmittal_id: t.id,
          user_id: r.userId,
          email: r.email,
          name: r.name,
          acknowledged_at: r.ack,
        })),
      );
      for (const rid of t.revisions) await addRevision(REVISIONS.find((x) => x.id === rid)!);
      await trx('transmittal_items').insert(
        t.revisions.map((rid, i) => ({ transmittal_id: t.id, revision_id: rid, position: i + 1 })),
      );
      for (const rid of t.revisions) {
        const r = REVISIONS.find((x) => x.id === rid)!;
        await trx('drawing_revisions')
          .where({ drawing_id: r.drawingId, state: 'issued' })
          .update({ state: 'superseded', superseded_at: t.issuedAt });
        await trx('drawing_revisions').where({ id: rid }).update({ state: 'issued', issued_at: t.issuedAt });
      }
    }
    for (const r of REVISIONS.filter((x) => x.finalState === 'draft')) await addRevision(r);
  });
}
