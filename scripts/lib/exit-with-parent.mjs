// Preloaded (node --import) into the API and identity processes that the start and test commands
// run. When their parent goes away, even by SIGKILL, the IPC channel closes: the process then
// stops itself with SIGTERM (its own graceful shutdown), and exits for certain soon after.
// Without an IPC channel (production, a process started by hand) this does nothing.
import { setTimeout } from 'node:timers';

if (process.send) {
  const parentGone = () => {
    setTimeout(() => process.exit(1), 10_000).unref();
    process.kill(process.pid, 'SIGTERM');
  };
  process.on('disconnect', parentGone);
  // The parent may have died while this process was still loading: the event has then passed.
  if (!process.connected) parentGone();
  // Watching the channel must not keep a process alive that would otherwise exit.
  process.channel?.unref();
}
