import { provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { outboxMessageSchema, type OutboxMessage } from '@trabeate/contracts';
import { reply, replyError } from '../../../testing/api-replies';
import { OutboxPage, sealedHtml } from './outbox-page';

const message = (n: number, receivedAt: string, html: string | null = `<p>Notice ${n}</p>`): OutboxMessage => ({
  id: `m${n}`,
  receivedAt,
  from: 'Trabeate <notices@lintel-pier.example.test>',
  to: ['aster@example.test'],
  subject: `Notice ${n}`,
  text: `Plain notice ${n}`,
  html,
});

describe('OutboxPage', () => {
  let fixture: ComponentFixture<OutboxPage>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  const settle = async () => {
    await new Promise((r) => setTimeout(r));
    TestBed.tick();
  };

  beforeEach(() => {
    TestBed.configureTestingModule({
      imports: [OutboxPage],
      providers: [provideHttpClient(), provideHttpClientTesting()],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(OutboxPage);
    fixture.detectChanges();
    TestBed.tick();
  });

  it('lists messages newest first with recipient, subject and time, and opens the newest', async () => {
    reply(backend.expectOne('/api/dev/outbox'), outboxMessageSchema.array(), [
      message(1, '2026-03-02T08:00:00.000Z'),
      message(2, '2026-03-02T09:30:00.000Z'),
    ]);
    await settle();
    const items = Array.from(el().querySelectorAll('[data-testid="outbox-item"]'));
    expect(items.map((i) => i.querySelector('.subject')?.textContent)).toEqual(['Notice 2', 'Notice 1']);
    expect(items[0].textContent).toContain('To aster@example.test');
    expect(el().querySelector('[data-testid="outbox-text"]')?.textContent).toBe('Plain notice 2');
  });

  it('shows the chosen message’s HTML in an iframe that may run no scripts and load nothing', async () => {
    reply(backend.expectOne('/api/dev/outbox'), outboxMessageSchema.array(), [
      message(1, '2026-03-02T08:00:00.000Z', '<p>Hi</p><script>alert(1)</script>'),
      message(2, '2026-03-02T09:30:00.000Z'),
    ]);
    await settle();
    (el().querySelectorAll('[data-testid="outbox-item"]')[1] as HTMLButtonElement).click();
    await settle();
    const frame = el().querySelector('[data-testid="outbox-html"]') as HTMLIFrameElement;
    expect(frame.getAttribute('sandbox')).toBe('');
    const doc = frame.getAttribute('srcdoc') ?? (frame as HTMLIFrameElement & { srcdoc: string }).srcdoc;
    expect(doc).toContain('<p>Hi</p>');
    expect(doc).toContain("default-src 'none'");
    expect(el().querySelector('[data-testid="outbox-text"]')?.textContent).toBe('Plain notice 1');
  });

  it('shows only the text when a message has no HTML part', async () => {
    reply(backend.expectOne('/api/dev/outbox'), outboxMessageSchema.array(), [
      message(1, '2026-03-02T08:00:00.000Z', null),
    ]);
    await settle();
    expect(el().querySelector('[data-testid="outbox-html"]')).toBeNull();
    expect(el().querySelector('[data-testid="outbox-text"]')?.textContent).toBe('Plain notice 1');
  });

  it('says plainly when the server keeps no outbox (404)', async () => {
    replyError(backend.expectOne('/api/dev/outbox'), 404, { code: 'not_found', message: 'Not found.' });
    await settle();
    expect(el().querySelector('[data-testid="outbox-error"]')?.textContent).toContain(
      'does not keep a development outbox',
    );
  });

  it('says so when no mail has been sent yet', async () => {
    reply(backend.expectOne('/api/dev/outbox'), outboxMessageSchema.array(), []);
    await settle();
    expect(el().textContent).toContain('No mail yet');
  });
});

describe('sealedHtml', () => {
  it('puts a policy that forbids scripts and outside loads ahead of the message', () => {
    const doc = sealedHtml('<img src="https://tracker.example/x.gif">');
    expect(doc.indexOf('Content-Security-Policy')).toBeLessThan(doc.indexOf('<img'));
    expect(doc).toContain("default-src 'none'; img-src data:");
  });
});
