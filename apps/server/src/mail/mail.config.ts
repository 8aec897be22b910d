import { z } from 'zod';

// Environment fragment for outgoing mail, to merge into core/config.ts.
const blankToUndefined = (v: unknown) => (typeof v === 'string' && v.trim() === '' ? undefined : v);
const bool = z.enum(['true', 'false']).transform((v) => v === 'true');

export const mailConfigShape = {
  SMTP_HOST: z.string().min(1).default('127.0.0.1'),
  SMTP_PORT: z.coerce.number().int().min(1).max(65535).default(2525),
  /** true: TLS from the first byte (port 465). false: plain, upgraded by STARTTLS when offered. */
  SMTP_SECURE: bool.default(false),
  SMTP_USER: z.preprocess(blankToUndefined, z.string().min(1).optional()),
  SMTP_PASS: z.preprocess(blankToUndefined, z.string().min(1).optional()),
  MAIL_FROM: z.string().min(3).default('Trabeate <notices@trabeate.invalid>'),
  /** The local fake's JSON outbox (development outbox page); absent in production. */
  MAIL_OUTBOX_URL: z.preprocess(blankToUndefined, z.url().optional()),
};

export const mailConfigSchema = z.object(mailConfigShape).superRefine((c, ctx) => {
  if (Boolean(c.SMTP_USER) !== Boolean(c.SMTP_PASS)) {
    ctx.addIssue({ code: 'custom', path: ['SMTP_USER'], message: 'and SMTP_PASS must be set together' });
  }
});

export type MailEnv = z.infer<typeof mailConfigSchema>;
