import type { Knex } from 'knex';
import type { Jobs, MailRequest } from '../jobs';
import type { MailTemplateName } from '../mail';
import type { Logger } from '../core/logger';

/**
 * E-mail notices, queued through pg-boss inside the caller's transaction: a change that rolls
 * back sends nothing, and a mail server that is down only delays the message (pg-boss retries).
 */
export interface Notices {
  send<N extends MailTemplateName>(trx: Knex.Transaction, request: MailRequest<N>): Promise<void>;
  /** The address a notice links to (the client's page for a project). */
  link(path: string): string;
}

export function createNotices(jobs: Jobs | undefined, publicUrl: string, logger: Logger): Notices {
  const base = publicUrl.replace(/\/$/, '');
  return {
    async send(trx, request) {
      if (!jobs) {
        // Only apps built without a job queue (some tests); main.ts always gives one.
        logger.warn({ template: request.template }, 'no job queue configured: notice not queued');
        return;
      }
      await jobs.enqueueMail(request, { trx });
    },
    link: (path) => `${base}${path.startsWith('/') ? path : `/${path}`}`,
  };
}
