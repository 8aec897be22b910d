import { BreakpointObserver, BreakpointState } from '@angular/cdk/layout';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { BehaviorSubject, map } from 'rxjs';
import { Shell } from './shell';

/** Stands in for the browser's media queries so a test can pick the screen width. */
class FakeBreakpoints {
  readonly narrow = new BehaviorSubject(false);
  observe() {
    return this.narrow.pipe(map((matches): BreakpointState => ({ matches, breakpoints: {} })));
  }
}

describe('Shell', () => {
  let fixture: ComponentFixture<Shell>;
  let breakpoints: FakeBreakpoints;
  const el = (): HTMLElement => fixture.nativeElement as HTMLElement;
  const menuButton = () => el().querySelector('button[aria-label="Show or hide navigation"]');

  beforeEach(async () => {
    breakpoints = new FakeBreakpoints();
    TestBed.configureTestingModule({
      imports: [Shell],
      providers: [provideRouter([]), { provide: BreakpointObserver, useValue: breakpoints }],
    });
    fixture = TestBed.createComponent(Shell);
    await fixture.whenStable();
  });

  it('shows the Trabeate wordmark linking home', () => {
    const home = el().querySelector('a.wordmark');
    expect(home?.textContent).toContain('Trabeate');
    expect(home?.getAttribute('href')).toBe('/');
  });

  it('offers navigation to Projects, Drawings, Fees and System status', () => {
    const links = Array.from(el().querySelectorAll<HTMLAnchorElement>('nav[aria-label="Main"] a'));
    expect(links.map((a) => [a.querySelector('[matListItemTitle]')?.textContent?.trim(), a.getAttribute('href')])).toEqual([
      ['Projects', '/projects'],
      ['Drawings', '/drawings'],
      ['Fees', '/fees'],
      ['System status', '/status'],
    ]);
  });

  it('carries the caution that results are preliminary and final design needs a licensed engineer', () => {
    const caution = el().querySelector('[data-testid="caution"]')?.textContent?.replace(/\s+/g, ' ');
    expect(caution).toContain(
      'Trabeate plans and checks schemes; results are preliminary, local codes govern, and final design belongs to a licensed structural engineer.',
    );
  });

  it('on a wide screen keeps the navigation open beside the page, with no menu button', () => {
    expect(menuButton()).toBeNull();
    const nav = el().querySelector('mat-sidenav');
    expect(nav?.classList).toContain('mat-drawer-side');
    expect(nav?.classList).toContain('mat-drawer-opened');
  });

  it('on a narrow screen folds the navigation into a drawer that the menu button opens', async () => {
    breakpoints.narrow.next(true);
    await fixture.whenStable();

    const nav = el().querySelector('mat-sidenav');
    expect(nav?.classList).toContain('mat-drawer-over');
    expect(nav?.classList).not.toContain('mat-drawer-opened');
    const button = menuButton() as HTMLButtonElement;
    expect(button).not.toBeNull();
    expect(button.getAttribute('aria-expanded')).toBe('false');

    button.click();
    await fixture.whenStable();
    expect(nav?.classList).toContain('mat-drawer-opened');
    expect(button.getAttribute('aria-expanded')).toBe('true');
  });
});
