import { HttpRequest, provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { Router, provideRouter } from '@angular/router';
import { outboxPageSchema, type OutboxMessage } from '@trabeate/contracts';
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

const outboxRequest = (r: HttpRequest<unknown>) => r.url === '/api/dev/outbox';
const pageOf = (items: OutboxMessage[], total = items.length, page = 1, pageSize = 25) => ({
  items,
  total,
  page,
  pageSize,
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
      providers: [provideHttpClient(), provideHttpClientTesting(), provideRouter([])],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(OutboxPage);
    fixture.detectChanges();
    TestBed.tick();
  });

  it('lists messages newest first with recipient, subject and time, and opens the newest', async () => {
    reply(
      backend.expectOne(outboxRequest),
      outboxPageSchema,
      pageOf([message(1, '2026-03-02T08:00:00.000Z'), message(2, '2026-03-02T09:30:00.000Z')]),
    );
    await settle();
    const items = Array.from(el().querySelectorAll('[data-testid="outbox-item"]'));
    expect(items.map((i) => i.querySelector('.subject')?.textContent)).toEqual(['Notice 2', 'Notice 1']);
    expect(items[0].textContent).toContain('To aster@example.test');
    expect(el().querySelector('[data-testid="outbox-text"]')?.textContent).toBe('Plain notice 2');
  });

  it('shows the chosen message’s HTML in an iframe that may run no scripts and load nothing', async () => {
    reply(
      backend.expectOne(outboxRequest),
      outboxPageSchema,
      pageOf([
        message(1, '2026-03-02T08:00:00.000Z', '<p>Hi</p><script>alert(1)</script>'),
        message(2, '2026-03-02T09:30:00.000Z'),
      ]),
    );
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

  it('keeps the chosen message open through a refresh that brings newer mail, while it is still listed', async () => {
    const first = [message(1, '2026-03-02T08:00:00.000Z'), message(2, '2026-03-02T09:30:00.000Z')];
    reply(backend.expectOne(outboxRequest), outboxPageSchema, pageOf(first));
    await settle();
    (el().querySelectorAll('[data-testid="outbox-item"]')[1] as HTMLButtonElement).click();
    await settle();
    expect(el().querySelector('[data-testid="outbox-text"]')?.textContent).toBe('Plain notice 1');
    (el().querySelector('[data-testid="outbox-refresh"]') as HTMLButtonElement).click();
    TestBed.tick();
    reply(
      backend.expectOne(outboxRequest),
      outboxPageSchema,
      pageOf([...first, message(3, '2026-03-02T10:00:00.000Z')]),
    );
    await settle();
    expect(el().querySelectorAll('[data-testid="outbox-item"]')).toHaveLength(3);
    expect(el().querySelector('[data-testid="outbox-text"]')?.textContent).toBe('Plain notice 1');
    // Once the chosen message has left the page, the newest opens.
    (el().querySelector('[data-testid="outbox-refresh"]') as HTMLButtonElement).click();
    TestBed.tick();
    reply(backend.expectOne(outboxRequest), outboxPageSchema, pageOf([message(3, '2026-03-02T10:00:00.000Z')]));
    await settle();
    expect(el().querySelector('[data-testid="outbox-text"]')?.textContent).toBe('Plain notice 3');
  });

  it('shows only the text when a message has no HTML part', async () => {
    reply(backend.expectOne(outboxRequest), outboxPageSchema, pageOf([message(1, '2026-03-02T08:00:00.000Z', null)]));
    await settle();
    expect(el().querySelector('[data-testid="outbox-html"]')).toBeNull();
    expect(el().querySelector('[data-testid="outbox-text"]')?.textContent).toBe('Plain notice 1');
  });

  it('says plainly when the server keeps no outbox (404)', async () => {
    replyError(backend.expectOne(outboxRequest), 404, { code: 'not_found', message: 'Not found.' });
    await settle();
    expect(el().querySelector('[data-testid="outbox-error"]')?.textContent).toContain(
      'does not keep a development outbox',
    );
  });

  it('asks the server for one page at a time and moves to the next page through the address', async () => {
    const first = backend.expectOne(outboxRequest);
    expect(first.request.params.get('page')).toBe('1');
    expect(first.request.params.get('pageSize')).toBe('25');
    reply(
      first,
      outboxPageSchema,
      pageOf(
        Array.from({ length: 25 }, (_, i) =>
          message(60 - i, `2026-03-02T08:${String(59 - i).padStart(2, '0')}:00.000Z`),
        ),
        60,
      ),
    );
    await settle();
    expect(el().querySelectorAll('[data-testid="outbox-item"]')).toHaveLength(25);
    expect(el().querySelector('[data-testid="outbox-pages"]')?.textContent).toContain('1 – 25 of 60');
    const navigate = jest.spyOn(TestBed.inject(Router), 'navigate').mockResolvedValue(true);
    (el().querySelector('[data-testid="outbox-pages"] button[aria-label="Next page"]') as HTMLButtonElement).click();
    expect(navigate).toHaveBeenCalledWith([], {
      queryParams: { page: 2, pageSize: null },
      queryParamsHandling: 'merge',
    });
    // The router binds the address's page to the input; the page then asks for page 2.
    fixture.componentRef.setInput('page', '2');
    fixture.detectChanges();
    TestBed.tick();
    const second = backend.expectOne(outboxRequest);
    expect(second.request.params.get('page')).toBe('2');
    reply(second, outboxPageSchema, pageOf([message(35, '2026-03-02T07:00:00.000Z')], 60, 2));
    await settle();
    expect(el().querySelector('[data-testid="outbox-pages"]')?.textContent).toContain('26 – 50 of 60');
    expect(el().querySelector('[data-testid="outbox-text"]')?.textContent).toBe('Plain notice 35');
  });

  it('says so when no mail has been sent yet', async () => {
    reply(backend.expectOne(outboxRequest), outboxPageSchema, pageOf([]));
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
