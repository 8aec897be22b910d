import { spawn, spawnSync, type ChildProcess, type SpawnOptions } from 'node:child_process';

export const isRoot = typeof process.getuid === 'function' && process.getuid() === 0;

export function log(service: string, message: string): void {
  process.stdout.write(`[${service.padEnd(8)}] ${message}\n`);
}

/** Runs a command to completion; throws with its output when it fails. */
export function run(cmd: string, args: string[], opts: SpawnOptions & { quiet?: boolean } = {}): string {
  const result = spawnSync(cmd, args, { encoding: 'utf8', ...opts, stdio: opts.quiet === false ? 'inherit' : 'pipe' });
  if (result.error) throw result.error;
  if (result.status !== 0) {
    const out = `${result.stdout ?? ''}${result.stderr ?? ''}`.trim();
    throw new Error(`${cmd} ${args.join(' ')} exited with ${result.status}${out ? `:\n${out}` : ''}`);
  }
  return String(result.stdout ?? '');
}

export function commandExists(cmd: string): boolean {
  return spawnSync('sh', ['-c', `command -v ${cmd}`], { stdio: 'ignore' }).status === 0;
}

/** Starts a long-running child whose output is prefixed with the service name. */
export function startChild(name: string, cmd: string, args: string[], opts: SpawnOptions = {}): ChildProcess {
  const child = spawn(cmd, args, { ...opts, stdio: ['ignore', 'pipe', 'pipe'] });
  const prefix = (chunk: Buffer) => {
    for (const line of chunk.toString('utf8').split('\n')) if (line.trim()) log(name, line);
  };
  child.stdout?.on('data', prefix);
  child.stderr?.on('data', prefix);
  return child;
}

export async function stopChild(child: ChildProcess, graceMs = 10_000): Promise<void> {
  if (child.exitCode !== null || child.signalCode !== null) return;
  const exited = new Promise<void>((resolve) => child.once('exit', () => resolve()));
  child.kill('SIGTERM');
  const timer = setTimeout(() => child.kill('SIGKILL'), graceMs);
  await exited;
  clearTimeout(timer);
}

export async function waitFor(what: string, probe: () => Promise<boolean>, timeoutMs = 30_000): Promise<void> {
  const deadline = Date.now() + timeoutMs;
  for (;;) {
    try {
      if (await probe()) return;
    } catch {
      // not ready yet
    }
    if (Date.now() > deadline) throw new Error(`${what} was not ready after ${timeoutMs / 1000} s`);
    await new Promise((r) => setTimeout(r, 200));
  }
}

export async function httpOk(url: string): Promise<boolean> {
  const res = await fetch(url, { signal: AbortSignal.timeout(2000) });
  return res.ok;
}
