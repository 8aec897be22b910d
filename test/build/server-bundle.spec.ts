import { spawnSync } from 'node:child_process';
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';

// The production image runs the bundled server (npm run build:server). Build it the same way and
// check that it loads every module it needs and stops with a clear message when misconfigured.
describe('the bundled production server', () => {
  const root = path.resolve(__dirname, '../..');
  const out = mkdtempSync(path.join(tmpdir(), 'trabeate-bundle-'));
  afterAll(() => rmSync(out, { recursive: true, force: true }));

  beforeAll(() => {
    const build = spawnSync(
      'npx',
      [
        'esbuild',
        'apps/server/src/main.ts',
        'apps/server/src/migrate.ts',
        '--bundle',
        '--platform=node',
        '--target=node20',
        '--packages=external',
        `--outdir=${out}`,
        '--log-level=error',
      ],
      { cwd: root, encoding: 'utf8' },
    );
    if (build.status !== 0) throw new Error(`esbuild failed: ${build.stderr}`);
  }, 60_000);

  const run = (file: string, env: Record<string, string>) =>
    spawnSync(process.execPath, [path.join(out, file)], {
      cwd: root,
      encoding: 'utf8',
      timeout: 30_000,
      // NODE_PATH lets the bundle in a temp folder find the checkout's node_modules.
      env: { PATH: process.env.PATH ?? '', NODE_PATH: path.join(root, 'node_modules'), ...env },
    });

  it('refuses to start without a database URL, naming the variable', () => {
    const r = run('main.js', { NODE_ENV: 'development' });
    expect(r.status).toBe(78);
    expect(r.stderr).toMatch(/DATABASE_URL/);
  });

  it('names an invalid setting rather than crashing on it', () => {
    const r = run('main.js', {
      NODE_ENV: 'development',
      DATABASE_URL: 'postgres://a:b@127.0.0.1:1/x',
      PORT: 'not-a-port',
    });
    expect(r.status).toBe(78);
    expect(r.stderr).toMatch(/PORT/);
  });

  it('the migration entry reports an unreachable database as an error exit', () => {
    const r = run('migrate.js', { NODE_ENV: 'development', DATABASE_URL: 'postgres://a:b@127.0.0.1:1/x' });
    expect(r.status).toBe(1);
    expect(r.stderr).toMatch(/ECONNREFUSED|connect/);
  });
});
