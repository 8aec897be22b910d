// Stops the project-local PostgreSQL when the start command that started it goes away without
// stopping it (a crash, a SIGKILL, a closed terminal). pg_ctl runs PostgreSQL as a daemon that
// would otherwise keep running, orphaned, and hold its port.
//   node scripts/lib/pg-watchdog.mjs '["pg_ctl","-D","…","-m","fast","-w","stop"]'
// The parent holds this process's stdin open: it closes when the parent dies however it dies.
// The parent writes "disarm" before a stop of its own, and this then exits without doing anything.
import { spawnSync } from 'node:child_process';

const command = JSON.parse(process.argv[2] ?? '[]');
let disarmed = false;
process.stdin.setEncoding('utf8');
process.stdin.on('data', (text) => {
  if (text.includes('disarm')) disarmed = true;
});
process.stdin.on('close', () => {
  if (!disarmed && command.length) spawnSync(command[0], command.slice(1), { stdio: 'ignore' });
  process.exit(0);
});
process.stdin.on('error', () => undefined);
// Ctrl-C and hang-ups are for the parent; this process acts on the pipe alone.
for (const signal of ['SIGINT', 'SIGHUP']) process.on(signal, () => undefined);
