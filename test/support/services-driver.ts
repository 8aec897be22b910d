// A stand-in for the start command in test/api/local-services.spec.ts: it starts PostgreSQL (with
// its watchdog), both fakes and a child like the API (with the exit-with-parent preload) the way
// scripts/start.ts does, prints their pids, and waits to be killed.
//   node --import tsx test/support/services-driver.ts '{"runDir":…,"pgName":…,"ports":{…}}'
import { s3Service, smtpService } from '../../scripts/lib/fake-services';
import { Cluster } from '../../scripts/lib/postgres';
import { postgresService, startAll } from '../../scripts/lib/services';
import { supervise } from '../../scripts/lib/supervisor';

interface DriverConfig {
  runDir: string;
  pgName: string;
  ports: { postgres: number; s3: number; smtp: number; smtpHttp: number };
}

async function main(): Promise<void> {
  const config = JSON.parse(process.argv[2]) as DriverConfig;
  const { runDir, ports } = config;
  const cluster = new Cluster({ name: config.pgName, port: ports.postgres, fast: true });
  const s3 = s3Service({ port: ports.s3, runDir });
  const smtp = smtpService({ port: ports.smtp, httpPort: ports.smtpHttp, runDir });
  // What the API and identity provider run with: the same preload, a process that never ends by itself.
  const apiLike = supervise({
    name: 'api-like',
    args: ['--import', './scripts/lib/exit-with-parent.mjs', '-e', 'setInterval(() => undefined, 1000)'],
    restart: false,
    runDir,
  });
  await startAll([
    postgresService(cluster, { runDir }),
    s3,
    smtp,
    { name: 'api-like', start: () => apiLike.start(), ready: async () => undefined, stop: () => apiLike.stop() },
  ]);
  process.stdout.write(
    `READY ${JSON.stringify({ s3: s3.pid(), smtp: smtp.pid(), apiLike: apiLike.pid(), dataDir: cluster.dataDir })}\n`,
  );
  setInterval(() => undefined, 60_000);
}

main().catch((err: Error) => {
  process.stderr.write(`${err.stack ?? err.message}\n`);
  process.exit(1);
});
