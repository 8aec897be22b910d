import { createHash, randomUUID } from 'node:crypto';
import { Readable } from 'node:stream';
import type { Knex } from 'knex';
import type TestAgent from 'supertest/lib/agent';
import type { Response } from 'supertest';
import yauzl from 'yauzl';
import { drawingSchema, revisionSchema, type DrawingCreate, type RevisionCreate } from '@trabeate/contracts';
import { send } from './agents';
import { xsrfToken } from './identity';
import { tinyPdf } from './fakes';
import type { ObjectStore } from '../../apps/server/src/storage';

// pdf-parse's index runs its own self-test when loaded without a parent module; its library file does not.
// eslint-disable-next-line @typescript-eslint/no-require-imports
const pdfParse = require('pdf-parse/lib/pdf-parse.js') as (data: Buffer) => Promise<{ text: string; numpages: number }>;

/** The text of a PDF with its line breaks (and the marks pdf-parse leaves at wrapped lines) as spaces. */
export async function pdfText(data: Buffer): Promise<string> {
  return (await pdfParse(data)).text.replace(/[ \u00b7]*\n/g, ' ').replace(/ {2,}/g, ' ');
}

/** Collects a binary response body into a Buffer (supertest leaves unknown types unparsed). */
export function binary(res: Response, cb: (err: Error | null, body: Buffer) => void): void {
  const chunks: Buffer[] = [];
  res.on('data', (c: Buffer) => chunks.push(c));
  res.on('end', () => cb(null, Buffer.concat(chunks)));
}

/** The entries of a ZIP held in memory (small test archives only), name to bytes. */
export function unzip(data: Buffer): Promise<Map<string, Buffer>> {
  return new Promise((resolve, reject) => {
    yauzl.fromBuffer(data, { lazyEntries: true }, (err, zip) => {
      if (err || !zip) return reject(err ?? new Error('not a zip'));
      const out = new Map<string, Buffer>();
      zip.on('entry', (entry: yauzl.Entry) => {
        zip.openReadStream(entry, (e, stream) => {
          if (e || !stream) return reject(e ?? new Error('no stream'));
          const chunks: Buffer[] = [];
          stream.on('data', (c: Buffer) => chunks.push(c));
          stream.on('end', () => {
            out.set(entry.fileName, Buffer.concat(chunks));
            zip.readEntry();
          });
        });
      });
      zip.on('end', () => resolve(out));
      zip.on('error', reject);
      zip.readEntry();
    });
  });
}

export const drawingBody = (over: Partial<DrawingCreate> = {}): DrawingCreate => ({
  number: 'S-101',
  title: 'Ground floor column layout',
  stageKey: 'column_layout',
  sheetSize: 'A1',
  scale: '1:100',
  ...over,
});

export const revisionBody = (over: Partial<RevisionCreate> = {}): RevisionCreate => ({
  suitability: 'S2',
  purpose: 'information',
  description: 'First issue for coordination',
  date: '2026-12-01',
  ...over,
});

export function uploadRevisionFile(
  api: TestAgent,
  projectId: string,
  revisionId: string,
  data: Buffer,
  filename: string,
  role: 'pdf' | 'source' = 'pdf',
) {
  return api
    .post(`/api/projects/${projectId}/revisions/${revisionId}/files?role=${role}`)
    .set('X-XSRF-TOKEN', xsrfToken(api))
    .attach('file', data, { filename, contentType: role === 'pdf' ? 'application/pdf' : 'application/octet-stream' });
}

/**
 * A drawing with one revision taken through the lifecycle to approval: drawn (with its PDF) by
 * `drawer`, checked by `checker`, approved by `principal`. Returns the drawing and the revision.
 */
export async function approvedRevision(
  agents: { drawer: TestAgent; checker: TestAgent; principal: TestAgent },
  projectId: string,
  number: string,
  pdf = tinyPdf(`Drawing ${number}`),
) {
  const d = await send(agents.drawer, 'post', `/api/projects/${projectId}/drawings`, drawingBody({ number }));
  if (d.status !== 201) throw new Error(`drawing: ${d.status} ${JSON.stringify(d.body)}`);
  const drawing = drawingSchema.parse(d.body);
  const r = await send(
    agents.drawer,
    'post',
    `/api/projects/${projectId}/drawings/${drawing.id}/revisions`,
    revisionBody(),
  );
  if (r.status !== 201) throw new Error(`revision: ${r.status} ${JSON.stringify(r.body)}`);
  const revision = revisionSchema.parse(r.body);
  const f = await uploadRevisionFile(agents.drawer, projectId, revision.id, pdf, `${number}.pdf`);
  if (f.status !== 201) throw new Error(`file: ${f.status} ${JSON.stringify(f.body)}`);
  for (const [who, action] of [
    [agents.checker, 'check'],
    [agents.principal, 'approve'],
  ] as const) {
    const t = await send(who, 'post', `/api/projects/${projectId}/revisions/${revision.id}/transitions`, { action });
    if (t.status !== 200) throw new Error(`${action}: ${t.status} ${JSON.stringify(t.body)}`);
  }
  return { drawing, revision, pdf };
}

/** Ids of the register rows the authorization matrix requests (made by `seedRegisterForMatrix`). */
export const REGISTER_IDS = {
  drawing: randomUUID(),
  issued: randomUUID(),
  issuedFile: randomUUID(),
  draft: randomUUID(),
  draftDrawing: randomUUID(),
  toCheck: randomUUID(),
  toCheckDrawing: randomUUID(),
  approved: randomUUID(),
  approvedDrawing: randomUUID(),
  transmittal: randomUUID(),
};

/**
 * A small register on a project for the authorization matrix: an issued drawing sent by
 * transmittal to `contactId`, a draft (drawn by `engineerId`), a draft with its PDF waiting to be
 * checked, and an approved revision ready to issue. Written straight to the database and the store.
 */
export async function seedRegisterForMatrix(
  db: Knex,
  store: ObjectStore,
  ids: { firmId: string; projectId: string; engineerId: string; principalId: string; contactId: string },
): Promise<void> {
  const I = REGISTER_IDS;
  const pdf = tinyPdf('Matrix drawing');
  const drawing = (id: string, number: string) => ({
    id,
    firm_id: ids.firmId,
    project_id: ids.projectId,
    number,
    title: `Matrix ${number}`,
    stage_key: 'column_layout',
    sheet_size: 'A1',
    scale: '1:100',
    created_by: ids.engineerId,
  });
  await db('drawings').insert([
    drawing(I.drawing, 'MX-001'),
    drawing(I.draftDrawing, 'MX-002'),
    drawing(I.toCheckDrawing, 'MX-003'),
    drawing(I.approvedDrawing, 'MX-004'),
  ]);
  const revision = (id: string, drawingId: string, state: string) => ({
    id,
    drawing_id: drawingId,
    project_id: ids.projectId,
    seq: 1,
    series: 'preliminary',
    code: 'P01',
    suitability: 'S2',
    purpose: 'information',
    revision_date: '2026-12-01',
    state,
    drawn_by: ids.engineerId,
    checked_by: state === 'approved' ? ids.principalId : null,
    approved_by: state === 'approved' ? ids.principalId : null,
  });
  await db('drawing_revisions').insert([
    revision(I.issued, I.drawing, 'draft'),
    revision(I.draft, I.draftDrawing, 'draft'),
    revision(I.toCheck, I.toCheckDrawing, 'draft'),
    revision(I.approved, I.approvedDrawing, 'approved'),
  ]);
  const file = async (id: string, revisionId: string) => {
    const key = `drawings/${ids.projectId}/${revisionId}/${id}`;
    await store.putStream(key, Readable.from([pdf]), { contentType: 'application/pdf' });
    return {
      id,
      revision_id: revisionId,
      project_id: ids.projectId,
      role: 'pdf',
      file_name: 'Matrix.pdf',
      object_key: key,
      size_bytes: pdf.length,
      sha256: createHash('sha256').update(pdf).digest('hex'),
      content_type: 'application/pdf',
      uploaded_by: ids.engineerId,
    };
  };
  await db('revision_files').insert([
    await file(I.issuedFile, I.issued),
    await file(randomUUID(), I.toCheck),
    await file(randomUUID(), I.approved),
  ]);
  // Files first: the database refuses files for a revision once it has been issued.
  await db('drawing_revisions').where({ id: I.issued }).update({ state: 'issued', issued_at: new Date() });
  const sheetKey = `transmittals/${ids.projectId}/${I.transmittal}/sheet`;
  await store.putStream(sheetKey, Readable.from([pdf]), { contentType: 'application/pdf' });
  await db('transmittals').insert({
    id: I.transmittal,
    firm_id: ids.firmId,
    project_id: ids.projectId,
    number: 900,
    purpose: 'information',
    issued_by: ids.principalId,
    links_expire_at: new Date(Date.now() + 86_400_000),
    sheet_object_key: sheetKey,
    sheet_size_bytes: pdf.length,
  });
  await db('transmittal_items').insert({ transmittal_id: I.transmittal, revision_id: I.issued, position: 1 });
  await db('transmittal_recipients').insert({
    transmittal_id: I.transmittal,
    user_id: ids.contactId,
    email: 'matrix.contact@fenwickrow.example',
  });
}
