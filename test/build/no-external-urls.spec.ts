import { existsSync, readdirSync, readFileSync } from 'node:fs';
import path from 'node:path';

// The built client must load fonts, styles and scripts from its own origin only: a site office
// may be offline or filtered, and nothing about a client's project should leak to a third party.
const dist = path.resolve(__dirname, '../../dist/client/browser');

function files(dir: string): string[] {
  return readdirSync(dir, { withFileTypes: true }).flatMap((e) =>
    e.isDirectory() ? files(path.join(dir, e.name)) : [path.join(dir, e.name)],
  );
}

/** Finds URLs that an HTML or CSS file would load from another host. */
export function externalLoads(name: string, text: string): string[] {
  const found: string[] = [];
  const patterns = name.endsWith('.css')
    ? [/url\(\s*['"]?((?:https?:)?\/\/[^'")\s]+)/g, /@import\s+['"]((?:https?:)?\/\/[^'"]+)/g]
    : [
        /<(?:script|link|img|iframe)\b[^>]*?(?:src|href)\s*=\s*['"]((?:https?:)?\/\/[^'"]+)/gi,
        /url\(\s*['"]?((?:https?:)?\/\/[^'")\s]+)/g,
      ];
  for (const re of patterns) for (const m of text.matchAll(re)) found.push(m[1]);
  return found;
}

describe('the built client', () => {
  it('exists (npm test builds it first)', () => {
    expect(existsSync(path.join(dist, 'index.html'))).toBe(true);
  });

  it('references no external host for fonts, styles or scripts', () => {
    const offenders = files(dist)
      .filter((f) => /\.(html|css)$/.test(f))
      .flatMap((f) => externalLoads(f, readFileSync(f, 'utf8')).map((url) => `${path.relative(dist, f)}: ${url}`));
    expect(offenders).toEqual([]);
  });

  it('has no font-CDN or script-CDN address anywhere in its JavaScript', () => {
    const cdn = /https?:\/\/(fonts\.(googleapis|gstatic)\.com|cdn\.|unpkg\.com|cdnjs\.|[\w.-]*jsdelivr\.net)/;
    const offenders = files(dist).filter((f) => f.endsWith('.js') && cdn.test(readFileSync(f, 'utf8')));
    expect(offenders).toEqual([]);
  });

  it('ships its fonts (text and icons) as files of its own', () => {
    const fonts = files(dist).filter((f) => /\.(woff2?|ttf)$/.test(f));
    expect(fonts.some((f) => /atkinson/i.test(f))).toBe(true);
    expect(fonts.some((f) => /material-symbols/i.test(f))).toBe(true);
  });

  // The detector itself must catch what it is meant to catch.
  it('detects an external stylesheet, font and script when they are there', () => {
    expect(externalLoads('index.html', '<link rel="stylesheet" href="https://fonts.example.org/css">')).toHaveLength(1);
    expect(externalLoads('index.html', '<script src="//cdn.example.org/x.js"></script>')).toHaveLength(1);
    expect(externalLoads('styles.css', '@font-face{src:url(https://x.example.org/f.woff2)}')).toHaveLength(1);
    expect(externalLoads('styles.css', '@font-face{src:url(media/f.woff2)}')).toHaveLength(0);
  });
});
