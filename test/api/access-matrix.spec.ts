import { randomUUID } from 'node:crypto';
import request from 'supertest';
import type TestAgent from 'supertest/lib/agent';
import { projectDetailSchema, schemeSchema } from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { DEMO_SCHEMES } from '../../seeds/demo-schemes';
import { demoScheme } from '@trabeate/structural';
import { insertNewScheme } from '../../apps/server/src/schemes/schemes.service';
import { hashToken } from '../../apps/server/src/people/people.service';
import { testApp, type TestApp } from '../support/app';
import { startFakeSmtp, startFakeStripe, tinyPdf } from '../support/fakes';
import type { FakeSmtp } from '../../scripts/fakes/smtp';
import { FAKE_STRIPE_KEYS, type FakeStripe } from '../../scripts/fakes/stripe';
import { signIn, xsrfToken } from '../support/identity';
import { REGISTER_IDS as REG, seedRegisterForMatrix } from '../support/drawings';

// Each sign-in runs argon2 at the provider; with two workers a file's set-up takes a few seconds.
jest.setTimeout(30_000);

// The callers every route is tried with. The project under test is Kestrel Yard (Fenwick's):
// Tomas is assigned to it, Priya is not; Odile is Fenwick's contact on it; Rafe is another client's.
const CALLERS = {
  anonymous: null,
  principal: DEMO.users.principal,
  assignedEngineer: DEMO.users.engineerA,
  unassignedEngineer: DEMO.users.engineerB,
  projectClient: DEMO.users.fenwickContact,
  otherClient: DEMO.users.harbourlightContact,
} as const;
type CallerName = keyof typeof CALLERS;
type Expected = Record<CallerName, number>;

const all = (status: number): Expected => ({
  anonymous: status,
  principal: status,
  assignedEngineer: status,
  unassignedEngineer: status,
  projectClient: status,
  otherClient: status,
});
const principalOnly = (ok: number): Expected => ({
  anonymous: 401,
  principal: ok,
  assignedEngineer: 403,
  unassignedEngineer: 403,
  projectClient: 403,
  otherClient: 403,
});
const signedIn = (ok: number): Expected => ({ ...all(ok), anonymous: 401 });

const KESTREL = DEMO.projects.kestrel.id;
// People the mutating rows act on, so no row changes what another row sees.
const SPARE = { patch: randomUUID(), remove: randomUUID(), member: randomUUID() };
const INVITE_TOKEN = 'matrix-invitation-token-0123456789abcdef';
// A second project of Fenwick's with the same team, for the rows that change a project's state.
const SPARE_PROJECT = randomUUID();
const SPARE_FILE = randomUUID();
// Invoices on Kestrel Yard for the fee rows: one issued (with its PDF), one to void, two drafts.
const INV = { issued: randomUUID(), toVoid: randomUUID(), draft: randomUUID(), toIssue: randomUUID() };
const SHARES = {
  design_basis: 1000,
  column_layout: 2000,
  beam_framing: 2500,
  slab_panels: 2000,
  stairs: 500,
  foundations: 2000,
};
const feeAgreementBody = () => ({
  basis: 'lump_sum',
  lumpSumMinor: 1_000_000,
  currency: 'EUR',
  taxRateBp: 2000,
  taxLabel: 'VAT',
  paymentTermsDays: 30,
  billingContactId: DEMO.users.fenwickContact.id,
  stageShares: SHARES,
});
const onInvoice = (id: string, tail = '') => `/projects/${KESTREL}/invoices/${id}${tail}`;
// Schemes of Kestrel Yard that only one row each changes.
const SPARE_SCHEME = {
  rename: randomUUID(),
  archive: randomUUID(),
  restore: randomUUID(),
  save: randomUUID(),
  back: randomUUID(),
};
const SCHEMES = `/projects/${KESTREL}/schemes`;
// A finished report of scheme A, stored, for the report rows.
const MATRIX_REPORT = randomUUID();

interface Entry {
  expect: Expected;
  /** Concrete path (below /api) to request. */
  path: string;
  body?: (caller: CallerName) => object;
  /** Sign the caller in afresh for this row (the request ends the session). */
  freshSession?: boolean;
  /** Sent as a multipart file in the field "file". */
  attach?: (caller: CallerName) => { data: Buffer; name: string };
}

// Schemes: the firm's staff on the project read them, its engineers change them, clients neither.
const schemeRead: Expected = {
  anonymous: 401,
  principal: 200,
  assignedEngineer: 200,
  unassignedEngineer: 404,
  projectClient: 403,
  otherClient: 404,
};
const schemeEdit = (ok: number): Expected => ({ ...schemeRead, principal: 403, assignedEngineer: ok });

// Visible to the principal, the assigned engineer and the project's client; hidden from the others.
const onProject = (principal: number, engineer: number, client: number): Expected => ({
  anonymous: 401,
  principal,
  assignedEngineer: engineer,
  unassignedEngineer: 404,
  projectClient: client,
  otherClient: 404,
});

/** Every API route, keyed "METHOD /path" exactly as declared; a route missing here fails the test. */
const MATRIX: Record<string, Entry> = {
  'GET /health': { path: '/health', expect: all(200) },
  'GET /auth/login': { path: '/auth/login?returnTo=/projects', expect: all(302) },
  // No sign-in is in progress for these callers, so every callback is refused the same way.
  'GET /auth/callback': { path: '/auth/callback?code=x&state=y', expect: all(400) },
  'POST /auth/logout': { path: '/auth/logout', expect: all(200), freshSession: true },
  'GET /me': { path: '/me', expect: signedIn(200) },
  'GET /people': { path: '/people', expect: principalOnly(200) },
  'GET /client-organisations': { path: '/client-organisations', expect: principalOnly(200) },
  'POST /invitations': {
    path: '/invitations',
    body: (c) => ({
      email: `matrix-${c}@sablequay.example`,
      displayName: `Matrix ${c}`,
      role: 'engineer',
      projectIds: [],
    }),
    expect: principalOnly(201),
  },
  'GET /invitations/:token': { path: `/invitations/${INVITE_TOKEN}`, expect: all(200) },
  'PATCH /people/:id': {
    path: `/people/${SPARE.patch}`,
    body: () => ({ displayName: 'Renamed' }),
    expect: principalOnly(200),
  },
  'DELETE /people/:id/access': { path: `/people/${SPARE.remove}/access`, expect: principalOnly(204) },
  'GET /projects': { path: '/projects', expect: signedIn(200) },
  'POST /projects': {
    path: '/projects',
    body: (c) => ({
      reference: `MX-${c}`,
      name: `Matrix ${c}`,
      clientOrganisationId: DEMO.clients.fenwick.id,
      storeys: 3,
      storeyHeightM: 3,
      currency: 'EUR',
      designBasis: {
        codeFamily: 'EN1992',
        concreteMPa: 30,
        steelMPa: 500,
        imposedKPa: 2,
        superimposedDeadKPa: 1,
        bearingPressureKPa: 150,
        foundingDepthM: 1,
      },
    }),
    expect: principalOnly(201),
  },
  'GET /projects/:projectId/full': { path: `/projects/${KESTREL}/full`, expect: onProject(200, 200, 200) },
  'PATCH /projects/:projectId': {
    path: `/projects/${SPARE_PROJECT}`,
    body: () => ({ siteAddress: '2 Matrix Lane' }),
    expect: onProject(200, 403, 403),
  },
  'POST /projects/:projectId/archive': { path: `/projects/${SPARE_PROJECT}/archive`, expect: onProject(200, 403, 403) },
  'POST /projects/:projectId/restore': { path: `/projects/${SPARE_PROJECT}/restore`, expect: onProject(200, 403, 403) },
  'GET /projects/:projectId/stages': { path: `/projects/${KESTREL}/stages`, expect: onProject(200, 200, 200) },
  'PATCH /projects/:projectId/stages/:stageKey': {
    path: `/projects/${SPARE_PROJECT}/stages/stairs`,
    body: () => ({ dueDate: '2027-03-01' }),
    expect: onProject(200, 403, 403),
  },
  // Only the assigned engineer starts a stage: the principal passes the guard and is refused by the workflow.
  'POST /projects/:projectId/stages/:stageKey/transitions': {
    path: `/projects/${SPARE_PROJECT}/stages/design_basis/transitions`,
    body: () => ({ action: 'start' }),
    expect: onProject(403, 200, 403),
  },
  'GET /projects/:projectId/stages/:stageKey/comments': {
    path: `/projects/${KESTREL}/stages/column_layout/comments`,
    // Review threads are the firm's: the project's client sees stage progress, not the notes.
    expect: onProject(200, 200, 403),
  },
  'GET /projects/:projectId/stages/:stageKey/submissions': {
    path: `/projects/${KESTREL}/stages/column_layout/submissions`,
    // Checks and justifications are the firm's review: the project's client sees stage progress only.
    expect: onProject(200, 200, 403),
  },
  'POST /projects/:projectId/stages/:stageKey/comments': {
    path: `/projects/${SPARE_PROJECT}/stages/column_layout/comments`,
    body: (c) => ({ body: `Note from ${c}` }),
    expect: onProject(201, 201, 403),
  },
  'GET /projects/:projectId/stages/:stageKey/deliverables': {
    path: `/projects/${KESTREL}/stages/beam_framing/deliverables`,
    // Working files are the firm's; files reach clients as issued drawing revisions.
    expect: onProject(200, 200, 403),
  },
  'POST /projects/:projectId/stages/:stageKey/deliverables': {
    path: `/projects/${SPARE_PROJECT}/stages/column_layout/deliverables`,
    attach: (c) => ({ data: tinyPdf(), name: `matrix-${c}.pdf` }),
    expect: onProject(201, 201, 403),
  },
  'GET /projects/:projectId/deliverables/:deliverableId/download': {
    path: `/projects/${KESTREL}/deliverables/${SPARE_FILE}/download`,
    expect: onProject(200, 200, 403),
  },
  'GET /projects/:projectId/activity': { path: `/projects/${KESTREL}/activity`, expect: onProject(200, 200, 200) },
  'GET /dev/outbox': { path: '/dev/outbox', expect: principalOnly(200) },
  'GET /projects/:projectId/fee-agreement': {
    path: `/projects/${KESTREL}/fee-agreement`,
    expect: onProject(200, 403, 403),
  },
  'PUT /projects/:projectId/fee-agreement': {
    path: `/projects/${SPARE_PROJECT}/fee-agreement`,
    body: feeAgreementBody,
    expect: onProject(200, 403, 403),
  },
  'POST /projects/:projectId/fee-variations': {
    path: `/projects/${KESTREL}/fee-variations`,
    body: (c) => ({ amountMinor: 100, reason: `Variation by ${c}`, effectiveOn: '2026-12-01' }),
    expect: onProject(201, 403, 403),
  },
  'GET /invoices': {
    path: '/invoices',
    expect: { ...signedIn(200), assignedEngineer: 403, unassignedEngineer: 403 },
  },
  'GET /receivables': { path: '/receivables', expect: principalOnly(200) },
  'GET /projects/:projectId/invoices': { path: `/projects/${KESTREL}/invoices`, expect: onProject(200, 403, 200) },
  'POST /projects/:projectId/invoices': {
    path: `/projects/${KESTREL}/invoices`,
    body: (c) => ({ lines: [{ kind: 'expense', description: `Copies for ${c}`, netMinor: 500 }] }),
    expect: onProject(201, 403, 403),
  },
  'GET /projects/:projectId/invoices/:invoiceId': { path: onInvoice(INV.issued), expect: onProject(200, 403, 200) },
  'PUT /projects/:projectId/invoices/:invoiceId': {
    path: onInvoice(INV.draft),
    body: () => ({ lines: [{ kind: 'expense', description: 'Copies', netMinor: 700 }] }),
    expect: onProject(200, 403, 403),
  },
  'POST /projects/:projectId/invoices/:invoiceId/issue': {
    path: onInvoice(INV.toIssue, '/issue'),
    expect: onProject(200, 403, 403),
  },
  'POST /projects/:projectId/invoices/:invoiceId/void': {
    path: onInvoice(INV.toVoid, '/void'),
    body: () => ({ reason: 'Raised in error' }),
    expect: onProject(200, 403, 403),
  },
  'POST /projects/:projectId/invoices/:invoiceId/credit-notes': {
    path: onInvoice(INV.issued, '/credit-notes'),
    body: () => ({ reason: 'Small correction', lines: [{ description: 'Correction', netMinor: 100 }] }),
    expect: onProject(201, 403, 403),
  },
  'POST /projects/:projectId/invoices/:invoiceId/payments': {
    path: onInvoice(INV.issued, '/payments'),
    body: () => ({ amountMinor: 100, receivedOn: '2026-12-01', reference: 'BT-MATRIX' }),
    expect: onProject(201, 403, 403),
  },
  'PUT /projects/:projectId/invoices/:invoiceId/reminders': {
    path: onInvoice(INV.issued, '/reminders'),
    body: () => ({ enabled: false }),
    expect: onProject(200, 403, 403),
  },
  // Only the project's client pays; the principal and engineers are refused with the reason.
  'POST /projects/:projectId/invoices/:invoiceId/checkout': {
    path: onInvoice(INV.issued, '/checkout'),
    expect: onProject(403, 403, 201),
  },
  // Past the guard, a session this invoice never started is 404 for both who may ask.
  'POST /projects/:projectId/invoices/:invoiceId/checkout/:sessionId/reconcile': {
    path: onInvoice(INV.issued, '/checkout/cs_matrix_unknown/reconcile'),
    expect: onProject(404, 403, 404),
  },
  // Public (Stripe has no session): everyone gets past the guard and is refused for the missing signature.
  'POST /webhooks/stripe': { path: '/webhooks/stripe', body: () => ({ id: 'evt_matrix' }), expect: all(400) },
  'GET /projects/:projectId/invoices/:invoiceId/pdf': {
    path: onInvoice(INV.issued, '/pdf'),
    expect: onProject(200, 403, 200),
  },
  'GET /projects/:projectId/schemes': { path: SCHEMES, expect: schemeRead },
  'POST /projects/:projectId/schemes': {
    path: SCHEMES,
    body: (c) => ({ name: `Matrix ${c}` }),
    expect: schemeEdit(201),
  },
  'GET /projects/:projectId/schemes/:schemeId': { path: `${SCHEMES}/${DEMO_SCHEMES.full.id}`, expect: schemeRead },
  'PATCH /projects/:projectId/schemes/:schemeId': {
    path: `${SCHEMES}/${SPARE_SCHEME.rename}`,
    body: (c) => ({ name: `Renamed by ${c}` }),
    expect: schemeEdit(200),
  },
  'POST /projects/:projectId/schemes/:schemeId/duplicate': {
    path: `${SCHEMES}/${DEMO_SCHEMES.full.id}/duplicate`,
    body: () => ({}),
    expect: schemeEdit(201),
  },
  'POST /projects/:projectId/schemes/:schemeId/archive': {
    path: `${SCHEMES}/${SPARE_SCHEME.archive}/archive`,
    expect: schemeEdit(200),
  },
  'POST /projects/:projectId/schemes/:schemeId/restore': {
    path: `${SCHEMES}/${SPARE_SCHEME.restore}/restore`,
    expect: schemeEdit(200),
  },
  'PUT /projects/:projectId/schemes/:schemeId/document': {
    path: `${SCHEMES}/${SPARE_SCHEME.save}/document`,
    body: () => ({ baseVersion: 1, document: demoScheme() }),
    expect: schemeEdit(200),
  },
  'GET /projects/:projectId/schemes/:schemeId/versions': {
    path: `${SCHEMES}/${DEMO_SCHEMES.full.id}/versions`,
    expect: schemeRead,
  },
  'GET /projects/:projectId/schemes/:schemeId/versions/:version': {
    path: `${SCHEMES}/${DEMO_SCHEMES.full.id}/versions/1`,
    expect: schemeRead,
  },
  'POST /projects/:projectId/schemes/:schemeId/versions/:version/restore': {
    path: `${SCHEMES}/${SPARE_SCHEME.back}/versions/1/restore`,
    expect: schemeEdit(201),
  },
  'POST /projects/:projectId/schemes/:schemeId/versions/:version/reports': {
    path: `${SCHEMES}/${DEMO_SCHEMES.full.id}/versions/1/reports`,
    body: () => ({}),
    expect: { ...schemeRead, principal: 202, assignedEngineer: 202 },
  },
  'GET /projects/:projectId/scheme-reports/:reportId': {
    path: `/projects/${KESTREL}/scheme-reports/${MATRIX_REPORT}`,
    expect: schemeRead,
  },
  'GET /projects/:projectId/scheme-reports/:reportId/file': {
    path: `/projects/${KESTREL}/scheme-reports/${MATRIX_REPORT}/file`,
    expect: schemeRead,
  },
  'GET /projects/:projectId/schemes/:schemeId/versions/:version/sheet.svg': {
    path: `${SCHEMES}/${DEMO_SCHEMES.full.id}/versions/1/sheet.svg?size=A3&scale=200`,
    expect: schemeRead,
  },
  'GET /projects/:projectId/schemes/:schemeId/versions/:version/sheet.pdf': {
    path: `${SCHEMES}/${DEMO_SCHEMES.full.id}/versions/1/sheet.pdf?size=A3&scale=200`,
    expect: schemeRead,
  },
  // Each caller that may, registers the sheet on a new drawing of its own.
  'POST /projects/:projectId/schemes/:schemeId/versions/:version/sheet/revisions': {
    path: `${SCHEMES}/${DEMO_SCHEMES.full.id}/versions/1/sheet/revisions`,
    body: (c) => ({ size: 'A3', scale: 200, newDrawing: { title: `Matrix sheet ${c}`, stageKey: 'column_layout' } }),
    expect: { ...schemeRead, principal: 201, assignedEngineer: 201 },
  },
  'GET /projects/:projectId': {
    path: `/projects/${KESTREL}`,
    expect: {
      anonymous: 401,
      principal: 200,
      assignedEngineer: 200,
      unassignedEngineer: 404,
      projectClient: 200,
      otherClient: 404,
    },
  },
  'PUT /projects/:projectId/members/:userId': {
    path: `/projects/${KESTREL}/members/${SPARE.member}`,
    expect: {
      anonymous: 401,
      principal: 204,
      assignedEngineer: 403,
      unassignedEngineer: 404,
      projectClient: 403,
      otherClient: 404,
    },
  },
  'DELETE /projects/:projectId/members/:userId': {
    path: `/projects/${KESTREL}/members/${SPARE.member}`,
    expect: {
      anonymous: 401,
      principal: 204,
      assignedEngineer: 403,
      unassignedEngineer: 404,
      projectClient: 403,
      otherClient: 404,
    },
  },
  // The drawing register (rows made by seedRegisterForMatrix on Kestrel Yard).
  'GET /drawing-settings': {
    path: '/drawing-settings',
    expect: { ...signedIn(200), projectClient: 403, otherClient: 403 },
  },
  // The firm's date language: the principal's own page; everyone else reads it in GET /me.
  'GET /firm-settings': { path: '/firm-settings', expect: principalOnly(200) },
  'PUT /firm-settings': {
    path: '/firm-settings',
    body: () => ({ dateLocale: 'en-GB', timeZone: 'Europe/London' }),
    expect: principalOnly(200),
  },
  'PUT /drawing-settings': {
    path: '/drawing-settings',
    body: () => ({ revisionScheme: 'iso19650', numberPattern: 'S-{seq:3}' }),
    expect: principalOnly(200),
  },
  'GET /projects/:projectId/drawings': { path: `/projects/${KESTREL}/drawings`, expect: onProject(200, 200, 200) },
  'POST /projects/:projectId/drawings': {
    path: `/projects/${KESTREL}/drawings`,
    body: (c) => ({ number: `MX-${c}`, title: 'Matrix', stageKey: 'stairs', sheetSize: 'A3', scale: '1:50' }),
    expect: onProject(201, 201, 403),
  },
  'GET /projects/:projectId/drawings/next-number': {
    path: `/projects/${KESTREL}/drawings/next-number`,
    expect: onProject(200, 200, 403),
  },
  'GET /projects/:projectId/drawings/export.csv': {
    path: `/projects/${KESTREL}/drawings/export.csv`,
    expect: onProject(200, 200, 403),
  },
  'GET /projects/:projectId/drawings/export.pdf': {
    path: `/projects/${KESTREL}/drawings/export.pdf`,
    expect: onProject(200, 200, 403),
  },
  'GET /projects/:projectId/drawings/:drawingId': {
    path: `/projects/${KESTREL}/drawings/${REG.drawing}`,
    expect: onProject(200, 200, 200),
  },
  'GET /projects/:projectId/drawings/:drawingId/next-revision': {
    path: `/projects/${KESTREL}/drawings/${REG.drawing}/next-revision`,
    expect: onProject(200, 200, 403),
  },
  // The principal's new draft is still open when the engineer tries: the guard let both through.
  'POST /projects/:projectId/drawings/:drawingId/revisions': {
    path: `/projects/${KESTREL}/drawings/${REG.drawing}/revisions`,
    body: () => ({ suitability: 'S3', purpose: 'comment', date: '2026-12-02' }),
    expect: onProject(201, 409, 403),
  },
  'PATCH /projects/:projectId/revisions/:revisionId': {
    path: `/projects/${KESTREL}/revisions/${REG.draft}`,
    body: (c) => ({ description: `Edited by ${c}` }),
    expect: onProject(200, 200, 403),
  },
  // The principal checks it; the engineer drew it and may not (and it is checked by then).
  'POST /projects/:projectId/revisions/:revisionId/transitions': {
    path: `/projects/${KESTREL}/revisions/${REG.toCheck}/transitions`,
    body: () => ({ action: 'check' }),
    expect: onProject(200, 409, 403),
  },
  'POST /projects/:projectId/revisions/:revisionId/files': {
    path: `/projects/${KESTREL}/revisions/${REG.draft}/files?role=source`,
    attach: (c) => ({ data: tinyPdf(), name: `matrix-${c}.pdf` }),
    expect: onProject(201, 201, 403),
  },
  // Files of an issued revision never change: staff get the 409 that says so, the client 403.
  'PUT /projects/:projectId/revisions/:revisionId/files/:fileId': {
    path: `/projects/${KESTREL}/revisions/${REG.issued}/files/${REG.issuedFile}`,
    attach: (c) => ({ data: tinyPdf(), name: `matrix-replace-${c}.pdf` }),
    expect: onProject(409, 409, 403),
  },
  'DELETE /projects/:projectId/revisions/:revisionId/files/:fileId': {
    path: `/projects/${KESTREL}/revisions/${REG.issued}/files/${REG.issuedFile}`,
    expect: onProject(409, 409, 403),
  },
  'GET /projects/:projectId/revisions/:revisionId/files/:fileId/download': {
    path: `/projects/${KESTREL}/revisions/${REG.issued}/files/${REG.issuedFile}/download`,
    expect: onProject(200, 200, 200),
  },
  'GET /projects/:projectId/transmittals': {
    path: `/projects/${KESTREL}/transmittals`,
    expect: onProject(200, 200, 200),
  },
  'POST /projects/:projectId/transmittals': {
    path: `/projects/${KESTREL}/transmittals`,
    body: () => ({
      purpose: 'information',
      revisionIds: [REG.approved],
      contactIds: [DEMO.users.fenwickContact.id],
    }),
    expect: onProject(201, 403, 403),
  },
  'GET /projects/:projectId/transmittals/:transmittalId': {
    path: `/projects/${KESTREL}/transmittals/${REG.transmittal}`,
    expect: onProject(200, 200, 200),
  },
  'GET /projects/:projectId/transmittals/:transmittalId/sheet': {
    path: `/projects/${KESTREL}/transmittals/${REG.transmittal}/sheet`,
    expect: onProject(200, 200, 200),
  },
  'GET /projects/:projectId/transmittals/:transmittalId/zip': {
    path: `/projects/${KESTREL}/transmittals/${REG.transmittal}/zip`,
    expect: onProject(200, 200, 200),
  },
  'POST /projects/:projectId/transmittals/:transmittalId/acknowledge': {
    path: `/projects/${KESTREL}/transmittals/${REG.transmittal}/acknowledge`,
    expect: onProject(403, 403, 200),
  },
  'GET /projects/:projectId/transmittals/:transmittalId/downloads': {
    path: `/projects/${KESTREL}/transmittals/${REG.transmittal}/downloads`,
    expect: onProject(200, 403, 403),
  },
  // Public, but only with a valid signature: without one every caller gets 403 with the reason.
  'GET /shared/transmittals/:transmittalId/:item': {
    path: `/shared/transmittals/${REG.transmittal}/zip?r=${REG.transmittal}&e=4102444800&s=${'A'.repeat(43)}`,
    expect: all(403),
  },
};

describe('authorization matrix: every API route against every kind of caller', () => {
  let t: TestApp;
  const agents = {} as Record<CallerName, TestAgent>;

  const signedInAgent = async (name: CallerName): Promise<TestAgent> => {
    const api = request.agent(t.app);
    const who = CALLERS[name];
    if (who) {
      const steps = await signIn(api, t.identity!, who.email);
      if (steps.callback?.status !== 302) throw new Error(`${name} could not sign in`);
    }
    return api;
  };

  let smtp: FakeSmtp;
  let stripe: FakeStripe;

  beforeAll(async () => {
    smtp = await startFakeSmtp({ httpPort: 0 });
    stripe = await startFakeStripe();
    t = await testApp({
      seed: true,
      identity: true,
      config: {
        DEV_OUTBOX_URL: `http://127.0.0.1:${smtp.httpPort}`,
        STRIPE_SECRET_KEY: FAKE_STRIPE_KEYS.secretKey,
        STRIPE_WEBHOOK_SECRET: FAKE_STRIPE_KEYS.webhookSecret,
        STRIPE_API_HOST: '127.0.0.1',
        STRIPE_API_PORT: stripe.port,
      },
    });
    await t.db('projects').insert({
      id: SPARE_PROJECT,
      firm_id: DEMO.firm.id,
      reference: 'SQ-MATRIX',
      name: 'Matrix annex',
      client_organisation_id: DEMO.clients.fenwick.id,
      storeys: 2,
    });
    await t.db('stages').insert(
      ['design_basis', 'column_layout', 'beam_framing', 'slab_panels', 'stairs', 'foundations'].map((key, i) => ({
        project_id: SPARE_PROJECT,
        key,
        position: i + 1,
        assignee_id: key === 'design_basis' ? DEMO.users.engineerA.id : null,
      })),
    );
    await t.db('project_members').insert([
      { project_id: SPARE_PROJECT, user_id: DEMO.users.engineerA.id },
      { project_id: SPARE_PROJECT, user_id: DEMO.users.fenwickContact.id },
    ]);
    const { Readable } = await import('node:stream');
    const pdf = tinyPdf();
    await t.store.putStream(`matrix/${SPARE_FILE}.pdf`, Readable.from([pdf]), { contentType: 'application/pdf' });
    await t.db('deliverables').insert({
      id: SPARE_FILE,
      project_id: KESTREL,
      stage_key: 'beam_framing',
      file_name: 'Beam schedule.pdf',
      version: 1,
      object_key: `matrix/${SPARE_FILE}.pdf`,
      size_bytes: pdf.length,
      sha256: '0'.repeat(64),
      content_type: 'application/pdf',
      detected_type: 'pdf',
      uploaded_by: DEMO.users.engineerA.id,
    });
    await t.db('fee_agreements').insert({
      project_id: KESTREL,
      firm_id: DEMO.firm.id,
      basis: 'lump_sum',
      lump_sum_minor: 1_000_000,
      currency: 'EUR',
      tax_rate_bp: 2000,
      tax_label: 'VAT',
      payment_terms_days: 30,
      billing_contact_id: DEMO.users.fenwickContact.id,
      stage_shares: JSON.stringify(SHARES),
    });
    const invoice = (id: string, seq: number | null) => ({
      id,
      firm_id: DEMO.firm.id,
      project_id: KESTREL,
      state: seq ? 'issued' : 'draft',
      ...(seq
        ? {
            series: 'invoice',
            year: 1999,
            seq,
            number: `INV-1999-${seq}`,
            issued_on: '1999-01-01',
            due_on: '1999-02-01',
          }
        : {}),
      currency: 'EUR',
      tax_label: 'VAT',
      subtotal_minor: 100_000,
      total_minor: 100_000,
      pdf_object_key: seq ? `invoices/${id}.pdf` : null,
    });
    await t
      .db('invoices')
      .insert([invoice(INV.issued, 1), invoice(INV.toVoid, 2), invoice(INV.draft, null), invoice(INV.toIssue, null)]);
    await t.db('invoice_lines').insert(
      Object.values(INV).map((id) => ({
        invoice_id: id,
        position: 1,
        kind: 'expense',
        description: 'Copies',
        net_minor: 100_000,
        tax_rate_bp: 0,
        tax_minor: 0,
      })),
    );
    await t.store.putStream(`invoices/${INV.issued}.pdf`, Readable.from([pdf]), { contentType: 'application/pdf' });
    await t.db('users').insert([
      {
        id: SPARE.patch,
        firm_id: DEMO.firm.id,
        email: 'spare.patch@sablequay.example',
        display_name: 'Spare One',
        firm_role: 'engineer',
      },
      {
        id: SPARE.remove,
        firm_id: DEMO.firm.id,
        email: 'spare.remove@sablequay.example',
        display_name: 'Spare Two',
        firm_role: 'engineer',
      },
      {
        id: SPARE.member,
        firm_id: DEMO.firm.id,
        email: 'spare.member@sablequay.example',
        display_name: 'Spare Three',
        firm_role: 'engineer',
      },
    ]);
    await t.db('invitations').insert({
      firm_id: DEMO.firm.id,
      user_id: SPARE.patch,
      token_hash: hashToken(INVITE_TOKEN),
      expires_at: new Date(Date.now() + 86_400_000),
    });
    for (const id of Object.values(SPARE_SCHEME)) {
      await t.db.transaction((trx) =>
        insertNewScheme(trx, {
          id,
          firmId: DEMO.firm.id,
          projectId: KESTREL,
          name: `Matrix scheme ${id.slice(0, 8)}`,
          authorId: DEMO.users.engineerA.id,
          document: () => schemeSchema.parse(demoScheme()),
        }),
      );
    }
    const reportPdf = tinyPdf('Matrix report');
    await t.store.putStream(`reports/${KESTREL}/${MATRIX_REPORT}`, Readable.from([reportPdf]), {
      contentType: 'application/pdf',
    });
    await t.db('scheme_reports').insert({
      id: MATRIX_REPORT,
      firm_id: DEMO.firm.id,
      project_id: KESTREL,
      scheme_id: DEMO_SCHEMES.full.id,
      scheme_version: 1,
      state: 'done',
      sections_done: 8,
      sections_total: 8,
      object_key: `reports/${KESTREL}/${MATRIX_REPORT}`,
      size_bytes: reportPdf.length,
      pages: 1,
      requested_by: DEMO.users.engineerA.id,
      finished_at: new Date(),
    });
    await seedRegisterForMatrix(t.db, t.store, {
      firmId: DEMO.firm.id,
      projectId: KESTREL,
      engineerId: DEMO.users.engineerA.id,
      principalId: DEMO.users.principal.id,
      contactId: DEMO.users.fenwickContact.id,
    });
    for (const name of Object.keys(CALLERS) as CallerName[]) agents[name] = await signedInAgent(name);
  });
  afterAll(async () => {
    await t.close();
    await smtp.stop();
    await stripe.stop();
  });

  it('has an entry for every declared route, and no entry for a route that does not exist', () => {
    const declared = (t.app.locals['routes'] as Array<{ method: string; path: string }>).map(
      (r) => `${r.method.toUpperCase()} ${r.path}`,
    );
    expect(declared.sort()).toEqual(Object.keys(MATRIX).sort());
  });

  const rows = Object.entries(MATRIX).flatMap(([key, entry]) =>
    (Object.keys(CALLERS) as CallerName[]).map((caller) => [key, caller, entry.expect[caller], entry] as const),
  );

  it.each(rows)('%s as %s answers %i', async (key, caller, status, entry) => {
    const method = key.split(' ')[0].toLowerCase() as 'get' | 'post' | 'put' | 'patch' | 'delete';
    const api = entry.freshSession ? await signedInAgent(caller) : agents[caller];
    let req = api[method](`/api${entry.path}`);
    if (method !== 'get' && caller !== 'anonymous') {
      await api.get('/api/me'); // as the client would have: it receives the XSRF-TOKEN cookie
      req = req.set('X-XSRF-TOKEN', xsrfToken(api));
    }
    if (entry.attach) {
      const file = entry.attach(caller);
      req = req.attach('file', file.data, { filename: file.name, contentType: 'application/pdf' });
    }
    const res = await (entry.body ? req.send(entry.body(caller)) : req);
    expect({ status: res.status, body: res.status >= 400 ? res.body : undefined }).toEqual(
      expect.objectContaining({ status }),
    );
    if (status === 403) expect(res.body.error.message).toEqual(expect.any(String));
  });
});

describe('what each caller sees', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await testApp({ seed: true, identity: true });
  });
  afterAll(() => t.close());

  const as = async (user: { email: string }) => {
    const api = request.agent(t.app);
    await signIn(api, t.identity!, user.email);
    return api;
  };

  it('lists only the projects each caller may see', async () => {
    const ids = async (user: { email: string }) =>
      ((await (await as(user)).get('/api/projects')).body.items as Array<{ id: string }>).map((p) => p.id).sort();
    expect(await ids(DEMO.users.principal)).toEqual([DEMO.projects.kestrel.id, DEMO.projects.alder.id].sort());
    expect(await ids(DEMO.users.engineerA)).toEqual([DEMO.projects.kestrel.id]);
    expect(await ids(DEMO.users.engineerB)).toEqual([DEMO.projects.alder.id]);
    expect(await ids(DEMO.users.fenwickContact)).toEqual([DEMO.projects.kestrel.id]);
    expect(await ids(DEMO.users.harbourlightContact)).toEqual([DEMO.projects.alder.id]);
  });

  it('answers a hidden project exactly as a project that does not exist, so its existence does not leak', async () => {
    const api = await as(DEMO.users.harbourlightContact);
    const hidden = await api.get(`/api/projects/${DEMO.projects.kestrel.id}`);
    const missing = await api.get(`/api/projects/${randomUUID()}`);
    const garbage = await api.get('/api/projects/not-a-uuid');
    for (const res of [hidden, missing, garbage]) {
      expect(res.status).toBe(404);
      expect(res.body.error).toMatchObject({ code: 'not_found', message: 'No project with this id.' });
    }
  });

  it('gives engineers nothing financial, and the principal and the client the estimated cost', async () => {
    const detail = async (user: { email: string }) =>
      projectDetailSchema.parse((await (await as(user)).get(`/api/projects/${DEMO.projects.kestrel.id}`)).body);
    const engineer = await detail(DEMO.users.engineerA);
    expect(engineer.finance).toBeNull();
    expect(engineer.abilities).toEqual({
      work: true,
      manage: false,
      seeFinance: false,
      seeInternal: true,
      pay: false,
      acknowledge: false,
    });
    expect((await detail(DEMO.users.principal)).finance).toEqual({ estimatedCost: 4_850_000, currency: 'EUR' });
    const client = await detail(DEMO.users.fenwickContact);
    expect(client.finance).toEqual({ estimatedCost: 4_850_000, currency: 'EUR' });
    expect(client.abilities).toEqual({
      work: false,
      manage: false,
      seeFinance: true,
      seeInternal: false,
      pay: true,
      acknowledge: true,
    });
  });

  it('says why when a visible project refuses an action', async () => {
    const api = await as(DEMO.users.fenwickContact);
    await api.get('/api/me');
    const res = await api
      .put(`/api/projects/${DEMO.projects.kestrel.id}/members/${DEMO.users.engineerB.id}`)
      .set('X-XSRF-TOKEN', xsrfToken(api));
    expect(res.status).toBe(403);
    expect(res.body.error).toMatchObject({
      code: 'forbidden',
      message: "Only the firm's principal can manage this project's team and settings.",
    });
  });

  it('refuses a state change without the X-XSRF-TOKEN header, or with one from another session', async () => {
    const principal = await as(DEMO.users.principal);
    const body = { email: 'csrf.probe@sablequay.example', displayName: 'Probe', role: 'engineer' };
    const none = await principal.post('/api/invitations').send(body);
    expect(none.status).toBe(403);
    expect(none.body.error.code).toBe('csrf_failed');
    const other = await as(DEMO.users.engineerA);
    await other.get('/api/me');
    const foreign = await principal.post('/api/invitations').set('X-XSRF-TOKEN', xsrfToken(other)).send(body);
    expect(foreign.status).toBe(403);
    expect(await t.db('users').where({ email: body.email }).first()).toBeUndefined();
  });
});
