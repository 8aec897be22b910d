import type { FakeS3 } from '../fakes/s3';
import type { FakeSmtp } from '../fakes/smtp';
import type { FakeStripe } from '../fakes/stripe';
import type { Service } from './services';

/**
 * The local S3 and SMTP fakes as services for the start and test commands. They run inside the
 * command's own process (no child), bound to 127.0.0.1 only.
 */
export function s3Service(opts: {
  port: number;
  directory?: string;
  bucket?: string;
}): Service & { fake(): FakeS3 | undefined } {
  let fake: FakeS3 | undefined;
  return {
    name: 's3',
    fake: () => fake,
    start: async () => {
      const { startFakeS3 } = await import('../fakes/s3');
      fake = await startFakeS3(opts);
    },
    ready: async () => {
      // Any HTTP answer means it listens; the bucket was created before run() resolved.
      const res = await fetch(`http://127.0.0.1:${fake?.port ?? opts.port}/`, { signal: AbortSignal.timeout(2000) });
      if (res.status >= 500) throw new Error(`the S3 fake answered ${res.status}`);
    },
    stop: async () => {
      await fake?.stop();
      fake = undefined;
    },
  };
}

export function smtpService(opts: {
  port: number;
  httpPort: number;
  directory?: string;
}): Service & { fake(): FakeSmtp | undefined } {
  let fake: FakeSmtp | undefined;
  return {
    name: 'smtp',
    fake: () => fake,
    start: async () => {
      const { startFakeSmtp } = await import('../fakes/smtp');
      fake = await startFakeSmtp(opts);
    },
    ready: async () => {
      const res = await fetch(`http://127.0.0.1:${fake?.httpPort ?? opts.httpPort}/health`, {
        signal: AbortSignal.timeout(2000),
      });
      if (!res.ok) throw new Error(`the mail outbox answered ${res.status}`);
    },
    stop: async () => {
      await fake?.stop();
      fake = undefined;
    },
  };
}

/** The payments fake (emulate behind our front), posting signed events to the API's webhook. */
export function stripeService(opts: {
  port: number;
  webhookUrl: string;
}): Service & { fake(): FakeStripe | undefined } {
  let fake: FakeStripe | undefined;
  return {
    name: 'stripe',
    fake: () => fake,
    start: async () => {
      const { startFakeStripe } = await import('../fakes/stripe');
      fake = await startFakeStripe(opts);
    },
    ready: async () => {
      const res = await fetch(`http://127.0.0.1:${fake?.port ?? opts.port}/v1/checkout/sessions`, {
        signal: AbortSignal.timeout(2000),
      });
      if (res.status >= 500) throw new Error(`the payments fake answered ${res.status}`);
    },
    stop: async () => {
      await fake?.stop();
      fake = undefined;
    },
  };
}

/** Environment for the API that points it at the running fakes (LOCAL ONLY credentials). */
export function fakeServicesEnv(
  s3: { port: number; bucket?: string },
  smtp: { port: number; httpPort: number },
): Record<string, string> {
  return {
    S3_ENDPOINT: `http://127.0.0.1:${s3.port}`,
    S3_REGION: 'us-east-1',
    S3_BUCKET: s3.bucket ?? 'trabeate',
    S3_ACCESS_KEY_ID: 'S3RVER',
    S3_SECRET_ACCESS_KEY: 'S3RVER',
    S3_FORCE_PATH_STYLE: 'true',
    SMTP_HOST: '127.0.0.1',
    SMTP_PORT: String(smtp.port),
    SMTP_SECURE: 'false',
    MAIL_OUTBOX_URL: `http://127.0.0.1:${smtp.httpPort}`,
  };
}
