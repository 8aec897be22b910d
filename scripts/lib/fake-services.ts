import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import type { Service } from './services';
import { supervise, type Supervised } from './supervisor';

const FAKE_PROCESS = 'scripts/fakes/fake-process.ts';

/** A local fake as a service: its own child process, restarted with backoff when it dies. */
export type FakeService = Service & {
  /** The fake's current process id (it changes when the fake is restarted). */
  pid(): number | undefined;
  /** How many times the fake was started again after it stopped unexpectedly. */
  restarts(): number;
};

/**
 * The local S3 and SMTP fakes as services for the start and test commands. Each runs in a child
 * process of its own (scripts/fakes/fake-process.ts), bound to 127.0.0.1 only, so one failing
 * cannot stop another or the command; the supervisor says which one died and restarts it on the
 * same port and folder. With `runDir`, its pid is recorded for the next start (leftovers.ts).
 */
export function s3Service(opts: { port: number; directory?: string; bucket?: string; runDir?: string }): FakeService {
  let temporary: string | undefined;
  return fakeService('s3', opts.runDir, () => {
    // A restarted fake must find the files of the one before: the folder is chosen here, once.
    const directory = opts.directory ?? (temporary = mkdtempSync(path.join(tmpdir(), 'trabeate-s3-')));
    return {
      options: { port: opts.port, directory, bucket: opts.bucket },
      ready: async () => {
        // Any HTTP answer means it listens; the bucket was created before it said ready.
        const res = await fetch(`http://127.0.0.1:${opts.port}/`, { signal: AbortSignal.timeout(2000) });
        if (res.status >= 500) throw new Error(`the S3 fake answered ${res.status}`);
      },
      cleanUp: () => {
        if (temporary) rmSync(temporary, { recursive: true, force: true });
        temporary = undefined;
      },
    };
  });
}

export function smtpService(opts: {
  port: number;
  httpPort: number;
  directory?: string;
  runDir?: string;
}): FakeService {
  return fakeService('smtp', opts.runDir, () => ({
    options: { port: opts.port, httpPort: opts.httpPort, directory: opts.directory },
    ready: async () => {
      const res = await fetch(`http://127.0.0.1:${opts.httpPort}/health`, { signal: AbortSignal.timeout(2000) });
      if (!res.ok) throw new Error(`the mail outbox answered ${res.status}`);
    },
    cleanUp: () => undefined,
  }));
}

function fakeService(
  kind: 's3' | 'smtp',
  runDir: string | undefined,
  prepare: () => { options: Record<string, unknown>; ready: () => Promise<void>; cleanUp: () => void },
): FakeService {
  let proc: Supervised | undefined;
  let prepared: ReturnType<typeof prepare> | undefined;
  return {
    name: kind,
    pid: () => proc?.pid(),
    restarts: () => proc?.restarts() ?? 0,
    start: async () => {
      prepared = prepare();
      proc = supervise({
        name: kind,
        args: ['--import', 'tsx', FAKE_PROCESS, kind, JSON.stringify(prepared.options)],
        restart: true,
        readyMessage: true,
        runDir,
      });
      await proc.start();
    },
    ready: async () => {
      await proc?.whenReady();
      await prepared?.ready();
    },
    stop: async () => {
      await proc?.stop(5000);
      proc = undefined;
      prepared?.cleanUp();
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
