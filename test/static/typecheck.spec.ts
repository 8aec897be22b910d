// The typecheck suite: the TypeScript compiler over every part that Jest's transpile-only
// transform would let through with a type error (server, identity provider, libraries, tests).
import { execFile } from 'node:child_process';
import path from 'node:path';
import { promisify } from 'node:util';

const run = promisify(execFile);
const root = path.resolve(__dirname, '../..');
const PROJECTS = [
  'apps/server/tsconfig.app.json',
  'apps/identity/tsconfig.json',
  'libs/tsconfig.libs.json',
  'test/tsconfig.json',
];

describe('typecheck', () => {
  it.each(PROJECTS)('finds no type errors in %s', async (project) => {
    let output = '';
    try {
      await run(path.join(root, 'node_modules', '.bin', 'tsc'), ['-p', project, '--noEmit'], {
        cwd: root,
        maxBuffer: 64 * 1024 * 1024,
      });
    } catch (err) {
      const e = err as { stdout?: string; stderr?: string; message: string };
      output = `${e.stdout ?? ''}${e.stderr ?? ''}` || e.message;
    }
    expect(output).toBe('');
  });
});
