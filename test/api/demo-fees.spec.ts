import { invoiceListSchema, projectListSchema, receivablesSchema } from '@trabeate/contracts';
import { DEMO, seedDemo } from '../../seeds/demo';
import { testApp, type TestApp } from '../support/app';
import { signedInAs } from '../support/agents';
import { storeMissingInvoicePdfs } from '../../apps/server/src/invoices/invoices.service';

// pdf-parse 1.1.1's index runs a debug self-test when required directly; its library file does not.
// eslint-disable-next-line @typescript-eslint/no-require-imports
const pdfParse = require('pdf-parse/lib/pdf-parse.js') as (b: Buffer) => Promise<{ text: string }>;

jest.setTimeout(60_000);

describe('the demo fees', () => {
  let t: TestApp;
  beforeAll(async () => {
    t = await testApp({ seed: true, seedFees: true, identity: true });
  });
  afterAll(() => t.close());

  it('shows invoices in every state the Fees page knows, with what Harbourlight owes by age', async () => {
    const principal = await signedInAs(t, DEMO.users.principal.email);
    const list = invoiceListSchema.parse((await principal.get('/api/invoices?sort=number&direction=asc')).body);
    const states = list.items.map((i) => (i.overdue ? `${i.state} (overdue)` : i.state)).sort();
    expect(states).toEqual(['draft', 'issued', 'issued (overdue)', 'paid', 'part_paid (overdue)']);
    // Numbered without gaps from the firm's counter, in order of issue.
    const year = new Date().getUTCFullYear();
    const numbers = list.items.map((i) => i.number).filter(Boolean);
    expect(numbers.length).toBe(4);
    expect(numbers.every((n) => /^INV-\d{4}-\d{4}$/.test(n!))).toBe(true);
    expect(numbers.filter((n) => n!.startsWith(`INV-${year}-`)).length).toBeGreaterThan(0);
    const paid = list.items.find((i) => i.state === 'paid')!;
    expect(paid).toMatchObject({ totalMinor: 288_000, paidMinor: 288_000, dueMinor: 0 });
    const part = list.items.find((i) => i.state === 'part_paid')!;
    expect(part).toMatchObject({ totalMinor: 360_000, paidMinor: 150_000, dueMinor: 210_000 });

    // The Fees page's project picker reads the same list.
    const projects = projectListSchema.parse((await principal.get('/api/projects?pageSize=100&status=active')).body);
    expect(projects.items.map((p) => p.reference)).toContain(DEMO.projects.alder.reference);
    const r = receivablesSchema.parse((await principal.get('/api/receivables')).body);
    expect(r.rows).toHaveLength(1);
    expect(r.rows[0].client.id).toBe(DEMO.clients.harbourlight.id);
    // 216 000 (45 days late) + 210 000 (10 days late) + 51 000 (not yet due), in cents.
    expect(r.rows[0].bands).toEqual({ current: 51_000, d1_30: 210_000, d31_60: 216_000, d61_90: 0, over_90: 0 });
  });

  it("shows Harbourlight's contact their issued invoices and no draft, and nothing to Fenwick's", async () => {
    const rafe = await signedInAs(t, DEMO.users.harbourlightContact.email);
    const mine = invoiceListSchema.parse((await rafe.get('/api/invoices')).body);
    expect(mine.total).toBe(4);
    expect(mine.items.some((i) => i.state === 'draft')).toBe(false);
    const odile = await signedInAs(t, DEMO.users.fenwickContact.email);
    expect(invoiceListSchema.parse((await odile.get('/api/invoices')).body).total).toBe(0);
  });

  it('gives every issued demo invoice its PDF once file storage is up, and the client can open it', async () => {
    const rafe = await signedInAs(t, DEMO.users.harbourlightContact.email);
    const mine = invoiceListSchema.parse((await rafe.get('/api/invoices')).body);
    const first = mine.items[0];
    const pdfUrl = `/api/projects/${first.project.id}/invoices/${first.id}/pdf`;
    // Seeded rows are written straight into the database, so they start without a file.
    expect((await rafe.get(pdfUrl)).status).toBe(404);
    expect(await storeMissingInvoicePdfs(t.db, t.store)).toBe(4);
    expect(await storeMissingInvoicePdfs(t.db, t.store)).toBe(0);
    for (const inv of mine.items) {
      const res = await rafe
        .get(`/api/projects/${inv.project.id}/invoices/${inv.id}/pdf`)
        .buffer(true)
        .parse((r, cb) => {
          const chunks: Buffer[] = [];
          r.on('data', (c: Buffer) => chunks.push(c));
          r.on('end', () => cb(null, Buffer.concat(chunks)));
        });
      expect(res.status).toBe(200);
      const { text } = await pdfParse(res.body as Buffer);
      expect(text).toContain(inv.number!);
    }
  });

  it('changes nothing when the seed runs again', async () => {
    const count = async () => {
      const [{ n }] = await t.db('invoices').count<{ n: string }[]>('* as n');
      const [{ p }] = await t.db('payments').count<{ p: string }[]>('* as p');
      return { n, p };
    };
    const before = await count();
    await seedDemo(t.db);
    expect(await count()).toEqual(before);
  });
});
