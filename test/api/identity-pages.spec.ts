import { layout, loginPage } from '../../apps/identity/src/pages';

// The local sign-in pages wear the app's look: its own font embedded (nothing fetched), the
// wordmark, the palette's field outline and focus ring.
describe("the local sign-in pages in Trabeate's look", () => {
  const html = loginPage({ uid: 'abc', csrf: 'token', clientName: 'Trabeate' });

  it("embeds the app's font as data, so nothing is fetched from elsewhere", () => {
    expect(html).toMatch(
      /@font-face\{font-family:"Atkinson Hyperlegible";[^}]*font-weight:400;[^}]*url\(data:font\/woff2;base64,/,
    );
    expect(html).toMatch(/font-weight:700;[^}]*url\(data:font\/woff2;base64,/);
    expect(html).not.toMatch(/https?:\/\//);
  });

  it('shows the wordmark, not only a word, and the same field outline and 3 px focus ring as the app', () => {
    expect(html).toContain('<p class="mark"><svg viewBox="0 0 32 32" aria-hidden="true"');
    // Field outline neutral 40 (#615e59): over 3:1 against white, unlike a pale hairline.
    expect(html).toContain('--line:#615e59');
    expect(html).toMatch(/input:focus-visible,button:focus-visible,a:focus-visible\{outline:3px solid var\(--focus\)/);
  });

  it('escapes what it is given', () => {
    expect(layout('<b>', '')).toContain('<title>&lt;b&gt; · Trabeate sign-in</title>');
  });
});
