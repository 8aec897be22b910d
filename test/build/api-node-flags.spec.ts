import { spawnSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import path from 'node:path';
import { API_NODE_FLAGS } from '../../scripts/lib/api-node-flags';

// The benches measure the API with API_NODE_FLAGS; the figures they print hold for production
// only if the image runs it with the same flags.
describe('the API process Node flags', () => {
  const root = path.resolve(__dirname, '../..');

  it('are the ones the production image starts the API with', () => {
    const dockerfile = readFileSync(path.join(root, 'docker/Dockerfile'), 'utf8');
    const cmd = /^CMD (\[.*\])$/m.exec(dockerfile)?.[1];
    expect(cmd).toBeDefined();
    expect(JSON.parse(cmd!)).toEqual(['node', ...API_NODE_FLAGS, 'server/main.js']);
  });

  it('are accepted by this Node and bound its heap as they say', () => {
    // V8's own figures for a process started with the flags: the old generation's 512 MB plus
    // the young generation (3 × a 16 MB semi-space in V8's accounting).
    const r = spawnSync(
      process.execPath,
      [...API_NODE_FLAGS, '-p', 'JSON.stringify(require("node:v8").getHeapStatistics())'],
      { encoding: 'utf8' },
    );
    expect(r.status).toBe(0);
    const { heap_size_limit } = JSON.parse(r.stdout) as { heap_size_limit: number };
    const MiB = 1024 * 1024;
    expect(heap_size_limit).toBeGreaterThanOrEqual(512 * MiB);
    expect(heap_size_limit).toBeLessThanOrEqual((512 + 3 * 16) * MiB);
  });
});
