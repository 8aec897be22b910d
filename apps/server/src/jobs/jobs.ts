import { randomUUID } from 'node:crypto';
import type { Knex } from 'knex';
import PgBoss from 'pg-boss';
import { renderMail, type MailData, type MailTemplateName, type MailTransport } from '../mail';

export const MAIL_QUEUE = 'mail.send';

/** What a queued mail job carries: already rendered, so every retry sends the same message. */
export interface MailJob {
  to: string[];
  cc?: string[];
  replyTo?: string;
  subject: string;
  html: string;
  text: string;
  /** Fixed when queued, so a message sent twice after a crash can be recognised as one. */
  messageId: string;
  template: string;
}

export interface MailRequest<N extends MailTemplateName = MailTemplateName> {
  to: string | string[];
  cc?: string[];
  replyTo?: string;
  template: N;
  data: MailData<N>;
}

export interface RetryPolicy {
  /** Attempts after the first (at least 5 in production). */
  retryLimit: number;
  /** Seconds before the first retry; doubled each time (with jitter) when retryBackoff is on. */
  retryDelay: number;
  retryBackoff: boolean;
}

/** About 1, 2, 4, 8, 16, 32, 64, 128 minutes: an SMTP outage of a couple of hours loses nothing. */
export const DEFAULT_MAIL_RETRY: RetryPolicy = { retryLimit: 8, retryDelay: 60, retryBackoff: true };

export interface JobsOptions {
  databaseUrl: string;
  /** The mail worker runs only when a transport is given (an API process may just enqueue). */
  transport?: MailTransport;
  mailFrom: string;
  retry?: RetryPolicy;
  /** How often an idle worker looks for work (pg-boss allows 0.5 s and up). */
  pollingIntervalSeconds?: number;
  logger?: {
    info(obj: object, msg?: string): void;
    warn(obj: object, msg?: string): void;
    error(obj: object, msg?: string): void;
  };
  /** The PostgreSQL schema pg-boss keeps its tables in. */
  schema?: string;
}

export interface Jobs {
  start(): Promise<void>;
  stop(): Promise<void>;
  /**
   * Renders and queues a notice. With `trx`, the job is written through the caller's open
   * transaction: rolled back with it, so a change that fails sends no mail, and invisible to the
   * workers until it commits. Returns the job id.
   */
  enqueueMail<N extends MailTemplateName>(request: MailRequest<N>, opts?: { trx?: Knex.Transaction }): Promise<string>;
  /**
   * Runs `handler` on a cron schedule (UTC). pg-boss keeps the schedule in PostgreSQL and queues
   * one job per tick, so with any number of API processes the work runs once, not once each.
   */
  every(name: string, cron: string, handler: () => Promise<void>): Promise<void>;
  readonly boss: PgBoss;
  /**
   * For the health check: resolves when this process's pg-boss is started and its queue table
   * answers; rejects otherwise. Asks PostgreSQL every time (nothing is cached in the process).
   */
  probe(): Promise<void>;
}

/**
 * Background work through pg-boss: jobs live in PostgreSQL, so any number of API processes can
 * queue and work them without timers or state of their own. Failed mail is retried by pg-boss.
 */
export function createJobs(opts: JobsOptions): Jobs {
  const retry = opts.retry ?? DEFAULT_MAIL_RETRY;
  const boss = new PgBoss({
    connectionString: opts.databaseUrl,
    schema: opts.schema ?? 'pgboss',
    max: 4,
    application_name: 'trabeate-jobs',
  });
  boss.on('error', (err) => opts.logger?.error({ err }, 'job queue error'));
  let started = false;

  return {
    boss,

    async start() {
      await boss.start();
      started = true;
      // createQueue is idempotent in effect; updateQueue keeps the policy current on later deploys.
      const existing = await boss.getQueue(MAIL_QUEUE);
      if (existing) await boss.updateQueue(MAIL_QUEUE, { name: MAIL_QUEUE, ...retry });
      else
        await boss.createQueue(MAIL_QUEUE, { name: MAIL_QUEUE, ...retry, policy: 'standard' }).catch(async (err) => {
          // Two processes starting at once: the other one created it.
          if (!(await boss.getQueue(MAIL_QUEUE))) throw err;
        });
      if (opts.transport) {
        const transport = opts.transport;
        await boss.work<MailJob>(
          MAIL_QUEUE,
          { pollingIntervalSeconds: opts.pollingIntervalSeconds ?? 2, batchSize: 1 },
          async ([job]) => {
            const m = job.data;
            try {
              await transport.sendMail({
                from: opts.mailFrom,
                to: m.to,
                cc: m.cc,
                replyTo: m.replyTo,
                subject: m.subject,
                html: m.html,
                text: m.text,
                messageId: m.messageId,
              });
              opts.logger?.info({ jobId: job.id, template: m.template }, 'mail sent');
            } catch (err) {
              // Thrown on: pg-boss marks the job failed and schedules the retry.
              opts.logger?.warn(
                { jobId: job.id, template: m.template, err: (err as Error).message },
                'mail not sent; will retry',
              );
              throw err;
            }
          },
        );
      }
    },

    async stop() {
      if (!started) return;
      started = false;
      await boss.stop({ graceful: true, wait: true, timeout: 10_000 });
    },

    async every(name, cron, handler) {
      if (!(await boss.getQueue(name))) {
        // A schedule that misses its tick must not pile up: one pending run at a time is enough.
        await boss.createQueue(name, { name, policy: 'singleton', retryLimit: 2 }).catch(async (err) => {
          if (!(await boss.getQueue(name))) throw err;
        });
      }
      await boss.schedule(name, cron, {}, { tz: 'UTC' });
      await boss.work(name, { pollingIntervalSeconds: opts.pollingIntervalSeconds ?? 2 }, async () => {
        await handler();
      });
    },

    async probe() {
      if (!started) throw new Error('the job queue is not started in this process');
      if (!(await boss.getQueue(MAIL_QUEUE))) throw new Error(`the queue ${MAIL_QUEUE} does not exist`);
    },

    async enqueueMail(request, { trx } = {}) {
      const rendered = renderMail(request.template, request.data);
      const job: MailJob = {
        to: Array.isArray(request.to) ? request.to : [request.to],
        cc: request.cc,
        replyTo: request.replyTo,
        ...rendered,
        messageId: `<${randomUUID()}@mail.trabeate>`,
        template: request.template,
      };
      const id = await boss.send(MAIL_QUEUE, job, { ...retry, db: trx ? transactionDb(trx) : undefined });
      if (!id) throw new Error('the mail job was not queued');
      return id;
    },
  };
}

/**
 * pg-boss writes with numbered parameters ($1, $2 …), which knex.raw does not take; so the SQL
 * goes straight to the transaction's own connection (knex hands a transaction's client exactly
 * that connection). This is what makes the job part of the caller's transaction.
 */
function transactionDb(trx: Knex.Transaction): PgBoss.Db {
  return {
    async executeSql(text: string, values: unknown[]) {
      const client = (
        trx as unknown as {
          client: { acquireConnection(): Promise<{ query(t: string, v: unknown[]): Promise<{ rows: unknown[] }> }> };
        }
      ).client;
      const connection = await client.acquireConnection();
      return connection.query(text, values) as Promise<{ rows: any[] }>; // eslint-disable-line @typescript-eslint/no-explicit-any
    },
  };
}
