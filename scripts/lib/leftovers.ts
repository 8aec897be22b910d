import { existsSync, readdirSync, readFileSync, rmSync, writeFileSync, mkdirSync } from 'node:fs';
import path from 'node:path';
import { log } from './proc';

/**
 * Pid files of the processes a start command runs, so that the next start can stop what a
 * crashed one left behind instead of failing on busy ports. Each file holds the pid and the
 * arguments it was started with; a pid is only signalled when /proc still shows that command
 * (pids are reused).
 */

interface PidRecord {
  pid: number;
  args: string[];
}

export function alive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (err) {
    return (err as NodeJS.ErrnoException).code === 'EPERM';
  }
}

function commandLineOf(pid: number): string | undefined {
  try {
    return readFileSync(`/proc/${pid}/cmdline`, 'utf8').split('\0').join(' ');
  } catch {
    return undefined;
  }
}

/** True when `pid` runs and its command line still carries these arguments. */
function isOurs(record: PidRecord): boolean {
  if (!alive(record.pid)) return false;
  const cmd = commandLineOf(record.pid);
  // Without /proc (not Linux) trust the pid file: it was written by the run that started it.
  if (cmd === undefined) return true;
  return record.args.filter((a) => !a.startsWith('{')).every((a) => cmd.includes(a));
}

async function stopPid(pid: number, graceMs = 5000): Promise<void> {
  // Supervised children lead their own process group: signal the group, children included.
  const signal = (s: NodeJS.Signals) => {
    try {
      process.kill(-pid, s);
    } catch {
      try {
        process.kill(pid, s);
      } catch {
        // already gone
      }
    }
  };
  signal('SIGTERM');
  const deadline = Date.now() + graceMs;
  while (alive(pid) && Date.now() < deadline) await new Promise((r) => setTimeout(r, 100));
  if (alive(pid)) signal('SIGKILL');
  while (alive(pid)) await new Promise((r) => setTimeout(r, 50));
}

/**
 * Before starting: refuses when another start command is still running from this checkout, and
 * stops the processes a crashed one left behind. Then records this start command's own pid.
 */
export async function takeOverRunDir(runDir: string, owner = 'start'): Promise<void> {
  mkdirSync(runDir, { recursive: true });
  const ownerFile = path.join(runDir, `${owner}.owner`);
  if (existsSync(ownerFile)) {
    const record = JSON.parse(readFileSync(ownerFile, 'utf8')) as PidRecord;
    if (record.pid !== process.pid && isOurs(record)) {
      throw new Error(`another ${owner} command is already running (pid ${record.pid}); stop it first`);
    }
  }
  await stopLeftovers(runDir);
  writeFileSync(ownerFile, `${JSON.stringify({ pid: process.pid, args: ownArguments() })}\n`);
}

/** This process's arguments as /proc shows them (process.argv holds resolved paths that /proc may not). */
function ownArguments(): string[] {
  try {
    return readFileSync('/proc/self/cmdline', 'utf8').split('\0').filter(Boolean).slice(1);
  } catch {
    return process.argv.slice(1);
  }
}

/** Stops every process a pid file in `runDir` names (when it is still ours) and removes the files. */
export async function stopLeftovers(runDir: string): Promise<string[]> {
  if (!existsSync(runDir)) return [];
  const stopped: string[] = [];
  for (const file of readdirSync(runDir).filter((f) => f.endsWith('.pid'))) {
    const full = path.join(runDir, file);
    try {
      const record = JSON.parse(readFileSync(full, 'utf8')) as PidRecord;
      if (isOurs(record)) {
        const name = file.replace(/\.pid$/, '');
        log('start', `stopping ${name} (pid ${record.pid}) left running by an earlier start that did not finish`);
        await stopPid(record.pid);
        stopped.push(name);
      }
    } catch {
      // an unreadable pid file names nothing we can check
    }
    rmSync(full, { force: true });
  }
  return stopped;
}

/** Removes this command's own record on a clean stop. */
export function releaseRunDir(runDir: string, owner = 'start'): void {
  rmSync(path.join(runDir, `${owner}.owner`), { force: true });
}
