import { spawn, type ChildProcess } from 'node:child_process';
import { mkdirSync, rmSync, writeFileSync } from 'node:fs';
import path from 'node:path';
import { log } from './proc';

export interface SupervisedOptions {
  /** Shown in every log line, and the pid file's name. */
  name: string;
  /** Arguments for `node` (this same Node binary). */
  args: string[];
  env?: NodeJS.ProcessEnv;
  /** Start it again when it stops unexpectedly (with backoff); otherwise only say so. */
  restart: boolean;
  /** The child sends {type: 'ready'} over IPC once it serves; wait for that before ready(). */
  readyMessage?: boolean;
  /** Where the pid file goes (see leftovers.ts); none when absent. */
  runDir?: string;
}

export interface Supervised {
  readonly name: string;
  /** Spawns the child (and keeps it running when `restart`). */
  start(): Promise<void>;
  /** Resolves once the current child has said it is ready (immediately without readyMessage). */
  whenReady(): Promise<void>;
  /** The current child's pid. */
  pid(): number | undefined;
  /** How many times it has been started again after stopping unexpectedly. */
  restarts(): number;
  /** Stops it for good: SIGTERM, then SIGKILL after the grace period. */
  stop(graceMs?: number): Promise<void>;
}

/** Backoff between restarts: 0.5 s, doubling to 10 s; reset once a child has run for 30 s. */
const FIRST_DELAY_MS = 500;
const MAX_DELAY_MS = 10_000;
const STABLE_MS = 30_000;

/**
 * A long-running Node child under watch. It gets an IPC channel, which closes when this process
 * dies however it dies, so children can exit with their parent (see fake-process.ts and
 * exit-with-parent.mjs). It runs in its own process group, so a Ctrl-C in the terminal reaches
 * only the start command, which then stops its children in order, rather than every child at
 * once (which would read as crashes). Its pid is kept in `runDir` so the next start can stop it
 * if this process is killed before it can.
 */
export function supervise(opts: SupervisedOptions): Supervised {
  let child: ChildProcess | undefined;
  let stopping = false;
  let restarts = 0;
  let delay = FIRST_DELAY_MS;
  let timer: NodeJS.Timeout | undefined;
  let ready: Promise<void> = Promise.resolve();
  const pidFile = opts.runDir ? path.join(opts.runDir, `${opts.name}.pid`) : undefined;

  const spawnChild = () => {
    const startedAt = Date.now();
    const c = spawn(process.execPath, opts.args, {
      env: opts.env ?? process.env,
      stdio: ['ignore', 'pipe', 'pipe', 'ipc'],
      detached: true,
    });
    child = c;
    const prefix = (chunk: Buffer) => {
      for (const line of chunk.toString('utf8').split('\n')) if (line.trim()) log(opts.name, line);
    };
    c.stdout?.on('data', prefix);
    c.stderr?.on('data', prefix);
    if (pidFile && c.pid) {
      mkdirSync(path.dirname(pidFile), { recursive: true });
      writeFileSync(pidFile, `${JSON.stringify({ pid: c.pid, args: opts.args })}\n`);
    }
    ready = opts.readyMessage
      ? new Promise<void>((resolve, reject) => {
          c.on('message', (m: { type?: string }) => {
            if (m?.type === 'ready') resolve();
          });
          c.once('exit', (code, signal) =>
            reject(new Error(`${opts.name} exited before it was ready (${describe(code, signal)})`)),
          );
        })
      : Promise.resolve();
    ready.catch(() => undefined); // awaited by whenReady(); an early exit is also handled below
    c.once('error', (err) => log(opts.name, `could not start: ${err.message}`));
    c.once('exit', (code, signal) => {
      if (child === c) child = undefined;
      if (stopping) return;
      if (pidFile) rmSync(pidFile, { force: true });
      if (!opts.restart) {
        log(opts.name, `stopped unexpectedly (${describe(code, signal)})`);
        return;
      }
      if (Date.now() - startedAt > STABLE_MS) delay = FIRST_DELAY_MS;
      log(opts.name, `${opts.name} stopped unexpectedly (${describe(code, signal)}); restarting in ${delay} ms`);
      timer = setTimeout(() => {
        timer = undefined;
        if (stopping) return;
        restarts++;
        spawnChild();
        ready.then(
          () => log(opts.name, `${opts.name} is back (restart ${restarts})`),
          () => undefined,
        );
      }, delay);
      delay = Math.min(delay * 2, MAX_DELAY_MS);
    });
  };

  return {
    name: opts.name,
    start: async () => {
      stopping = false;
      spawnChild();
    },
    whenReady: () => ready,
    pid: () => child?.pid,
    restarts: () => restarts,
    stop: async (graceMs = 10_000) => {
      stopping = true;
      if (timer) clearTimeout(timer);
      const c = child;
      if (c && c.exitCode === null && c.signalCode === null) {
        const exited = new Promise<void>((resolve) => c.once('exit', () => resolve()));
        c.kill('SIGTERM');
        const kill = setTimeout(() => c.kill('SIGKILL'), graceMs);
        await exited;
        clearTimeout(kill);
      }
      if (c?.connected) c.disconnect();
      if (pidFile) rmSync(pidFile, { force: true });
    },
  };
}

function describe(code: number | null, signal: NodeJS.Signals | null): string {
  return signal ? `signal ${signal}` : `code ${code}`;
}
