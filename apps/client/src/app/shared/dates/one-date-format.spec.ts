import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';

// Screens write dates only through the app's pipes (tbDay, tbDayTime, tbWaited), which follow the
// firm's locale and time zone. Angular's own `date` pipe takes its format from each template and
// its zone from the browser, so one stray use brings back a second date language on screen.

const APP = join(__dirname, '..', '..');

function sources(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const path = join(dir, name);
    if (statSync(path).isDirectory()) return sources(path);
    return /\.(html|ts)$/.test(name) && !name.endsWith('.spec.ts') ? [path] : [];
  });
}

/** `| date`, `|date:'…'` and the like; not `| dateRange` or a `tbDay` pipe. */
const ANGULAR_DATE_PIPE = /\|\s*date\b(?![\w-])/;
const DATE_PIPE_IMPORT = /\bDatePipe\b/;

describe('one date language on screen', () => {
  const files = sources(APP);

  it('finds the client templates to look through', () => {
    expect(files.some((f) => f.endsWith('planning-page.html'))).toBe(true);
    expect(files.length).toBeGreaterThan(20);
  });

  it("no template uses Angular's date pipe; they use tbDay, tbDayTime or tbWaited", () => {
    const offenders = files.flatMap((f) =>
      readFileSync(f, 'utf8')
        .split('\n')
        .map((line, i) => ({ line, at: `${relative(APP, f)}:${i + 1}` }))
        .filter(({ line }) => ANGULAR_DATE_PIPE.test(line) || DATE_PIPE_IMPORT.test(line))
        .map(({ at, line }) => `${at}: ${line.trim()}`),
    );
    expect(offenders).toEqual([]);
  });

  it('the check itself recognises the forms a stray date pipe takes', () => {
    expect(ANGULAR_DATE_PIPE.test("{{ v.savedAt | date: 'd MMM y, HH:mm' }}")).toBe(true);
    expect(ANGULAR_DATE_PIPE.test('{{ v.savedAt|date }}')).toBe(true);
    expect(ANGULAR_DATE_PIPE.test('{{ v.savedAt | tbDayTime }}')).toBe(false);
    expect(ANGULAR_DATE_PIPE.test('{{ v.range | dateRange }}')).toBe(false);
  });
});
