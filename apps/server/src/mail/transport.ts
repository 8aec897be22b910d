import nodemailer, { type Transporter } from 'nodemailer';
import type { MailEnv } from './mail.config';

export type MailTransport = Transporter;

/** One SMTP transport (not pooled: each job opens and closes its own connection). */
export function createMailTransport(
  env: Pick<MailEnv, 'SMTP_HOST' | 'SMTP_PORT' | 'SMTP_SECURE' | 'SMTP_USER' | 'SMTP_PASS'>,
): MailTransport {
  return nodemailer.createTransport({
    host: env.SMTP_HOST,
    port: env.SMTP_PORT,
    secure: env.SMTP_SECURE,
    auth: env.SMTP_USER && env.SMTP_PASS ? { user: env.SMTP_USER, pass: env.SMTP_PASS } : undefined,
    // Fail fast so the job is retried later instead of holding a worker.
    connectionTimeout: 10_000,
    greetingTimeout: 10_000,
    socketTimeout: 30_000,
  });
}
