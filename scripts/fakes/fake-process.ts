// One local fake in a process of its own, so that one failing cannot take another down:
//   node --import tsx scripts/fakes/fake-process.ts s3 '{"port":4312,"directory":"tmp/s3-dev"}'
// Started by the supervisor (scripts/lib/supervisor.ts) with an IPC channel: it reports "ready"
// over it, and exits when the channel closes, which is how it learns that its parent is gone
// (even after a SIGKILL, which gives the parent no chance to clean up).
import { startFakeS3, type FakeS3Options } from './s3';
import { startFakeSmtp, type FakeSmtpOptions } from './smtp';

// Watched from the first moment: a parent that dies while the fake is still starting counts too.
let parentGone = false;
let onParentGone = () => {
  parentGone = true;
};
if (process.send) {
  process.on('disconnect', () => onParentGone());
  if (!process.connected) parentGone = true;
}

async function main(): Promise<void> {
  if (parentGone) process.exit(0);
  const [kind, json = '{}'] = process.argv.slice(2);
  const options = JSON.parse(json) as Record<string, unknown>;
  let stop: () => Promise<void>;
  let ready: Record<string, unknown>;
  if (kind === 's3') {
    const fake = await startFakeS3(options as FakeS3Options);
    stop = fake.stop;
    ready = { port: fake.port, directory: fake.directory };
  } else if (kind === 'smtp') {
    const fake = await startFakeSmtp(options as FakeSmtpOptions);
    stop = fake.stop;
    ready = { port: fake.port, httpPort: fake.httpPort };
  } else {
    throw new Error(`unknown fake "${kind}" (s3 or smtp)`);
  }

  let stopping = false;
  const exit = (code: number) => {
    if (stopping) return;
    stopping = true;
    // A fake that hangs on close must still go: the supervisor may be waiting on its port.
    setTimeout(() => process.exit(code), 3000).unref();
    void stop().finally(() => process.exit(code));
  };
  process.on('SIGTERM', () => exit(0));
  process.on('SIGINT', () => exit(0));
  onParentGone = () => exit(0);
  if (parentGone || (process.send && !process.connected)) return exit(0);
  process.send?.({ type: 'ready', ...ready });
}

main().catch((err: Error) => {
  process.stderr.write(`${err.stack ?? err.message}\n`);
  process.exit(1);
});
