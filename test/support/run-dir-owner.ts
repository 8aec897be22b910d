// Takes over a run folder the way scripts/start.ts does, says so, and waits to be killed
// (test/api/local-services.spec.ts).  node --import tsx test/support/run-dir-owner.ts <dir>
import { takeOverRunDir } from '../../scripts/lib/leftovers';

takeOverRunDir(process.argv[2], 'start').then(
  () => {
    process.stdout.write('OWNED\n');
    setInterval(() => undefined, 60_000);
  },
  (err: Error) => {
    process.stdout.write(`REFUSED ${err.message}\n`);
    process.exit(3);
  },
);
