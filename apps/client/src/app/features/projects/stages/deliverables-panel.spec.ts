import { HttpClient, HttpEventType, provideHttpClient } from '@angular/common/http';
import { HttpTestingController, provideHttpClientTesting } from '@angular/common/http/testing';
import { ANIMATION_MODULE_TYPE, inject } from '@angular/core';
import { ComponentFixture, TestBed } from '@angular/core/testing';
import { deliverableSchema, type Deliverable, type ErrorCode } from '@trabeate/contracts';
import { reply, replyError } from '../../../../testing/api-replies';
import { UPLOAD_HTTP } from '../projects-api';
import { DeliverablesPanel, groupByFileName } from './deliverables-panel';

const PROJECT_ID = '00000000-0000-4000-8000-000000000301';
const URL = `/api/projects/${PROJECT_ID}/stages/column_layout/deliverables`;
const SHA = 'a3f1c2'.padEnd(64, '0');

function version(fileName: string, v: number, sizeBytes = 2048): Deliverable {
  return {
    id: `00000000-0000-4000-8000-0000000004${fileName.length}${v}`.slice(0, 36),
    stageKey: 'column_layout',
    fileName,
    version: v,
    sizeBytes,
    sha256: SHA,
    contentType: 'application/pdf',
    uploadedBy: { id: '00000000-0000-4000-8000-000000000202', displayName: 'Cato Brennagh' },
    uploadedAt: '2026-03-02T08:00:00.000Z',
    downloadUrl: `/api/deliverables/${fileName}-${v}/download`,
  };
}

describe('groupByFileName', () => {
  it('keeps the versions of one file together, newest first, files in name order', () => {
    const groups = groupByFileName([
      version('loads.pdf', 1),
      version('grid.pdf', 1),
      version('loads.pdf', 3),
      version('loads.pdf', 2),
    ]);
    expect(groups.map((g) => [g.fileName, g.versions.map((d) => d.version)])).toEqual([
      ['grid.pdf', [1]],
      ['loads.pdf', [3, 2, 1]],
    ]);
  });
});

describe('DeliverablesPanel', () => {
  let fixture: ComponentFixture<DeliverablesPanel>;
  let backend: HttpTestingController;
  const el = () => fixture.nativeElement as HTMLElement;
  // Not whenStable: an open request (an upload, a reload) keeps the app "unstable" until answered.
  const settle = async (ms = 0) => {
    await new Promise((r) => setTimeout(r, ms));
    TestBed.tick();
  };
  const pdf = () => new File(['%PDF-1.4\n%…\n'.repeat(100)], 'column-layout.pdf', { type: 'application/pdf' });

  async function open(existing: Deliverable[] = []): Promise<void> {
    TestBed.configureTestingModule({
      imports: [DeliverablesPanel],
      providers: [
        provideHttpClient(),
        provideHttpClientTesting(),
        { provide: UPLOAD_HTTP, useFactory: () => inject(HttpClient) },
        { provide: ANIMATION_MODULE_TYPE, useValue: 'NoopAnimations' },
      ],
    });
    backend = TestBed.inject(HttpTestingController);
    fixture = TestBed.createComponent(DeliverablesPanel);
    fixture.componentRef.setInput('projectId', PROJECT_ID);
    fixture.componentRef.setInput('stageKey', 'column_layout');
    fixture.componentRef.setInput('canUpload', true);
    fixture.detectChanges();
    TestBed.tick();
    reply(backend.expectOne(URL), deliverableSchema.array(), existing);
    await settle();
  }

  it('lists each file with its versions, sizes, a short SHA-256 and download links', async () => {
    await open([version('loads.pdf', 1, 1500), version('loads.pdf', 2, 2_500_000)]);
    expect(el().querySelectorAll('[data-testid="deliverable-group"]').length).toBe(1);
    const rows = Array.from(el().querySelectorAll('[data-testid="deliverable-version"]'));
    expect(rows.map((r) => r.querySelector('td')?.textContent?.trim())).toEqual(['v2', 'v1']);
    expect(rows[0].textContent).toContain('2.5 MB');
    expect(rows[1].textContent).toContain('1.5 kB');
    expect(rows[0].querySelector('code')?.textContent).toBe('a3f1c2000000…');
    expect(rows[0].querySelector('code')?.getAttribute('title')).toBe(SHA);
    expect(rows[0].querySelector('a[data-testid="download"]')?.getAttribute('href')).toBe(
      '/api/deliverables/loads.pdf-2/download',
    );
  });

  it('sends the file as the multipart field "file" and shows real upload progress', async () => {
    await open();
    fixture.componentInstance.upload(pdf());
    await settle();
    const req = backend.expectOne(URL);
    expect(req.request.method).toBe('POST');
    expect(req.request.reportProgress).toBe(true);
    expect((req.request.body as FormData).get('file')).toBeInstanceOf(File);

    req.event({ type: HttpEventType.UploadProgress, loaded: 400, total: 1000 });
    await settle();
    const progress = el().querySelector('[data-testid="upload-progress"]');
    expect(progress?.textContent).toContain('40 %');
    expect(progress?.querySelector('mat-progress-bar')?.getAttribute('aria-valuenow')).toBe('40');

    req.event({ type: HttpEventType.UploadProgress, loaded: 1000, total: 1000 });
    await settle();
    expect(el().querySelector('[data-testid="upload-progress"]')?.textContent).toContain('100 %');

    reply(req, deliverableSchema, version('column-layout.pdf', 1), { status: 201, statusText: 'Created' });
    await settle();
    expect(el().querySelector('[data-testid="upload-progress"]')).toBeNull();
    // The list is read again so the new version shows.
    reply(backend.expectOne(URL), deliverableSchema.array(), [version('column-layout.pdf', 1)]);
    await settle();
    expect(el().querySelectorAll('[data-testid="deliverable-version"]').length).toBe(1);
  });

  it.each([
    [413, 'payload_too_large', 'The file is larger than the 200 MB limit.'],
    [415, 'unsupported_media_type', 'Programs and scripts are not accepted as deliverables.'],
    [422, 'validation_failed', 'column-layout.pdf is not a PDF file.'],
  ] as const)('says why the server refused the file (%i)', async (status, code: ErrorCode, message) => {
    await open();
    fixture.componentInstance.upload(pdf());
    await settle();
    replyError(backend.expectOne(URL), status, { code, message });
    await settle();
    expect(el().querySelector('[data-testid="upload-error"]')?.textContent).toContain(message);
    expect(el().querySelector('[data-testid="upload-progress"]')).toBeNull();
  });

  it('explains a refusal for size even when a proxy answers 413 without our error body', async () => {
    await open();
    fixture.componentInstance.upload(pdf());
    await settle();
    // Not the API's answer: a proxy in front of it refused the body.
    backend.expectOne(URL).flush('<html>Request Entity Too Large</html>', { status: 413, statusText: 'Too Large' });
    await settle();
    expect(el().querySelector('[data-testid="upload-error"]')?.textContent).toContain(
      'The file is larger than the server accepts.',
    );
  });

  it('takes a dropped file', async () => {
    await open();
    const drop = new Event('drop', { bubbles: true, cancelable: true }) as DragEvent;
    Object.defineProperty(drop, 'dataTransfer', { value: { files: [pdf()] } });
    el().querySelector('[data-testid="drop-area"]')!.dispatchEvent(drop);
    await settle();
    expect((backend.expectOne(URL).request.body as FormData).get('file')).toHaveProperty('name', 'column-layout.pdf');
  });
});
