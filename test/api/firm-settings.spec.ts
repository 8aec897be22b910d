import type TestAgent from 'supertest/lib/agent';
import { firmDateSettingsSchema, meSchema, transmittalSchema } from '@trabeate/contracts';
import { DEMO } from '../../seeds/demo';
import { testApp, type TestApp } from '../support/app';
import { send, signedInAs } from '../support/agents';
import { startFakeSmtp, tinyPdf } from '../support/fakes';
import type { FakeSmtp } from '../../scripts/fakes/smtp';
import { approvedRevision, binary, pdfText } from '../support/drawings';
import { firmToday } from '../../apps/server/src/firms/firms.repository';

jest.setTimeout(60_000);

const kestrel = DEMO.projects.kestrel.id;
const OUTSIDE = 'site.desk@marlowe-fabrication.example';
const MONTHS = ['Jan', 'Feb', 'Mar', 'Apr', 'May', 'Jun', 'Jul', 'Aug', 'Sep', 'Oct', 'Nov', 'Dec'];

/**
 * An instant as India Standard Time, worked out by hand rather than through Intl: IST is UTC+5:30
 * all year, with no daylight saving (IANA tz database, zone Asia/Kolkata). Written the way the
 * app's one format writes it: "2 Dec 2026, 01:30".
 */
function inIndia(at: Date): string {
  const ist = new Date(at.getTime() + 330 * 60_000);
  const p = (n: number) => String(n).padStart(2, '0');
  return `${ist.getUTCDate()} ${MONTHS[ist.getUTCMonth()]} ${ist.getUTCFullYear()}, ${p(ist.getUTCHours())}:${p(ist.getUTCMinutes())}`;
}

describe("the firm's date locale and time zone", () => {
  let t: TestApp;
  let smtp: FakeSmtp;
  let principal: TestAgent;
  let tomas: TestAgent;
  let priya: TestAgent;

  beforeAll(async () => {
    smtp = await startFakeSmtp({ httpPort: null });
    t = await testApp({ seed: true, identity: true, mail: { smtpPort: smtp.port } });
    await t
      .db('project_members')
      .insert({ project_id: kestrel, user_id: DEMO.users.engineerB.id })
      .onConflict(['project_id', 'user_id'])
      .ignore();
    principal = await signedInAs(t, DEMO.users.principal.email);
    tomas = await signedInAs(t, DEMO.users.engineerA.email);
    priya = await signedInAs(t, DEMO.users.engineerB.email);
  });
  afterAll(async () => {
    await t.close();
    await smtp.stop();
  });

  it('starts as en-GB in Europe/London, and every signed-in person gets it with GET /api/me', async () => {
    const res = await principal.get('/api/firm-settings');
    expect(res.status).toBe(200);
    expect(firmDateSettingsSchema.parse(res.body)).toEqual({ dateLocale: 'en-GB', timeZone: 'Europe/London' });
    const me = meSchema.parse((await tomas.get('/api/me')).body);
    expect(me.access === 'granted' && me.firm).toMatchObject({ dateLocale: 'en-GB', timeZone: 'Europe/London' });
  });

  it('refuses a locale Intl does not know and a zone that is not an IANA zone, naming each field, and keeps the old values', async () => {
    const res = await send(principal, 'put', '/api/firm-settings', { dateLocale: 'en_GB', timeZone: 'Mars/Olympus' });
    expect(res.status).toBe(400);
    expect(Object.keys(res.body.error.fields ?? {}).sort()).toEqual(['body.dateLocale', 'body.timeZone']);
    const row = await t.db('firms').where({ id: DEMO.firm.id }).first('date_locale', 'time_zone');
    expect(row).toEqual({ date_locale: 'en-GB', time_zone: 'Europe/London' });
    expect((await send(tomas, 'put', '/api/firm-settings', { dateLocale: 'en-IN', timeZone: 'UTC' })).status).toBe(403);
  });

  it('stores a new locale and zone in canonical form and hands them to everyone through GET /api/me', async () => {
    const res = await send(principal, 'put', '/api/firm-settings', { dateLocale: 'en-in', timeZone: 'Asia/Kolkata' });
    expect(res.status).toBe(200);
    expect(res.body).toEqual({ dateLocale: 'en-IN', timeZone: 'Asia/Kolkata' });
    const me = meSchema.parse((await priya.get('/api/me')).body);
    expect(me.access === 'granted' && me.firm).toMatchObject({ dateLocale: 'en-IN', timeZone: 'Asia/Kolkata' });
  });

  it('a firm in Asia/Kolkata reads the issue time on the transmittal sheet and the link expiry in the notice mail in India time', async () => {
    const a = await approvedRevision({ drawer: tomas, checker: priya, principal }, kestrel, 'S-301', tinyPdf('S-301'));
    const res = await send(principal, 'post', `/api/projects/${kestrel}/transmittals`, {
      purpose: 'information',
      revisionIds: [a.revision.id],
      contactIds: [],
      externalEmails: [OUTSIDE],
    });
    expect(res.status).toBe(201);
    const issued = transmittalSchema.parse(res.body);
    const row = await t.db('transmittals').where({ id: issued.id }).first('issued_at', 'links_expire_at');

    const sheet = await principal.get(issued.sheetUrl).buffer(true).parse(binary);
    const text = await pdfText(sheet.body as Buffer);
    // en-IN names India Standard Time "IST" (CLDR); the time itself is checked by hand above.
    expect(text).toContain(`${inIndia(row.issued_at)} IST`);
    expect(text).not.toMatch(/\d\d:\d\d (UTC|GMT)/);

    const mail = await smtp.waitFor((m) => m.to.includes(OUTSIDE));
    expect(mail.text).toContain(`work until ${inIndia(row.links_expire_at)} IST.`);
  });

  it('writes the drawing register export in the firm locale', async () => {
    await send(principal, 'put', '/api/firm-settings', { dateLocale: 'de-DE', timeZone: 'Europe/Berlin' });
    const res = await tomas.get(`/api/projects/${kestrel}/drawings/export.csv?q=S-301`);
    expect(res.status).toBe(200);
    const line = res.text.split('\r\n').find((l) => l.startsWith('"S-301"'))!;
    // German short month names as CLDR writes them (from memory): "Dez.", "Jan.", "März", "Mai" …
    const day = String.raw`\d{1,2}\. (Jan\.|Feb\.|März|Apr\.|Mai|Juni|Juli|Aug\.|Sept\.|Okt\.|Nov\.|Dez\.) \d{4}`;
    expect(line).toMatch(new RegExp(`"${day}","P01 S2 ${day} [^"]+\\(for information\\)"$`));
    await send(principal, 'put', '/api/firm-settings', { dateLocale: 'en-GB', timeZone: 'Europe/London' });
  });

  it('every zone the settings accept is one PostgreSQL can date in (firmToday asks it)', async () => {
    const zones = [...Intl.supportedValuesOf('timeZone'), 'UTC', 'Asia/Kolkata'];
    const refused: string[] = [];
    for (const zone of zones) {
      await t.db.raw(`select (now() at time zone ?)::date`, [zone]).catch(() => refused.push(zone));
    }
    expect(refused).toEqual([]);
  });

  it('dates an invoice or payment made now with the day where the firm is, not the day in UTC', async () => {
    // IANA tz database: Pacific/Kiritimati is UTC+14 and Pacific/Pago_Pago UTC-11, neither with
    // daylight saving, so at any moment their dates differ, and each is UTC's date moved by its offset.
    const dayAt = (hours: number) => new Date(Date.now() + hours * 3_600_000).toISOString().slice(0, 10);
    const todayIn = async (zone: string, hours: number) => {
      await t.db('firms').where({ id: DEMO.firm.id }).update({ time_zone: zone });
      const before = dayAt(hours);
      const got = await firmToday(t.db, DEMO.firm.id);
      expect([before, dayAt(hours)]).toContain(got);
      return got;
    };
    const east = await todayIn('Pacific/Kiritimati', 14);
    const west = await todayIn('Pacific/Pago_Pago', -11);
    expect(east).not.toBe(west);
    await t.db('firms').where({ id: DEMO.firm.id }).update({ time_zone: 'Europe/London' });
  });
});
