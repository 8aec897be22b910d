import { existsSync, readdirSync, statSync } from 'node:fs';
import path from 'node:path';
import { log, run } from './proc';

export const CLIENT_DIST = path.resolve('dist/client/browser');

function newest(dir: string): number {
  let latest = 0;
  for (const entry of readdirSync(dir, { withFileTypes: true })) {
    const full = path.join(dir, entry.name);
    if (entry.isDirectory()) latest = Math.max(latest, newest(full));
    else latest = Math.max(latest, statSync(full).mtimeMs);
  }
  return latest;
}

/** Builds the client unless the built index.html is newer than every client and library source. */
export function buildClient({ force = false } = {}): void {
  const index = path.join(CLIENT_DIST, 'index.html');
  if (!force && existsSync(index)) {
    const sources = Math.max(newest('apps/client'), newest('libs'), statSync('angular.json').mtimeMs);
    if (statSync(index).mtimeMs > sources) {
      log('client', 'build is up to date');
      return;
    }
  }
  log('client', 'building the client (ng build)…');
  const t0 = Date.now();
  run('npx', ['ng', 'build', '--progress=false'], { env: { ...process.env, NG_CLI_ANALYTICS: 'false' } });
  log('client', `built in ${((Date.now() - t0) / 1000).toFixed(1)} s`);
}
