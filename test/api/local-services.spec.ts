import { spawn, type ChildProcess } from 'node:child_process';
import { readdirSync, readFileSync, rmSync, writeFileSync, mkdirSync, existsSync } from 'node:fs';
import path from 'node:path';
import { Readable } from 'node:stream';
import { createTransport } from 'nodemailer';
import { createObjectStore } from '../../apps/server/src/storage';
import { FAKE_S3_CREDENTIALS } from '../../scripts/fakes/s3';
import { s3Service, smtpService } from '../../scripts/lib/fake-services';
import { alive, releaseRunDir, takeOverRunDir } from '../../scripts/lib/leftovers';
import { Cluster } from '../../scripts/lib/postgres';
import { freePort, startAll } from '../../scripts/lib/services';

// The local services of `npm start`, run as the start command runs them: each fake in a child
// process under a supervisor. These tests kill processes on purpose.
jest.setTimeout(90_000);

const ROOT = path.resolve(__dirname, '../..');

async function until(what: string, probe: () => Promise<boolean> | boolean, ms = 20_000): Promise<void> {
  const end = Date.now() + ms;
  for (;;) {
    try {
      if (await probe()) return;
    } catch {
      // not yet
    }
    if (Date.now() > end) throw new Error(`timed out waiting for ${what}`);
    await new Promise((r) => setTimeout(r, 100));
  }
}

describe('local fakes under the supervisor', () => {
  it('when the S3 fake is killed, the supervisor names it, restarts it with its files, and SMTP keeps serving', async () => {
    const ports = { s3: await freePort(0), smtp: await freePort(0), smtpHttp: await freePort(0) };
    const s3 = s3Service({ port: ports.s3 });
    const smtp = smtpService({ port: ports.smtp, httpPort: ports.smtpHttp });
    const lines: string[] = [];
    const write = jest.spyOn(process.stdout, 'write').mockImplementation((chunk: string | Uint8Array) => {
      lines.push(String(chunk));
      return true;
    });
    const stopAll = await startAll([s3, smtp]);
    const store = createObjectStore({
      endpoint: `http://127.0.0.1:${ports.s3}`,
      region: 'us-east-1',
      bucket: 'trabeate',
      credentials: { ...FAKE_S3_CREDENTIALS },
      forcePathStyle: true,
    });
    const mail = createTransport({ host: '127.0.0.1', port: ports.smtp, secure: false, ignoreTLS: true });
    try {
      await store.putStream('kept/plan.pdf', Readable.from([Buffer.from('%PDF-1.4\n')]), {
        contentType: 'application/pdf',
      });
      const s3Pid = s3.pid()!;
      const smtpPid = smtp.pid()!;
      expect(s3Pid).not.toBe(process.pid);

      process.kill(s3Pid, 'SIGKILL');
      await until('the S3 fake to go down', () => !alive(s3Pid));
      // The other fake is a separate process: it still takes and shows mail while S3 is down.
      await mail.sendMail({
        from: 'notices@trabeate.test',
        to: 'site@trabeate.test',
        subject: 'Still here',
        text: 'x',
      });
      const outbox = (await (await fetch(`http://127.0.0.1:${ports.smtpHttp}/messages`)).json()) as Array<{
        subject: string;
      }>;
      expect(outbox.map((m) => m.subject)).toContain('Still here');

      await until(
        'the S3 fake to come back',
        async () => s3.restarts() === 1 && (await store.head('kept/plan.pdf')) !== null,
      );
      expect(s3.pid()).not.toBe(s3Pid);
      expect(smtp.pid()).toBe(smtpPid);
      expect(smtp.restarts()).toBe(0);
      expect(lines.join('')).toMatch(/s3 stopped unexpectedly \(signal SIGKILL\); restarting in \d+ ms/);
    } finally {
      mail.close();
      store.close();
      await stopAll();
      write.mockRestore();
    }
  });
});

describe('when the start command dies', () => {
  let driver: ChildProcess | undefined;
  const runDir = path.join(ROOT, 'tmp', 'run', `spec-${process.pid}`);
  afterAll(() => {
    if (driver && driver.exitCode === null) driver.kill('SIGKILL');
    rmSync(runDir, { recursive: true, force: true });
  });

  it('killed with SIGKILL, it leaves no child behind: fakes, API-like children and PostgreSQL all stop', async () => {
    const pgName = `pg-orphan-${process.pid}`;
    const ports = {
      postgres: await freePort(0),
      s3: await freePort(0),
      smtp: await freePort(0),
      smtpHttp: await freePort(0),
    };
    driver = spawn(
      process.execPath,
      ['--import', 'tsx', 'test/support/services-driver.ts', JSON.stringify({ runDir, pgName, ports })],
      { cwd: ROOT, stdio: ['ignore', 'pipe', 'pipe'] },
    );
    let out = '';
    driver.stdout!.on('data', (c: Buffer) => (out += c.toString()));
    driver.stderr!.on('data', (c: Buffer) => (out += c.toString()));
    await until('the services to start', () => out.includes('READY '), 60_000);
    const ready = JSON.parse(/READY (.*)/.exec(out)![1]) as {
      s3: number;
      smtp: number;
      apiLike: number;
      dataDir: string;
    };
    const postmaster = Number(readFileSync(path.join(ready.dataDir, 'postmaster.pid'), 'utf8').split('\n')[0]);
    const watchdogFile = readdirSync(runDir).find((f) => f.startsWith('pg-watchdog-'))!;
    const watchdog = (JSON.parse(readFileSync(path.join(runDir, watchdogFile), 'utf8')) as { pid: number }).pid;
    const children = { s3: ready.s3, smtp: ready.smtp, apiLike: ready.apiLike, postmaster, watchdog };
    for (const pid of Object.values(children)) expect(alive(pid)).toBe(true);

    driver.kill('SIGKILL');
    await until('every child to stop', () => Object.values(children).every((pid) => !alive(pid)), 30_000);
    expect(Object.entries(children).filter(([, pid]) => alive(pid))).toEqual([]);
    const cluster = new Cluster({ name: pgName, port: ports.postgres });
    expect(cluster.isRunning()).toBe(false);
    cluster.remove();
  });

  it('the next start stops what a crashed run left behind, and refuses while a live start owns the folder', async () => {
    const dir = path.join(runDir, 'takeover');
    mkdirSync(dir, { recursive: true });
    // A leftover that ignores its parent: only the next start can stop it.
    const args = ['-e', 'setInterval(() => undefined, 1000) /* trabeate-leftover */'];
    const leftover = spawn(process.execPath, args, { detached: true, stdio: 'ignore' });
    leftover.unref();
    writeFileSync(path.join(dir, 'api.pid'), JSON.stringify({ pid: leftover.pid, args }));
    // A pid file whose pid now belongs to something else must not be signalled.
    writeFileSync(path.join(dir, 'smtp.pid'), JSON.stringify({ pid: process.pid, args: ['not-this-command'] }));

    await takeOverRunDir(dir, 'start');
    expect(alive(leftover.pid!)).toBe(false);
    expect(existsSync(path.join(dir, 'api.pid'))).toBe(false);
    expect(alive(process.pid)).toBe(true);
    releaseRunDir(dir);

    // A start command that is alive (run as npm start runs it: tsx and a relative script path)
    // owns the folder: another start is refused and stops none of its processes.
    const owner = spawn(process.execPath, ['--import', 'tsx', 'test/support/run-dir-owner.ts', dir], {
      cwd: ROOT,
      stdio: ['ignore', 'pipe', 'pipe'],
    });
    try {
      let said = '';
      owner.stdout!.on('data', (c: Buffer) => (said += c.toString()));
      await until('the first start to take the folder', () => said.includes('OWNED'), 30_000);
      const busy = spawn(process.execPath, args, { detached: true, stdio: 'ignore' });
      busy.unref();
      writeFileSync(path.join(dir, 's3.pid'), JSON.stringify({ pid: busy.pid, args }));
      await expect(takeOverRunDir(dir, 'start')).rejects.toThrow(`already running (pid ${owner.pid})`);
      expect(alive(busy.pid!)).toBe(true);

      // Once that start has crashed, the next one takes over and stops what it left.
      owner.kill('SIGKILL');
      await until('the first start to die', () => !alive(owner.pid!));
      await takeOverRunDir(dir, 'start');
      expect(alive(busy.pid!)).toBe(false);
      expect((JSON.parse(readFileSync(path.join(dir, 'start.owner'), 'utf8')) as { pid: number }).pid).toBe(
        process.pid,
      );
    } finally {
      if (owner.exitCode === null) owner.kill('SIGKILL');
    }
  });
});
