// The lint suite: ESLint's rules and Prettier's layout over the whole repository, so a lint or
// formatting slip fails `npm test` (and CI) like any other test.
import { execFile } from 'node:child_process';
import path from 'node:path';
import { promisify } from 'node:util';

const run = promisify(execFile);
const root = path.resolve(__dirname, '../..');
const bin = (name: string) => path.join(root, 'node_modules', '.bin', name);

async function failures(cmd: string, args: string[]): Promise<string> {
  try {
    await run(bin(cmd), args, { cwd: root, maxBuffer: 64 * 1024 * 1024 });
    return '';
  } catch (err) {
    const e = err as { stdout?: string; stderr?: string; message: string };
    return `${e.stdout ?? ''}${e.stderr ?? ''}` || e.message;
  }
}

describe('lint', () => {
  it('finds no ESLint problems in the repository', async () => {
    expect(await failures('eslint', ['--max-warnings=0', '.'])).toBe('');
  });

  it('finds every file laid out as Prettier lays it out (npm run format fixes it)', async () => {
    expect(await failures('prettier', ['--check', '--log-level=warn', '.'])).toBe('');
  });
});
