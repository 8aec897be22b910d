import { meSchema, logoutResponseSchema } from '@trabeate/contracts';
import { reply } from '../../../testing/api-replies';
import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { TestBed } from '@angular/core/testing';
import { provideRouter } from '@angular/router';
import { NoAccessPage } from './no-access-page';
import { PageLocation } from './page-location';
import { Session } from './session';
import { noAccessMe } from './testing';

describe('NoAccessPage', () => {
  it('explains in the server’s words, shows who is signed in, and signs out', async () => {
    const went: string[] = [];
    TestBed.configureTestingModule({
      imports: [NoAccessPage],
      providers: [
        provideRouter([]),
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: PageLocation, useValue: { assign: (url: string) => went.push(url) } },
      ],
    });
    const backend = TestBed.inject(HttpTestingController);
    const loaded = TestBed.inject(Session).load();
    reply(backend.expectOne('/api/me'), meSchema, noAccessMe);
    await loaded;

    const fixture = TestBed.createComponent(NoAccessPage);
    await fixture.whenStable();
    const el = fixture.nativeElement as HTMLElement;
    const text = el.textContent?.replace(/\s+/g, ' ');
    expect(el.querySelector('h1')?.textContent).toContain('You are signed in, but not on a project yet');
    expect(text).toContain('Nobody at the firm has invited wren.okafor@example.test yet.');
    expect(el.querySelector('[data-testid="no-access-email"]')?.textContent).toBe('wren.okafor@example.test');
    expect(text).toContain('Wren Okafor');

    (el.querySelector('[data-testid="sign-out"]') as HTMLButtonElement).click();
    reply(backend.expectOne('/api/auth/logout'), logoutResponseSchema, {
      endSessionUrl: 'http://127.0.0.1:4320/session/end',
    });
    await fixture.whenStable();
    await new Promise((r) => setTimeout(r));
    expect(went).toEqual(['http://127.0.0.1:4320/session/end']);
    backend.verify();
  });
});
