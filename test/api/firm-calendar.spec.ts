import type TestAgent from 'supertest/lib/agent';
import { invoiceListSchema, projectListSchema, stageSchema } from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { testApp, type TestApp } from '../support/app';
import { signedInAs } from '../support/agents';

jest.setTimeout(30_000);

// "Late" and "overdue" turn at midnight in the firm's time zone (its date settings), not at the
// database server's. Two zones far from UTC on either side: at any hour of a UTC day, the date in
// at least one of them differs from the UTC date, so a rule that read the server's date fails here.
const ZONES = ['Pacific/Pago_Pago', 'Pacific/Kiritimati']; // UTC−11 and UTC+14 (IANA tz database)

describe("late stages and overdue invoices follow the firm's calendar", () => {
  let t: TestApp;
  let principal: TestAgent;
  const firmId = DEMO.firm.id;
  const projectId = DEMO.projects.kestrel.id;

  beforeAll(async () => {
    t = await testApp({ seed: true, seedFees: true, identity: true });
    principal = await signedInAs(t, DEMO.users.principal.email);
  });
  afterAll(() => t.close());

  /** The firm's date today and yesterday, where it is, as PostgreSQL's time zone rules give them. */
  async function firmDays(zone: string): Promise<{ today: string; yesterday: string }> {
    const { rows } = await t.db.raw(
      `select to_char((now() at time zone ?)::date, 'YYYY-MM-DD') as today,
              to_char((now() at time zone ?)::date - 1, 'YYYY-MM-DD') as yesterday`,
      [zone, zone],
    );
    return rows[0];
  }

  it.each(ZONES)('a stage is late from the day after its due date where the firm is (%s)', async (zone) => {
    await t.db('firms').where({ id: firmId }).update({ time_zone: zone });
    const { today, yesterday } = await firmDays(zone);
    const key = 'stairs';
    const lateness = async (due: string) => {
      await t.db('stages').where({ project_id: projectId, key }).update({ due_date: due, state: 'in_progress' });
      const full = (await principal.get(`/api/projects/${projectId}/full`)).body;
      const stage = stageSchema.parse(full.stages.find((s: { key: string }) => s.key === key));
      const list = projectListSchema.parse((await principal.get('/api/projects?pageSize=100')).body);
      return { late: stage.late, lateStages: list.items.find((p) => p.id === projectId)!.lateStages };
    };
    const due = await lateness(today);
    const past = await lateness(yesterday);
    expect(due.late).toBe(false);
    expect(past.late).toBe(true);
    // the projects list counts it the same way
    expect(past.lateStages).toBe(due.lateStages + 1);
    await t.db('stages').where({ project_id: projectId, key }).update({ due_date: null, state: 'not_started' });
  });

  it.each(ZONES)(
    'an issued invoice is overdue from the day after its due date where the firm is (%s)',
    async (zone) => {
      await t.db('firms').where({ id: firmId }).update({ time_zone: zone });
      const { today, yesterday } = await firmDays(zone);
      const invoice = await t.db('invoices').where({ firm_id: firmId, state: 'issued' }).first('id');
      expect(invoice).toBeDefined();
      const seen = async (due: string) => {
        await t.db('invoices').where({ id: invoice.id }).update({ due_on: due });
        const all = invoiceListSchema.parse((await principal.get('/api/invoices?pageSize=100')).body);
        const overdue = invoiceListSchema.parse((await principal.get('/api/invoices?state=overdue&pageSize=100')).body);
        return {
          overdue: all.items.find((i) => i.id === invoice.id)!.overdue,
          listed: overdue.items.some((i) => i.id === invoice.id),
        };
      };
      expect(await seen(today)).toEqual({ overdue: false, listed: false });
      expect(await seen(yesterday)).toEqual({ overdue: true, listed: true });
    },
  );
});
