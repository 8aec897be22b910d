import { createMailTransport, mailConfigSchema } from '../../apps/server/src/mail';
import { createJobs, MAIL_QUEUE, type Jobs } from '../../apps/server/src/jobs';
import type { Db } from '../../apps/server/src/db/db';
import type { FakeSmtp } from '../../scripts/fakes/smtp';
import { freshDatabase } from '../support/database';
import { startFakeSmtp } from '../support/fakes';

const approved = (recipient: string) => ({
  to: recipient,
  template: 'stage-approved' as const,
  data: {
    firmName: 'Halvorsen & Pike Structures',
    recipientName: 'Tomas Ingle',
    projectName: 'Kestrel Yard',
    stageName: 'Scheme design',
    approvedBy: 'Odile Brask',
    link: 'http://127.0.0.1:4310/projects/42/stages/2',
  },
});

const until = async (what: string, probe: () => Promise<boolean>, ms = 12_000) => {
  const end = Date.now() + ms;
  while (!(await probe())) {
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
};

describe('mail through the pg-boss queue', () => {
  let db: Db;
  let url: string;
  let drop: () => Promise<void>;
  let smtp: FakeSmtp;
  let jobs: Jobs;
  let smtpPort: number;

  beforeAll(async () => {
    ({ db, url, drop } = await freshDatabase());
    smtp = await startFakeSmtp({ httpPort: null });
    smtpPort = smtp.port;
    jobs = createJobs({
      databaseUrl: url,
      transport: createMailTransport(mailConfigSchema.parse({ SMTP_PORT: String(smtpPort) })),
      mailFrom: 'Trabeate <notices@trabeate.invalid>',
      // Short waits for the test; production uses DEFAULT_MAIL_RETRY (minutes, doubling).
      retry: { retryLimit: 5, retryDelay: 1, retryBackoff: false },
      pollingIntervalSeconds: 0.5,
    });
    await jobs.start();
  });
  afterAll(async () => {
    await jobs.stop();
    await smtp.stop();
    await drop();
  });

  it('a queued notice is delivered by the worker', async () => {
    const id = await jobs.enqueueMail(approved('first@example.invalid'));
    const msg = await smtp.waitFor((m) => m.to.includes('first@example.invalid'));
    expect(msg.subject).toBe('Kestrel Yard: Scheme design is approved');
    expect(msg.from).toContain('notices@trabeate.invalid');
    await until('the job to complete', async () => (await jobs.boss.getJobById(MAIL_QUEUE, id))?.state === 'completed');
  });

  it('when the SMTP server is down, the mail waits and is delivered once it is back (pg-boss retries)', async () => {
    await smtp.stop();
    const id = await jobs.enqueueMail(approved('after-outage@example.invalid'));
    // At least one attempt has failed and a retry is scheduled.
    await until('a failed attempt', async () => {
      const job = await jobs.boss.getJobById(MAIL_QUEUE, id);
      return job?.state === 'retry' && job.retryCount >= 1;
    });
    smtp = await startFakeSmtp({ port: smtpPort, httpPort: null });
    const msg = await smtp.waitFor((m) => m.to.includes('after-outage@example.invalid'), 10_000);
    expect(msg.subject).toBe('Kestrel Yard: Scheme design is approved');
    const job = await jobs.boss.getJobById(MAIL_QUEUE, id);
    expect(job?.retryLimit).toBe(5);
    await until('the job to complete', async () => (await jobs.boss.getJobById(MAIL_QUEUE, id))?.state === 'completed');
  });

  it('a mail queued inside a transaction that rolls back is never sent; one that commits is', async () => {
    await expect(
      db.transaction(async (trx) => {
        await jobs.enqueueMail(approved('rolled-back@example.invalid'), { trx });
        throw new Error('the change failed');
      }),
    ).rejects.toThrow('the change failed');

    await db.transaction(async (trx) => {
      await jobs.enqueueMail(approved('committed@example.invalid'), { trx });
    });
    await smtp.waitFor((m) => m.to.includes('committed@example.invalid'));
    // The worker has passed the rolled-back one's place in the queue by now: there is nothing to find.
    const rows = await db.raw(`select count(*)::int as n from pgboss.job where name = ? and data->'to' @> ?::jsonb`, [
      MAIL_QUEUE,
      JSON.stringify(['rolled-back@example.invalid']),
    ]);
    const committed = await db.raw(
      `select count(*)::int as n from pgboss.job where name = ? and data->'to' @> ?::jsonb`,
      [MAIL_QUEUE, JSON.stringify(['committed@example.invalid'])],
    );
    expect(committed.rows[0].n).toBe(1);
    expect(rows.rows[0].n).toBe(0);
    expect(smtp.messages.some((m) => m.to.includes('rolled-back@example.invalid'))).toBe(false);
  });
});
